import type { ReactNode } from 'react';
import type { RevisionDiff } from '../../../../shared/api/revisions.ts';
import { formatDelta } from '../utils/format-values.ts';
import { ResultsCaution } from './results-caution.tsx';

const KIND_LABEL: Record<RevisionDiff['results'][number]['kind'], string> = {
  'bus-voltage': 'Bus voltage',
  'neutral-current': 'Neutral current',
  'neutral-shift': 'Neutral shift',
  unbalance: 'Unbalance',
};

const H3 = 'text-[12px] font-semibold uppercase tracking-wide text-ink-muted';
const TABLE = 'w-full border-collapse text-[13px] [&_td]:border-t [&_td]:border-rule [&_td]:px-2 [&_td]:py-1 [&_th]:px-2 [&_th]:py-1 [&_th]:text-left [&_th]:font-semibold [&_th]:text-ink-muted';

function Empty({ children }: { children: string }) {
  return <p className="text-[13px] text-ink-muted">{children}</p>;
}

/**
 * What a reviewer reads first: the change in key results (words and numbers with units), flags
 * that appeared or cleared, then the model edits element by element and parameter by parameter.
 */
type Change = RevisionDiff['circuit'][number];

/** One table of changed values: what changed, its value at the older revision and at the newer one. */
function ChangesTable({ label, first, diff, changes, children }: { label: string; first: string; diff: RevisionDiff; changes: Change[]; children?: ReactNode }) {
  return (
    <table aria-label={label} className={TABLE}>
      {children}
      <thead>
        <tr>
          <th scope="col">{first}</th>
          <th scope="col">Revision {diff.from}</th>
          <th scope="col">Revision {diff.to}</th>
        </tr>
      </thead>
      <tbody>
        {changes.map((c) => (
          <tr key={c.path}>
            <td>{c.label}</td>
            <td className="num">{c.fromText}</td>
            <td className="num">{c.toText}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export function DiffView({ diff }: { diff: RevisionDiff }) {
  const { elements } = diff;
  const same = diff.from === diff.to;
  const nothing =
    elements.added.length + elements.removed.length + elements.changed.length + diff.circuit.length + (diff.cases ?? []).length + diff.results.length + diff.flags.added.length + diff.flags.removed.length === 0 &&
    !diff.layoutChanged &&
    !diff.settingsChanged;
  return (
    <div className="flex flex-col gap-4">
      {same ? <Empty>{`Both sides are revision ${diff.to}: nothing to compare.`}</Empty> : nothing ? <Empty>No differences between these revisions.</Empty> : null}

      {diff.solve.from === 'error' || diff.solve.to === 'error' ? (
        <div role="status" className="rounded-[3px] border border-danger/50 bg-danger-soft px-3 py-2 text-[13px]">
          <span aria-hidden="true">✕ </span>
          {diff.solve.from === 'error' ? <span className="block">Revision {diff.from} does not solve: {diff.solve.fromError ?? 'engine error'}</span> : null}
          {diff.solve.to === 'error' ? <span className="block">Revision {diff.to} does not solve: {diff.solve.toError ?? 'engine error'}</span> : null}
        </div>
      ) : null}

      <section aria-labelledby="diff-results" className="flex flex-col gap-2">
        <h3 id="diff-results" className={H3}>
          Results
        </h3>
        {diff.results.length === 0 ? (
          <Empty>No key result changed by more than 0.05 of its unit.</Empty>
        ) : (
          <div className="relative overflow-x-auto">
            <table aria-label="Result changes" className={TABLE}>
              <thead>
                <tr>
                  <th scope="col">What changed</th>
                  <th scope="col">Quantity</th>
                  <th scope="col" className="text-right">
                    Change
                  </th>
                </tr>
              </thead>
              <tbody>
                {diff.results.map((r) => (
                  <tr key={`${r.kind}:${r.key}`}>
                    <td className="num">{r.text}</td>
                    <td className="text-ink-muted">{KIND_LABEL[r.kind]}</td>
                    <td className="num text-right font-semibold">{r.delta === null ? (r.to === null ? 'gone' : 'new') : formatDelta(r.delta, r.unit)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
        <ResultsCaution />
      </section>

      <section aria-labelledby="diff-flags" className="flex flex-col gap-1">
        <h3 id="diff-flags" className={H3}>
          Flags
        </h3>
        {diff.flags.added.length + diff.flags.removed.length === 0 ? (
          <Empty>No flag appeared or cleared.</Empty>
        ) : (
          <ul aria-label="Flag changes" className="flex flex-col gap-0.5 text-sm">
            {diff.flags.added.map((f) => (
              <li key={`+${f.key}`} className="text-danger">
                <span aria-hidden="true">▲ </span>
                {f.text}
              </li>
            ))}
            {diff.flags.removed.map((f) => (
              <li key={`-${f.key}`} className="text-ok">
                <span aria-hidden="true">▽ </span>
                {f.text}
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby="diff-elements" className="flex flex-col gap-2">
        <h3 id="diff-elements" className={H3}>
          Elements
        </h3>
        {elements.added.length + elements.removed.length + elements.changed.length === 0 ? <Empty>No element added, removed or changed.</Empty> : null}
        {elements.added.length > 0 ? (
          <p className="text-sm">
            <span className="font-semibold">Added:</span>{' '}
            {elements.added.map((e, i) => (
              <span key={e.id}>
                {i > 0 ? ', ' : ''}
                <span className="num">{e.id}</span> ({e.typeLabel})
              </span>
            ))}
          </p>
        ) : null}
        {elements.removed.length > 0 ? (
          <p className="text-sm">
            <span className="font-semibold">Removed:</span>{' '}
            {elements.removed.map((e, i) => (
              <span key={e.id}>
                {i > 0 ? ', ' : ''}
                <span className="num">{e.id}</span> ({e.typeLabel})
              </span>
            ))}
          </p>
        ) : null}
        {elements.changed.map((e) => (
          <div key={e.id} className="relative overflow-x-auto">
            <ChangesTable label={`Changes to ${e.id}`} first="Parameter" diff={diff} changes={e.changes}>
              <caption className="text-left text-sm font-semibold">
                <span className="num">{e.id}</span> <span className="font-normal text-ink-muted">({e.typeLabel})</span>
              </caption>
            </ChangesTable>
          </div>
        ))}
      </section>

      {(diff.cases ?? []).length > 0 ? (
        <section aria-labelledby="diff-cases" className="flex flex-col gap-1">
          <h3 id="diff-cases" className={H3}>
            Study cases
          </h3>
          <ul aria-label="Study case changes" className="flex flex-col gap-0.5 text-[13px]">
            {diff.cases.map((c, i) => (
              <li key={i}>{c.text}</li>
            ))}
          </ul>
        </section>
      ) : null}

      {diff.circuit.length > 0 || diff.layoutChanged || diff.settingsChanged ? (
        <section aria-labelledby="diff-circuit" className="flex flex-col gap-1">
          <h3 id="diff-circuit" className={H3}>
            Circuit, layout and settings
          </h3>
          {diff.circuit.length > 0 ? (
            <ChangesTable label="Circuit changes" first="Setting" diff={diff} changes={diff.circuit} />
          ) : null}
          {diff.layoutChanged ? <p className="text-[13px] text-ink-muted">The diagram layout changed.</p> : null}
          {diff.settingsChanged ? <p className="text-[13px] text-ink-muted">The workspace settings changed.</p> : null}
        </section>
      ) : null}
    </div>
  );
}
