/**
 * The study report (PDF) and the CSV exports of a revision: who may read the study may read them
 * (getStudy: another team's study is 404). The revision, case and units are checked here; the
 * heavy part (solve, layout, PDF) runs in the work pool (server/work) for large studies.
 */
import { and, desc, eq } from 'drizzle-orm';
import type { ReportQuery, ResultsCsvQuery } from '../../shared/api/report.ts';
import { BASE_CASE_ID, circuitCases, InvalidCircuitError } from '../../shared/engine/index.ts';
import type { Actor } from '../auth/index.ts';
import type { Db } from '../db/index.ts';
import { reviewEvents, users } from '../db/schema.ts';
import { AppError } from '../errors.ts';
import type { ReportInput } from '../report/pdf.ts';
import { work } from '../work/index.ts';
import { getRevision, latestRevision } from './revisions.ts';
import { getStudy } from './studies.ts';

/** The revision asked for (latest by default), its content and the study it belongs to. */
async function revisionOf(db: Db, actor: Actor, studyId: string, q: ReportQuery) {
  const study = await getStudy(db, actor, studyId);
  const latest = await latestRevision(db, study.id);
  if (!latest) throw new AppError(404, 'not-found', 'This study has no saved revision yet: save it first.');
  const number = q.revision ?? latest.number;
  if (number > latest.number) throw new AppError(404, 'not-found', `This study has no revision ${number}; its latest is revision ${latest.number}.`);
  const revision = await getRevision(db, study.id, number);
  let caseName: string | undefined;
  if (q.case !== undefined && q.case !== BASE_CASE_ID) {
    let cases: { id: string; name?: string }[];
    try {
      cases = circuitCases(revision.content.circuit);
    } catch (err) {
      if (!(err instanceof InvalidCircuitError)) throw err;
      cases = [];
    }
    const found = cases.find((c) => c.id === q.case);
    if (!found) {
      throw new AppError(400, 'validation', cases.length ? `Revision ${number} has no study case "${q.case}"; its cases are ${cases.map((c) => (c.name ? `"${c.id}" (${c.name})` : `"${c.id}"`)).join(', ')}.` : `Revision ${number} has no study cases.`, { fields: { case: 'No such study case in this revision' } });
    }
    caseName = found.name ?? found.id;
  }
  return { study, revision, fileStem: `${fileStem(study.name)}-rev${revision.number}${caseName !== undefined ? `-${fileStem(caseName)}` : ''}` };
}

/** The PDF report of a revision: bytes and a file name. */
export async function studyReport(db: Db, actor: Actor, studyId: string, q: ReportQuery, now = new Date()): Promise<{ pdf: Uint8Array; fileName: string }> {
  const { study, revision, fileStem: stem } = await revisionOf(db, actor, studyId, q);
  const approved = study.status === 'approved' && study.approvedRevision === revision.number;
  let approver: string | undefined;
  let approvedAt: string | undefined;
  if (approved) {
    const [row] = await db
      .select({ name: users.name, at: reviewEvents.at })
      .from(reviewEvents)
      .innerJoin(users, eq(users.id, reviewEvents.actorId))
      .where(and(eq(reviewEvents.studyId, study.id), eq(reviewEvents.action, 'approve'), eq(reviewEvents.revision, revision.number)))
      .orderBy(desc(reviewEvents.at))
      .limit(1);
    approver = row?.name;
    approvedAt = row?.at.toISOString();
  }
  const underReview = study.review?.revision === revision.number;
  const status = approved
    ? 'Approved'
    : underReview && study.status === 'in-review'
      ? 'In review (not yet approved)'
      : underReview && study.status === 'changes-requested'
        ? 'Changes requested'
        : 'Draft — not reviewed';
  const input: ReportInput = {
    study: { name: study.name, team: actor.teamName },
    revision: { number: revision.number, author: revision.author.name, createdAt: revision.createdAt, message: revision.message },
    review: { status, approved, ...(approver ? { approver } : {}), ...(approvedAt ? { approvedAt } : {}) },
    ...(q.case ? { caseId: q.case } : {}),
    units: q.units,
    content: revision.content,
    madeAt: now.toISOString(),
  };
  const pdf = await work().report(input);
  return { pdf, fileName: `${stem}.pdf` };
}

/** One results table of a revision as CSV. */
export async function studyResultsCsv(db: Db, actor: Actor, studyId: string, q: ResultsCsvQuery): Promise<{ csv: string; fileName: string }> {
  const { revision, fileStem: stem } = await revisionOf(db, actor, studyId, q);
  const out = await work().csv({ content: revision.content, ...(q.case ? { caseId: q.case } : {}), units: q.units, table: q.table });
  if (!out.ok) throw new AppError(409, 'conflict', `Revision ${revision.number} cannot be solved, so it has no results: ${out.message}`);
  return { csv: out.csv, fileName: `${stem}-${q.table}${q.units === 'pu' ? '-pu' : ''}.csv` };
}

/**
 * A study's or case's name as part of a file name: its letters and digits in any script (accents
 * kept: "Étude über" stays "Étude-über"), runs of anything else as one dash, at most 80 characters.
 * The download's Content-Disposition carries it UTF-8 encoded, with an ASCII fallback.
 */
export function fileStem(name: string): string {
  const words = name.normalize('NFC').replace(/[^\p{L}\p{M}\p{N}]+/gu, '-').replace(/^-+|-+$/g, '');
  return Array.from(words).slice(0, 80).join('').replace(/-+$/, '') || 'study';
}
