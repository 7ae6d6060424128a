/** The V/pu (or A/pu) switch above a results table: SI units or per unit of the study's bases. */
import type { ReactNode } from 'react';
import type { ResultUnits } from '../../../../shared/report/per-unit.ts';

/** `label` names the group ("Bus voltage units"); `siWord` is the SI button ("V", "A"); `note` shows in pu. */
export function UnitsSwitch({ label, lead, siWord, units, onChange, note }: { label: string; lead: string; siWord: string; units: ResultUnits; onChange: (u: ResultUnits) => void; note?: ReactNode }) {
  return (
    <div role="group" aria-label={label} className="mb-1 flex items-center gap-1 text-[11px] print:hidden">
      <span className="text-ink-muted">{lead}</span>
      {(['si', 'pu'] as const).map((k) => (
        <button
          key={k}
          type="button"
          aria-pressed={units === k}
          onClick={() => onChange(k)}
          className={`h-5 rounded-[3px] border px-1.5 font-semibold ${units === k ? 'border-accent bg-accent-soft text-ink' : 'border-rule-strong bg-panel text-ink-muted hover:bg-sunken'}`}
        >
          {k === 'si' ? siWord : 'pu'}
        </button>
      ))}
      {units === 'pu' && note ? <span className="text-ink-muted">{note}</span> : null}
    </div>
  );
}
