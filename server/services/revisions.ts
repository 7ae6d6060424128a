/**
 * Revisions: every save that carries content makes an immutable, numbered snapshot with the
 * engine's summary of key results (or its error), so any two can be compared later without
 * trusting the client. The engine runs here, on the server, with the same code as the browser.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { and, desc, eq, max, sql } from 'drizzle-orm';
import type { RevisionSummary, Revision } from '../../shared/api/revisions.ts';
import type { StudyContent } from '../../shared/api/studies.ts';
import { jsonEqual, type RevisionDiff } from '../../shared/review/diff.ts';
import { summarizeCircuit, type ResultsSummary } from '../../shared/review/summary.ts';
import { circuitNames } from '../../shared/review/user-names.ts';
import type { Actor } from '../auth/index.ts';
import type { Db } from '../db/index.ts';
import { studyRevisions, users } from '../db/schema.ts';
import { notFound } from '../errors.ts';
import { recordAudit } from './audit.ts';
import { work } from '../work/index.ts';

/** A Drizzle client or an open transaction. */
export type Conn = Db | Parameters<Parameters<Db['transaction']>[0]>[0];

/** The engine version stamped on each revision: the package version (the engine ships with the app). */
export const ENGINE_VERSION: string = (() => {
  const pkg = JSON.parse(readFileSync(path.resolve(import.meta.dirname, '..', '..', 'package.json'), 'utf8')) as { version: string };
  return `wyeward-engine ${pkg.version}`;
})();

type RevisionRow = typeof studyRevisions.$inferSelect;

function toRevisionSummary(r: RevisionRow, authorName: string): RevisionSummary {
  const s = r.summary as ResultsSummary;
  return {
    number: r.number,
    message: r.message,
    author: { id: r.authorId, name: authorName },
    createdAt: r.createdAt.toISOString(),
    engineVersion: r.engineVersion,
    restoredFrom: r.restoredFrom,
    results: s.ok
      ? { ok: true, flagCount: s.flags.length, violationCount: s.flags.filter((f) => f.severity === 'violation').length }
      : { ok: false, error: { code: s.error.code, message: circuitNames((r.content as StudyContent).circuit).text(s.error.message) } },
  };
}

/** The latest revision of a study, or null. */
export async function latestRevision(db: Conn, studyId: string): Promise<RevisionRow | null> {
  const [row] = await db.select().from(studyRevisions).where(eq(studyRevisions.studyId, studyId)).orderBy(desc(studyRevisions.number)).limit(1);
  return row ?? null;
}

/** True when `content` is the same as the latest revision's (no revision is made then). */
export function sameContent(a: unknown, b: unknown): boolean {
  return jsonEqual(a, b);
}

type RevisionInput = { studyId: string; teamId: string; authorId: string; content: StudyContent; message?: string; restoredFrom?: number | null; at?: Date; audit?: boolean; summary?: ResultsSummary };

async function nextRevisionNumber(db: Conn, studyId: string): Promise<number> {
  const [{ n }] = await db.select({ n: max(studyRevisions.number) }).from(studyRevisions).where(eq(studyRevisions.studyId, studyId));
  return (n ?? 0) + 1;
}

function revisionValues(r: Omit<RevisionInput, 'content' | 'summary'>, number: number) {
  return {
    studyId: r.studyId,
    teamId: r.teamId,
    number,
    message: r.message ?? (r.restoredFrom ? `Restored revision ${r.restoredFrom}` : ''),
    authorId: r.authorId,
    engineVersion: ENGINE_VERSION,
    restoredFrom: r.restoredFrom ?? null,
    ...(r.at ? { createdAt: r.at } : {}),
  };
}

async function auditRevision(db: Conn, r: Omit<RevisionInput, 'content' | 'summary'>, number: number, solved: boolean): Promise<void> {
  if (r.audit === false) return;
  await recordAudit(db, {
    teamId: r.teamId,
    actorId: r.authorId,
    action: r.restoredFrom ? 'revision.restore' : 'revision.create',
    studyId: r.studyId,
    detail: { revision: number, ...(r.restoredFrom ? { restoredFrom: r.restoredFrom } : {}), solved },
  });
}

/**
 * Appends a revision (number = latest + 1) with the engine's summary, and records it in the audit
 * trail. Call inside the transaction that changes the study.
 */
export async function appendRevision(db: Conn, r: RevisionInput): Promise<RevisionRow> {
  const number = await nextRevisionNumber(db, r.studyId);
  // Callers solve before their transaction (off the request thread, server/work); solved here only when they did not.
  const summary = r.summary ?? summarizeCircuit(r.content.circuit);
  const [row] = await db
    .insert(studyRevisions)
    .values({ ...revisionValues(r, number), summary, content: r.content })
    .returning();
  await auditRevision(db, r, number, summary.ok);
  return row;
}

/**
 * Appends a revision whose content is the study's current content, copied inside the database (an
 * import: its content arrives already serialised, and up to 2 MB of JSON is neither sent a second
 * time nor read back). Returns the revision's number.
 */
export async function appendRevisionOfStoredContent(
  db: Conn,
  r: Omit<RevisionInput, 'content' | 'summary'> & { summaryJson: string; summaryOk: boolean },
): Promise<number> {
  const number = await nextRevisionNumber(db, r.studyId);
  // The summary arrives as JSON text from the work pool (a large study's is over a megabyte): cast
  // in the database, not serialised here.
  await db.insert(studyRevisions).values({
    ...revisionValues(r, number),
    summary: sql`${r.summaryJson}::jsonb`,
    content: sql`(select content from studies where id = ${r.studyId})`,
  });
  await auditRevision(db, r, number, r.summaryOk);
  return number;
}

/**
 * The latest revision of a study, made now from its current content if it has none yet (a study
 * stored before revisions existed).
 */
export async function ensureRevision(db: Conn, s: { id: string; teamId: string; content: unknown; updatedBy: string }): Promise<RevisionRow> {
  return (await latestRevision(db, s.id)) ?? appendRevision(db, { studyId: s.id, teamId: s.teamId, authorId: s.updatedBy, content: s.content as StudyContent, message: 'Initial revision' });
}

/** The history of a study (caller has checked the study is visible), newest first. */
export async function listRevisions(db: Db, studyId: string): Promise<RevisionSummary[]> {
  const rows = await db
    .select({ r: studyRevisions, authorName: users.name })
    .from(studyRevisions)
    .innerJoin(users, eq(users.id, studyRevisions.authorId))
    .where(eq(studyRevisions.studyId, studyId))
    .orderBy(desc(studyRevisions.number));
  return rows.map(({ r, authorName }) => toRevisionSummary(r, authorName));
}

/** One revision with content and summary, or 404. */
export async function getRevision(db: Conn, studyId: string, number: number): Promise<Revision> {
  if (!Number.isInteger(number) || number < 1 || number > 1e9) throw notFound('Revision');
  const [row] = await db
    .select({ r: studyRevisions, authorName: users.name })
    .from(studyRevisions)
    .innerJoin(users, eq(users.id, studyRevisions.authorId))
    .where(and(eq(studyRevisions.studyId, studyId), eq(studyRevisions.number, number)))
    .limit(1);
  if (!row) throw notFound('Revision');
  return { ...toRevisionSummary(row.r, row.authorName), content: row.r.content as StudyContent, summary: row.r.summary as ResultsSummary };
}

/** Parses a revision number from a URL parameter (anything else is 404). */
export function revisionNumber(s: string): number {
  return /^\d{1,9}$/.test(s) ? Number(s) : NaN;
}

/** Compares two revisions of a study; `to` defaults to the latest, `from` to `to − 1` (or `to` for the first). */
export async function diffStudy(db: Db, _actor: Actor, studyId: string, q: { from?: number; to?: number }): Promise<RevisionDiff> {
  const latest = await latestRevision(db, studyId);
  if (!latest) throw notFound('Revision');
  const toN = q.to ?? latest.number;
  const fromN = q.from ?? Math.max(1, toN - 1);
  const [a, b] = await Promise.all([getRevision(db, studyId, fromN), getRevision(db, studyId, toN)]);
  return work().diff({ number: a.number, content: a.content, summary: a.summary }, { number: b.number, content: b.content, summary: b.summary });
}
