/**
 * The study report as a printable page (`/studies/:id/print/:n`): the same content, in the same
 * order and words, as the PDF (shared/report): title block with the review status (approver and
 * date once approved, a "DRAFT — not reviewed" mark otherwise), scope and assumptions, the one-line
 * diagram, input tables, results, phasor diagrams of the flagged buses, every flag with its limit
 * and source, the caution. The revision is solved here with the engine the server uses. The print
 * stylesheet (src/index.css, `@media print`) hides the app's header and this page's buttons, and
 * numbers the pages; the study and revision are repeated at the foot of every page.
 */
import { useMemo } from 'react';
import { Link } from 'react-router';
import { busColumnGroups, flaggedBuses, inputGroups, NOTHING_DRAWN, scopeLines, solveReported } from '../../../../shared/report/document.ts';
import { oneLineSvg } from '../../../../shared/report/one-line.ts';
import { readPerUnitSettings, type ResultUnits } from '../../../../shared/report/per-unit.ts';
import { phasorSvg } from '../../../../shared/report/phasor-svg.ts';
import { basesWords, busTable, elementTable, faultTable, flagTable, loadTable, powerTable, tableContext, type ResultTable } from '../../../../shared/report/tables.ts';
import { BASE_CASE_ID, circuitCases } from '../../../../shared/engine/index.ts';
import { SAFETY_CAUTION } from '../../../../shared/review/risk.ts';
import { Button } from '../../../components/button.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { useReview } from '../api/get-review.ts';
import { useRevision } from '../api/get-revision.ts';
import { useStudyRecord } from '../api/get-study-record.ts';
import { reportUrl } from '../api/report.ts';
import { useDocumentTitle } from '../../../lib/document-title.ts';

const FONT = 'IBM Plex Sans, sans-serif';

/** The study cases of a stored circuit; none when its list cannot be read (the solve then says why). */
function casesOf(circuit: unknown): { id: string }[] {
  try {
    return circuitCases(circuit);
  } catch {
    return [];
  }
}
const TABLE = 'w-full border-collapse text-[11px] [&_td]:border-t [&_td]:border-rule [&_td]:px-1 [&_td]:py-0.5 [&_td]:align-top [&_th]:px-1 [&_th]:py-0.5 [&_th]:text-left [&_th]:align-bottom [&_th]:font-semibold [&_th]:text-ink-muted';

function PrintTable({ table, columns, title }: { table: ResultTable; columns?: number[]; title?: string }) {
  const cols = columns ?? table.columns.map((_, i) => i);
  return (
    <section className="mb-3 break-inside-avoid-page">
      <h3 className="text-[13px]">{title ?? table.title}</h3>
      {table.rows.length === 0 ? (
        <p className="text-[12px] text-ink-muted">None.</p>
      ) : (
        // A narrow screen scrolls a wide table inside its own box; paper shows it whole.
        <div className="relative overflow-x-auto print:overflow-visible">
        <table aria-label={title ?? table.title} className={TABLE}>
          <thead>
            <tr>
              {cols.map((i) => (
                <th key={i} scope="col">
                  {table.columns[i]}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {table.rows.map((r, k) => (
              <tr key={k} className="break-inside-avoid">
                {cols.map((i) => (
                  <td key={i} className={i > 0 && /^[−\d.-]/.test(r[i] ?? '') ? 'num text-right' : ''}>
                    {r[i]}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
        </div>
      )}
    </section>
  );
}

/** SVG text made by shared/report (names escaped there) drawn inline. */
function Svg({ svg, label }: { svg: string; label: string }) {
  return <div role="img" aria-label={label} className="[&_svg]:h-auto [&_svg]:max-w-full" dangerouslySetInnerHTML={{ __html: svg }} />;
}

export function PrintPage({ studyId, n, units = 'si', caseId }: { studyId: string; n: number; units?: ResultUnits; caseId?: string }) {
  const revision = useRevision(studyId, n);
  const study = useStudyRecord(studyId);
  const review = useReview(studyId);

  const solved = useMemo(() => {
    if (!revision.data) return null;
    const circuit = revision.data.content.circuit;
    // a link may name a case this revision does not have (deleted later, or mistyped): say so, never crash
    if (caseId !== undefined && caseId !== BASE_CASE_ID && !casesOf(circuit).some((c) => c.id === caseId)) return { missingCase: caseId };
    return solveReported(circuit, caseId);
  }, [revision.data, caseId]);
  // the browser's "Save as PDF" names the file after the title, and prints it at the head of each page
  const shownCase = solved && !('missingCase' in solved) ? solved.caseName : null;
  useDocumentTitle(study.data ? `${study.data.name} — Revision ${n}${shownCase ? `, case ${shownCase}` : ''}` : null);

  if (revision.isPending || study.isPending) return <Loading />;
  if (revision.isError || study.isError || !solved || !revision.data || !study.data)
    return <Notice tone="error" title={`Revision ${n} could not be loaded.`}>{revision.error?.message ?? study.error?.message}</Notice>;
  if ('missingCase' in solved)
    return (
      <Notice tone="error" title={`Revision ${n} has no study case “${solved.missingCase}”.`}>
        <Link to={`/studies/${studyId}/print/${n}${units === 'pu' ? '?units=pu' : ''}`} className="font-semibold text-accent hover:underline">
          Print view of the base circuit
        </Link>
      </Notice>
    );

  const rev = revision.data;
  const s = study.data;
  const approved = s.status === 'approved' && s.approvedRevision === n;
  const approval = approved ? [...(review.data?.events ?? [])].reverse().find((e) => e.action === 'approve' && e.revision === n) : undefined;
  const underReview = s.review?.revision === n;
  const status = approved ? 'Approved' : underReview && s.status === 'in-review' ? 'In review (not yet approved)' : underReview && s.status === 'changes-requested' ? 'Changes requested' : 'Draft — not reviewed';
  const { circuit, caseName, names, result, failure } = solved;
  const ctx = result ? tableContext(circuit, result, units, readPerUnitSettings(rev.content.layout)) : null;
  const foot = `${s.name} — Revision ${n}${caseName ? `, case "${caseName}"` : ''}`;
  const diagram = oneLineSvg(circuit, rev.content.layout, FONT);

  return (
    <article aria-label="Study report" className="relative mx-auto max-w-[900px] bg-panel p-6 text-[13px] print:max-w-none print:p-0">
      {approved ? null : (
        <div aria-hidden="true" className="pointer-events-none fixed inset-0 flex items-center justify-center overflow-hidden print:z-50">
          <span className="-rotate-45 text-[64px] font-semibold text-ink opacity-[0.07]">DRAFT — not reviewed</span>
        </div>
      )}
      <div className="mb-3 flex flex-wrap gap-2 print:hidden">
        <Button variant="primary" onClick={() => window.print()}>
          Print
        </Button>
        <a href={reportUrl(studyId, { revision: n, ...(caseId ? { case: caseId } : {}), ...(units === 'pu' ? { units } : {}) })} download className="self-center font-semibold text-accent hover:underline">
          Download the PDF
        </a>
        <Link to={`/studies/${studyId}`} className="self-center font-semibold text-accent hover:underline">
          Back to the study
        </Link>
      </div>

      <h1 className="text-[22px]">{s.name}</h1>
      <dl className="my-2 grid grid-cols-[10rem_1fr] gap-x-3 text-[13px]">
        <dt className="font-semibold">Revision</dt>
        <dd>
          {n}
          {rev.message ? ` — ${rev.message}` : ''}
        </dd>
        {caseName ? (
          <>
            <dt className="font-semibold">Study case</dt>
            <dd>{caseName}</dd>
          </>
        ) : null}
        <dt className="font-semibold">Author</dt>
        <dd>{rev.author.name}</dd>
        <dt className="font-semibold">Revision date</dt>
        <dd>{rev.createdAt.slice(0, 10)}</dd>
        <dt className="font-semibold">Review status</dt>
        <dd>{status}</dd>
        {approved ? (
          <>
            <dt className="font-semibold">Approved by</dt>
            <dd>
              {approval?.actor.name ?? ''}
              {approval ? ` on ${approval.at.slice(0, 10)}` : ''}
            </dd>
          </>
        ) : null}
        <dt className="font-semibold">Units</dt>
        <dd>{units === 'pu' ? 'per unit (bases below)' : 'volts, amperes, kW and kvar'}</dd>
      </dl>
      <p role="note" aria-label="Report caution" className="my-2 font-semibold text-caution">
        Caution. {SAFETY_CAUTION}
      </p>

      <h2 className="mt-4 text-[16px]">Scope and assumptions</h2>
      <ul className="list-disc pl-5">
        {scopeLines(circuit, result, caseName).map((l) => (
          <li key={l}>{l}</li>
        ))}
      </ul>

      <h2 className="mt-4 text-[16px] print:break-before-page">One-line diagram</h2>
      {inputGroups(circuit).length === 0 ? <p>{NOTHING_DRAWN}</p> : <Svg svg={diagram.svg} label="One-line diagram" />}

      <h2 className="mt-4 text-[16px] print:break-before-page">Circuit inputs</h2>
      {inputGroups(circuit).length === 0 ? <p>{NOTHING_DRAWN}</p> : null}
      {inputGroups(circuit).map((g) => (
        <PrintTable key={g.title} table={{ id: g.title, title: g.title, columns: ['Name', 'Parameters'], rows: g.rows }} />
      ))}

      <h2 className="mt-4 text-[16px] print:break-before-page">Results</h2>
      {!result || !ctx ? (
        <Notice tone="error" title="This revision cannot be solved.">
          {failure}
        </Notice>
      ) : (
        <>
          {units === 'pu' ? <p className="text-[12px] text-ink-muted">{basesWords(ctx)}</p> : null}
          {(() => {
            const buses = busTable(ctx);
            return busColumnGroups(buses.columns).map((g) => <PrintTable key={g.title} table={buses} columns={g.columns} title={g.title} />);
          })()}
          <PrintTable table={loadTable(ctx)} />
          <PrintTable table={elementTable(ctx)} />
          <PrintTable table={powerTable(ctx)} />
          {result.faults.length ? <PrintTable table={faultTable(ctx)} /> : null}
          {flaggedBuses(result, names).length ? (
            <>
              <h2 className="mt-4 text-[16px] print:break-before-page">Phasor diagrams of the flagged buses</h2>
              <p className="text-[12px] text-ink-muted">Voltages to earth from the origin (solid); line-to-neutral voltages from the neutral point (dashed).</p>
              <div className="grid grid-cols-2 gap-2">
                {flaggedBuses(result, names).map((b) => (
                  <Svg key={b.bus} svg={phasorSvg(b, FONT, 260)} label={`Phasor diagram of ${b.bus}`} />
                ))}
              </div>
            </>
          ) : null}
          <h2 className="mt-4 text-[16px]">Flags</h2>
          <PrintTable table={flagTable(ctx)} />
        </>
      )}
      <h2 className="mt-4 text-[16px]">Caution</h2>
      <p className="font-semibold text-caution">{SAFETY_CAUTION}</p>
      <footer className="mt-6 truncate border-t border-rule pt-1 text-[11px] text-ink-muted print:fixed print:inset-x-0 print:bottom-0 print:mt-0 print:bg-white">{foot}</footer>
    </article>
  );
}
