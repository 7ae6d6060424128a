/**
 * The impedances of a source, line or transformer bank in per unit of the study's bases (study
 * settings), below its form: what an engineer checks against a per-unit one-line. The bus nominal
 * voltages come from the live solve (a line's level is its from-bus's).
 */
import { useMemo } from 'react';
import type { CircuitElementInput } from '../../../../shared/engine/index.ts';
import { elementImpedancesPu } from '../../../../shared/report/element-pu.ts';
import { readPerUnitSettings, type PerUnitSettings } from '../../../../shared/report/per-unit.ts';
import { useWorkspaceResults } from '../results/results-context.tsx';

const n = (x: number) => (Math.abs(x) < 5e-7 ? '0' : x.toPrecision(4).replace(/\.?0+$/, ''));

export function PerUnitReadout({ element, perUnit }: { element: CircuitElementInput; perUnit?: PerUnitSettings }) {
  const { result } = useWorkspaceResults();
  const rows = useMemo(() => {
    const s = perUnit ?? readPerUnitSettings(undefined);
    const byBus = new Map((result?.buses ?? []).map((b) => [b.bus, b.nominalVLL] as const));
    return elementImpedancesPu(element, s, (bus) => byBus.get(bus));
  }, [element, perUnit, result]);
  if (rows.length === 0) return null;
  return (
    <div aria-label="Impedance in per unit" role="group" className="rounded-[3px] border border-rule bg-sunken/40 p-1.5 text-[12px]">
      <h3 className="font-semibold">In per unit</h3>
      <dl>
        {rows.map((r) => (
          <div key={r.label} className="flex flex-col">
            <dt className="text-ink-muted">{r.label}</dt>
            <dd className="num">
              {n(r.pu.re)} {r.pu.im < 0 ? '−' : '+'} j{n(Math.abs(r.pu.im))} pu <span className="text-ink-muted">({r.base})</span>
            </dd>
          </div>
        ))}
      </dl>
    </div>
  );
}
