import { Link } from 'react-router';
import { formatVolts, plural } from '../../../lib/format.ts';
import { summarizeCircuit } from '../utils/content-summary.ts';

/** What the study's circuit holds: element counts by type, buses, nominal voltages and frequency. */
export function ContentSummaryPanel({ circuit, workspaceHref }: { circuit: unknown; workspaceHref?: string }) {
  const s = summarizeCircuit(circuit);
  return (
    <section aria-labelledby="summary-title" className="rounded-[4px] border border-rule bg-panel">
      <h2 id="summary-title" className="border-b border-rule px-4 py-2 text-[13px] uppercase tracking-wide text-ink-muted">
        Circuit content
      </h2>
      <div className="grid gap-4 px-4 py-3 md:grid-cols-3">
        <dl className="grid grid-cols-[max-content_1fr] content-start gap-x-4 gap-y-1 text-sm">
          <dt className="text-ink-muted">Frequency</dt>
          <dd className="num">{s.frequencyHz === null ? '—' : `${s.frequencyHz} Hz`}</dd>
          <dt className="text-ink-muted">Elements</dt>
          <dd className="num">{s.elementCount}</dd>
          <dt className="text-ink-muted">Buses</dt>
          <dd className="num">{s.buses.length}</dd>
          <dt className="text-ink-muted">Nominal voltages</dt>
          <dd className="num">{s.nominalVolts.length === 0 ? '—' : s.nominalVolts.map(formatVolts).join(', ')}</dd>
          <dt className="text-ink-muted">Phase sequence</dt>
          <dd className="num">{s.sequence ?? 'ABC'}{s.sequence ? '' : <span className="font-sans text-ink-muted"> (default)</span>}</dd>
          {s.limitSet ? (
            <>
              <dt className="text-ink-muted">Limit set</dt>
              <dd className="num">{s.limitSet}</dd>
            </>
          ) : null}
        </dl>
        <div>
          <h3 className="text-[12px] uppercase tracking-wide text-ink-muted">Elements by type</h3>
          {s.byType.length === 0 ? (
            <p className="mt-1 text-sm text-ink-muted">The circuit is empty.</p>
          ) : (
            <table className="mt-1 text-sm">
              <thead className="sr-only">
                <tr>
                  <th scope="col">Element type</th>
                  <th scope="col">Count</th>
                </tr>
              </thead>
              <tbody>
                {s.byType.map((t) => (
                  <tr key={t.type}>
                    <td className="num pr-4">{t.type}</td>
                    <td className="num text-right">{t.count}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </div>
        <div>
          <h3 className="text-[12px] uppercase tracking-wide text-ink-muted">Buses</h3>
          {s.buses.length === 0 ? (
            <p className="mt-1 text-sm text-ink-muted">No buses named.</p>
          ) : (
            <p className="num mt-1 text-[13px] leading-relaxed">{s.buses.join(' · ')}</p>
          )}
        </div>
      </div>
      {s.problems.length > 0 ? (
        <ul className="border-t border-rule px-4 py-2 text-[13px] text-caution">
          {s.problems.map((p) => (
            <li key={p}>
              <span aria-hidden="true">! </span>
              {p}
            </li>
          ))}
        </ul>
      ) : null}
      <p className="border-t border-rule px-4 py-2 text-[12px] text-ink-muted">
        {plural(s.elementCount, 'element')} stored.{' '}
        {workspaceHref ? (
          <>
            <Link to={workspaceHref} className="font-semibold text-accent underline underline-offset-2">
              Open the diagram workspace
            </Link>{' '}
            to draw and solve it.{' '}
          </>
        ) : null}
        When solved, Wyeward states phasors as RMS magnitude∠degrees with earth as the reference node, and complex power as
        S = V·I* in load convention (Q &gt; 0 lagging).
      </p>
    </section>
  );
}
