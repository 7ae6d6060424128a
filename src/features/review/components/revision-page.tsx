import { useState } from 'react';
import { Link, useNavigate } from 'react-router';
import type { Role } from '../../../../shared/api/common.ts';
import type { ResultsSummary } from '../../../../shared/review/summary.ts';
import { circuitNames, countWords, drawnCounts, drawnElements, type CircuitNames } from '../../../../shared/review/user-names.ts';
import { Button, buttonClass } from '../../../components/button.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { useRevision } from '../api/get-revision.ts';
import { useRevisions } from '../api/get-revisions.ts';
import { canWrite } from '../utils/permissions.ts';
import { formatQuantity } from '../utils/format-values.ts';
import { RestoreDialog } from './restore-dialog.tsx';
import { ResultsCaution } from './results-caution.tsx';
import { RevisionResults } from './revision-results.tsx';
import { StudyCrumbs } from './study-crumbs.tsx';
import { useDocumentTitle } from '../../../lib/document-title.ts';
import { useStudyRecord } from '../api/get-study-record.ts';
import { reportUrl } from '../api/report.ts';

const TABLE = 'w-full border-collapse text-[13px] [&_td]:border-t [&_td]:border-rule [&_td]:px-2 [&_td]:py-1 [&_th]:px-2 [&_th]:py-1 [&_th]:text-left [&_th]:font-semibold [&_th]:text-ink-muted';

/** Counts by element type (in words) and the bus names of a stored circuit, as drawn: hidden switches and private terminal buses left out. */
function contentFacts(circuit: unknown) {
  const buses = new Set<string>();
  for (const e of drawnElements(circuit).values()) {
    for (const k of ['bus', 'from', 'to']) if (typeof e[k] === 'string') buses.add(e[k] as string);
    if (typeof e.node === 'string' && e.node.lastIndexOf('.') > 0) buses.add(e.node.slice(0, e.node.lastIndexOf('.')));
  }
  return { byType: drawnCounts(circuit).byType, buses: [...buses].sort() };
}

/**
 * A revision's key results: bus voltages, neutral currents and flags, with units, named as the
 * revision's circuit was drawn (a private terminal bus reads "KITCHEN terminals at HOUSE"; a hidden
 * switch's neutral current is its element's, so it is not listed twice).
 */
export function ResultsSummaryTables({ summary, names = circuitNames(null) }: { summary: ResultsSummary; names?: CircuitNames }) {
  if (!summary.ok) {
    const elements = [...new Set(summary.error.elementIds.map((id) => names.drawnElement(id)))];
    return (
      <Notice tone="error" title="This revision does not solve.">
        {names.text(summary.error.message)}
        {elements.length > 0 ? <span className="block">Elements: {elements.join(', ')}</span> : null}
      </Notice>
    );
  }
  const neutralCurrents = summary.neutralCurrents.filter((n) => !names.isHidden(n.elementId));
  const phases = [...new Set(summary.buses.flatMap((b) => Object.keys(b.phaseVolts)))].sort();
  return (
    <div className="flex flex-col gap-3">
      <div className="relative overflow-x-auto">
        <table aria-label="Bus voltages at this revision" className={TABLE}>
          <thead>
            <tr>
              <th scope="col">Bus</th>
              {phases.map((p) => (
                <th key={p} scope="col" className="text-right">
                  V {p}–N (V)
                </th>
              ))}
              <th scope="col" className="text-right">
                Neutral shift (V)
              </th>
              <th scope="col" className="text-right">
                Neutral shift (% of V LN)
              </th>
              <th scope="col" className="text-right">
                Unbalance IEC (%)
              </th>
            </tr>
          </thead>
          <tbody>
            {summary.buses.map((b) => (
              <tr key={b.bus}>
                <th scope="row" className="font-normal text-ink">
                  {names.bus(b.bus)}
                </th>
                {phases.map((p) => (
                  <td key={p} className="num text-right">
                    {b.phaseVolts[p] === undefined ? '—' : formatQuantity(b.phaseVolts[p], 'V')}
                  </td>
                ))}
                <td className="num text-right">{formatQuantity(b.neutralShiftVolts, 'V')}</td>
                <td className="num text-right">{formatQuantity(b.neutralShiftPercent, '%')}</td>
                <td className="num text-right">{formatQuantity(b.iecUnbalancePercent, '%')}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {neutralCurrents.length > 0 ? (
        <div className="relative overflow-x-auto">
          <table aria-label="Neutral currents at this revision" className={TABLE}>
            <thead>
              <tr>
                <th scope="col">Element</th>
                <th scope="col">Bus</th>
                <th scope="col" className="text-right">
                  Neutral current (A)
                </th>
              </tr>
            </thead>
            <tbody>
              {neutralCurrents.map((n) => (
                <tr key={n.key}>
                  <td className="num">{n.elementId}</td>
                  <td>{names.drawnBus(n.bus)}</td>
                  <td className="num text-right">{formatQuantity(n.amps, 'A')}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      <div>
        <h3 className="text-[12px] font-semibold uppercase tracking-wide text-ink-muted">Flags</h3>
        {summary.flags.length === 0 ? (
          <p className="text-[13px] text-ink-muted">No flags.</p>
        ) : (
          <ul aria-label="Flags at this revision" className="text-[13px]">
            {summary.flags.map((f) => (
              <li key={f.key}>
                <span aria-hidden="true">{f.severity === 'violation' ? '▲ ' : '△ '}</span>
                <span className="font-semibold">{f.severity}</span>: {names.text(f.message)}
              </li>
            ))}
          </ul>
        )}
      </div>
    </div>
  );
}

/** One revision, read-only: record, content summary and its results summary. */
export function RevisionPage({ studyId, n, role }: { studyId: string; n: number; role: Role }) {
  const revision = useRevision(studyId, n);
  const revisions = useRevisions(studyId);
  useDocumentTitle(`Revision ${n}`, useStudyRecord(studyId).data?.name);
  const navigate = useNavigate();
  const [restoring, setRestoring] = useState(false);
  const latest = revisions.data?.items[0]?.number;

  return (
    <div className="mx-auto flex max-w-6xl flex-col gap-4">
      <StudyCrumbs studyId={studyId}>
        <Link to={`/studies/${studyId}/history`} className="text-accent hover:underline">
          History
        </Link>{' '}
        <span aria-hidden="true">/</span> Revision {n}
      </StudyCrumbs>
      {revision.isPending ? <Loading label="Loading the revision…" /> : null}
      {revision.isError ? <Notice tone="error" title={`Revision ${n} could not be loaded.`}>{revision.error.message}</Notice> : null}
      {revision.data ? (
        <>
          <div className="flex flex-wrap items-start gap-3">
            <div className="flex-1">
              <h1 className="text-xl">Revision {revision.data.number}</h1>
              <p className="text-[13px] text-ink-muted">Read-only: this is how the study was saved.</p>
            </div>
            <div className="flex flex-wrap items-center gap-2">
              {/* the report of this revision, not of the latest one */}
              <a href={reportUrl(studyId, { revision: n })} download className="text-[13px] font-semibold text-accent hover:underline">
                Report of revision {n} (PDF)
              </a>
              <Link to={`/studies/${studyId}/print/${n}`} className="text-[13px] font-semibold text-accent hover:underline">
                Print view
              </Link>
              {n > 1 ? (
                <Link to={`/studies/${studyId}/diff?from=${n - 1}&to=${n}`} className={buttonClass('secondary')}>
                  Compare with revision {n - 1}
                </Link>
              ) : null}
              {canWrite(role) && latest !== undefined && n !== latest ? (
                <Button variant="primary" onClick={() => setRestoring(true)}>
                  Restore this revision
                </Button>
              ) : null}
            </div>
          </div>
          <div className="grid grid-cols-[minmax(0,1fr)] gap-4 md:grid-cols-[20rem_minmax(0,1fr)]">
            <section aria-labelledby="rev-record" className="rounded-[4px] border border-rule bg-panel px-4 py-3">
              <h2 id="rev-record" className="text-[12px] uppercase tracking-wide text-ink-muted">
                Record
              </h2>
              <dl className="mt-1 grid grid-cols-[max-content_1fr] gap-x-3 gap-y-1 text-[13px]">
                <dt className="text-ink-muted">Message</dt>
                <dd className="break-words">{revision.data.message || '—'}</dd>
                <dt className="text-ink-muted">Author</dt>
                <dd>{revision.data.author.name}</dd>
                <dt className="text-ink-muted">Saved</dt>
                <dd className="num">
                  <time dateTime={revision.data.createdAt}>{formatDateTime(revision.data.createdAt)}</time>
                </dd>
                <dt className="text-ink-muted">Engine</dt>
                <dd className="num">{revision.data.engineVersion}</dd>
                <dt className="text-ink-muted">Restored from</dt>
                <dd>{revision.data.restoredFrom ?? '—'}</dd>
                <dt className="text-ink-muted">Results</dt>
                <dd>
                  <RevisionResults results={revision.data.results} />
                </dd>
              </dl>
              <h3 className="mt-3 text-[12px] uppercase tracking-wide text-ink-muted">Content</h3>
              {(() => {
                const facts = contentFacts(revision.data.content.circuit);
                return (
                  <dl className="mt-1 grid grid-cols-[max-content_1fr] gap-x-3 gap-y-1 text-[13px]">
                    <dt className="text-ink-muted">Frequency</dt>
                    <dd className="num">{revision.data.content.circuit.frequencyHz} Hz</dd>
                    <dt className="text-ink-muted">Elements</dt>
                    <dd>{facts.byType.length === 0 ? 'none' : facts.byType.map((t) => countWords(t.count, t.type)).join(', ')}</dd>
                    <dt className="text-ink-muted">Buses</dt>
                    <dd className="break-words">{facts.buses.join(' · ') || '—'}</dd>
                  </dl>
                );
              })()}
            </section>
            <section aria-labelledby="rev-results" className="flex flex-col gap-3 rounded-[4px] border border-rule bg-panel px-4 py-3">
              <h2 id="rev-results" className="text-base">
                Results at revision {revision.data.number}
              </h2>
              <ResultsSummaryTables summary={revision.data.summary} names={circuitNames(revision.data.content.circuit)} />
              <ResultsCaution />
            </section>
          </div>
          {restoring ? <RestoreDialog studyId={studyId} n={n} open onClose={() => setRestoring(false)} onRestored={() => navigate(`/studies/${studyId}`)} /> : null}
        </>
      ) : null}
    </div>
  );
}
