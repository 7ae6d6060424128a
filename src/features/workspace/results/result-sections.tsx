/** The smaller sections of the results panel: limits and flags, power balance, transformers, faults, floating parts, caution. */
import { useMemo, useState } from 'react';
import { UNBALANCE_METRICS, type CircuitResult, type Flag, type Phasor } from '../../../../shared/engine/index.ts';
import { formatPu } from '../../../../shared/report/format.ts';
import { busBase, readPerUnitSettings, type PerUnitSettings, type ResultUnits } from '../../../../shared/report/per-unit.ts';
import { UnbalanceSummary } from './unbalance-summary.tsx';
import { SEVERITY } from './flag-mark.tsx';
import { formatAngle, formatMagnitude, formatPhasor, formatValue, kvar, kW } from './format.ts';
import { UnitsSwitch } from './units-switch.tsx';
import { phaseStyle, type WiringStandard } from './phase-style.ts';

const METRIC_NAME = { iec: 'IEC negative-sequence factor |V2|/|V1|', nema: 'NEMA line-voltage unbalance (max deviation from average)', ieee: 'IEEE phase-voltage unbalance (line-to-neutral)' } as const;

/** The limit set in force and every flag, most severe first. */
export function FlagsSection({ result }: { result: CircuitResult }) {
  const [showAll, setShowAll] = useState(false);
  const l = result.limits;
  const rank = { violation: 0, warning: 1, info: 2 } as const;
  const flags = result.flags.slice().sort((a, b) => rank[a.severity] - rank[b.severity]);
  return (
    <section aria-labelledby="res-flags">
      <h3 id="res-flags" className="text-[12px] font-semibold uppercase tracking-wide text-ink-muted">
        Limits and flags
      </h3>
      <p className="text-[12px]">
        Limit set in force: <strong>{l.name}</strong>. Voltage warning outside {l.voltageWarningPu.map((x) => x.toFixed(3)).join('–')} pu, violation outside{' '}
        {l.voltageViolationPu.map((x) => x.toFixed(3)).join('–')} pu; unbalance, each definition against its own limit: {UNBALANCE_METRICS.map((m) => `${METRIC_NAME[m]} ≤ ${l.unbalanceLimits?.[m] ?? l.unbalancePercent} %`).join(', ')}; neutral shift ≤ {l.neutralShiftPercent} % of nominal V_LN; transformer loading ≤ {l.loadingPercent} %.
      </p>
      <UnbalanceSummary result={result} />
      {flags.length === 0 ? (
        <p className="mt-1 text-[12px] text-ok">
          <span aria-hidden="true">✓ </span>No flags: every bus and element is within the limit set.
        </p>
      ) : (
        <>
          <ul className="mt-1 space-y-0.5 text-[12px]" aria-label="Flags">
            {(showAll ? flags : flags.slice(0, FLAGS_SHOWN)).map((f, i) => (
              <FlagRow key={i} flag={f} />
            ))}
          </ul>
          {flags.length > FLAGS_SHOWN ? (
            <button type="button" onClick={() => setShowAll((x) => !x)} aria-expanded={showAll} className="mt-1 text-[12px] font-semibold text-accent hover:underline">
              {showAll ? 'Show the first flags only' : `Show all ${flags.length} flags`}
            </button>
          ) : null}
        </>
      )}
    </section>
  );
}

/** How many flags show before "Show all" (a 300-element study can raise a hundred). */
const FLAGS_SHOWN = 12;

function FlagRow({ flag }: { flag: Flag }) {
  const s = SEVERITY[flag.severity];
  return (
    <li className="flex gap-1.5">
      <span className={`inline-flex h-4 shrink-0 items-center gap-0.5 rounded-[2px] border px-1 text-[10px] font-semibold uppercase ${s.cls}`}>
        <span aria-hidden="true">{s.sign}</span>
        {s.word}
      </span>
      <span>{flag.message}</span>
    </li>
  );
}

/** A residual in scientific notation, so a tiny one is still shown rather than rounded to 0. */
const sci = (x: number) => x.toExponential(2).replace(/-/g, '−');

/** Power totals and the balance check: source = load + faults + losses, residual shown. */
export function PowerSummary({ result, perUnit }: { result: CircuitResult; perUnit?: PerUnitSettings }) {
  const [units, setUnits] = useState<ResultUnits>('si');
  const bases = useMemo(() => perUnit ?? readPerUnitSettings(undefined), [perUnit]);
  const t = result.totals;
  const sBase = bases.baseMva * 1e6;
  const puOf = (x: number) => `${formatPu(x / sBase)} pu`;
  // A residual within a millionth of the source power (or 1 mVA) is rounding (P: solver tolerance).
  const tol = Math.max(1e-3, 1e-6 * t.sourcePower.mag);
  const ok = t.powerBalanceResidual.mag <= tol;
  const rows: [string, typeof t.sourcePower][] = [
    ['Delivered by sources', t.sourcePower],
    ['Absorbed by loads', t.loadPower],
    ['Absorbed at faults', t.faultPower],
    ['Losses', t.losses],
  ];
  return (
    <section aria-labelledby="res-power">
      <h3 id="res-power" className="text-[12px] font-semibold uppercase tracking-wide text-ink-muted">
        Power balance
      </h3>
      <UnitsSwitch label="Power units" lead="Power in" siWord="kW, kvar" units={units} onChange={setUnits} note={`of the system base, ${bases.baseMva} MVA.`} />
      <table aria-label="Power summary" className="text-[12px]">
        <thead>
          <tr className="text-ink-muted">
            <th scope="col" className="pr-3 text-left font-semibold" />
            <th scope="col" className="px-2 text-right font-semibold">P ({units === 'pu' ? 'pu' : 'kW'})</th>
            <th scope="col" className="px-2 text-right font-semibold">Q ({units === 'pu' ? 'pu' : 'kvar'})</th>
          </tr>
        </thead>
        <tbody className="num">
          {rows.map(([label, s]) => (
            <tr key={label}>
              <th scope="row" className="pr-3 text-left font-normal" style={{ fontFamily: 'var(--font-sans)' }}>
                {label}
              </th>
              <td className="px-2 text-right">{units === 'pu' ? puOf(s.re) : kW(s)}</td>
              <td className="px-2 text-right">{units === 'pu' ? puOf(s.im) : kvar(s)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="mt-1 text-[12px]">
        Check, source = load + faults + losses: residual{' '}
        <span className="num">
          {sci(t.powerBalanceResidual.re)} W, {sci(t.powerBalanceResidual.im)} var
        </span>{' '}
        {ok ? <span className="font-semibold text-ok">✓ balanced</span> : <span className="font-semibold text-danger">✕ does not balance: check the model</span>}. Largest KCL residual{' '}
        <span className="num">{sci(t.maxKclResidualAmps)} A</span>.
      </p>
    </section>
  );
}

/** Transformer loading and the phase shift in force. */
export function TransformerSection({ result }: { result: CircuitResult }) {
  const xs = Object.values(result.elements).filter((e) => e.loadingPercent !== undefined || e.phaseShift);
  if (xs.length === 0) return null;
  return (
    <section aria-labelledby="res-xfmr">
      <h3 id="res-xfmr" className="text-[12px] font-semibold uppercase tracking-wide text-ink-muted">
        Transformers
      </h3>
      <p className="text-[11px] text-ink-muted">Shift convention: {result.conventions.transformerShift}</p>
      <ul className="text-[12px]">
        {xs.map((e) => {
          const over = e.loadingPercent !== undefined && e.loadingPercent > result.limits.loadingPercent;
          return (
            <li key={e.id}>
              <strong>{e.id}</strong>: loading <span className="num">{formatValue(e.loadingPercent, '%', 1)}</span>
              {over ? <span className="ml-1 font-semibold text-caution">(over {result.limits.loadingPercent} %)</span> : null}
              {e.phaseShift ? (
                <>
                  {' '}
                  · {e.phaseShift.vectorGroup}, low side lags high side by <span className="num">{e.phaseShift.lvLagsHvDeg}°</span> ({e.phaseShift.convention === 'iec' ? 'IEC clock number' : 'North American rule'})
                </>
              ) : null}
              {e.tapPercent !== undefined ? (
                <>
                  {' '}
                  · tap <span className="num">{e.tapPercent > 0 ? '+' : e.tapPercent < 0 ? '−' : ''}{Math.abs(e.tapPercent)} %</span> on the HV winding
                </>
              ) : null}
              {e.losses ? (
                <>
                  {' '}
                  · losses <span className="num">{kW(e.losses)}</span>
                </>
              ) : null}
            </li>
          );
        })}
      </ul>
    </section>
  );
}

/** A fault current in the chosen units: A∠° as formatted, or per unit of `amps` with its angle (— without a base). */
function faultCurrent(p: Phasor, units: ResultUnits, amps: number | undefined): string {
  if (units === 'si') return formatPhasor(p, 'A');
  if (!amps) return '—';
  return p.mag < 1e-6 ? '0 pu' : `${formatPu(p.mag / amps)} pu∠${formatAngle(p.angleDeg)}`;
}

/**
 * Fault currents, when the study has a fault element. An A/pu switch shows them in per unit of the
 * base current of the faulted bus's level (`perUnit`, the study's bases), as the report and the CSV do.
 */
export function FaultSection({ result, standard, perUnit }: { result: CircuitResult; standard: WiringStandard; perUnit?: PerUnitSettings }) {
  const [units, setUnits] = useState<ResultUnits>('si');
  const bases = useMemo(() => perUnit ?? readPerUnitSettings(undefined), [perUnit]);
  if (result.faults.length === 0) return null;
  const u = units === 'pu' ? 'pu' : 'A';
  return (
    <section aria-labelledby="res-faults">
      <h3 id="res-faults" className="text-[12px] font-semibold uppercase tracking-wide text-ink-muted">
        Faults
      </h3>
      <UnitsSwitch
        label="Fault current units"
        lead="Currents in"
        siWord="A"
        units={units}
        onChange={setUnits}
        note={`of the base current of the faulted bus's level, I_base = S_base / (√3 · V_base,LL), on ${bases.baseMva} MVA.`}
      />
      <table aria-label="Fault currents" className="text-[12px]">
        <thead className="text-ink-muted">
          <tr>
            <th scope="col" className="pr-2 text-left">Fault</th>
            {(['a', 'b', 'c'] as const).map((p) => (
              <th key={p} scope="col" className="px-2 text-right">
                I {phaseStyle(p, standard).label} ({u}∠°)
              </th>
            ))}
            <th scope="col" className="px-2 text-right">I to earth ({u}∠°)</th>
            <th scope="col" className="px-2 text-right">I1, I2, I0 ({u})</th>
          </tr>
        </thead>
        <tbody className="num">
          {result.faults.map((f) => {
            const b = result.buses.find((x) => x.bus === f.bus);
            const amps = b ? busBase(bases, b)?.amps : undefined;
            const seq = (x: number) => (units === 'si' ? formatMagnitude(x) : amps ? formatPu(x / amps) : '—');
            return (
              <tr key={f.id}>
                <th scope="row" className="pr-2 text-left" style={{ fontFamily: 'var(--font-sans)' }}>
                  {f.id} <span className="font-normal text-ink-muted">({f.kind}, {f.phases.join('')} at {f.bus})</span>
                </th>
                {(['a', 'b', 'c'] as const).map((p) => (
                  <td key={p} className="px-2 text-right">
                    {faultCurrent(f.phaseCurrents[p], units, amps)}
                  </td>
                ))}
                <td className="px-2 text-right">{faultCurrent(f.earthCurrent, units, amps)}</td>
                <td className="px-2 text-right">{[f.sequence.positive, f.sequence.negative, f.sequence.zero].map((s) => seq(s.mag)).join(', ')}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </section>
  );
}

/** Parts of the network with no path to earth. */
export function FloatingNotices({ result }: { result: CircuitResult }) {
  if (result.floating.length === 0) return null;
  return (
    <div role="note" aria-label="Floating parts" className="rounded-[3px] border border-caution/50 bg-caution-soft px-2 py-1 text-[12px]">
      {result.floating.map((f, i) => (
        <p key={i}>
          <span aria-hidden="true">! </span>
          <strong>Floating part:</strong> {f.nodes.length} node{f.nodes.length === 1 ? '' : 's'} ({f.nodes.slice(0, 6).join(', ')}
          {f.nodes.length > 6 ? ', …' : ''}) have no path to earth. Their voltages to earth are shown with {f.referenceNode} held at 0 V, so only voltages within the part are meaningful.
        </p>
      ))}
    </div>
  );
}

/** The safety caution every results view carries (same words as the README caution). */
export function ResultsCaution() {
  return (
    <p role="note" aria-label="Results caution" className="border-t border-rule pt-2 text-[11px] text-ink-muted">
      <span className="font-semibold text-caution">
        <span aria-hidden="true">⚠ </span>Caution:
      </span>{' '}
      Wyeward is an engineering aid; these results are only as good as the model. Designs must follow local codes and be checked under licensed practice.
      Lost-neutral conditions put dangerous voltages on equipment.
    </p>
  );
}
