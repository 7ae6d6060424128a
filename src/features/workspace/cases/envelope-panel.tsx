/**
 * The lost-neutral envelope in the browser: on a bus with single-phase loads between a phase and
 * the neutral, every load varied independently over a range of its value (default 10 % to 100 %),
 * every combination solved with the neutral as the circuit shown has it (the engine's
 * lostNeutralEnvelope, in a sweep worker). Shows the locus of the star point (neutral to earth) on
 * the phasor plane, each load's worst over- and under-voltage, and the share of combinations that
 * put any load outside the limits, with the caution: a lost neutral is a hazard to remove.
 */
import { symbol, symbolCircle } from 'd3-shape';
import { useEffect, useMemo, useRef, useState } from 'react';
import { MAX_ENVELOPE_COMBINATIONS, type CircuitResult, type LostNeutralEnvelope } from '../../../../shared/engine/index.ts';
import { isPrivateName } from '../../../../shared/review/user-names.ts';
import { Button } from '../../../components/button.tsx';
import { SweepPool } from './sweep-pool.ts';

type RawLoad = { type?: string; id?: string; bus?: string; connection?: string; between?: string[]; each?: { kw?: unknown } };

/** Buses with single-phase kW loads between a phase and the neutral (what the envelope varies), with their load count. */
export function envelopeBuses(circuit: unknown): { bus: string; loads: number }[] {
  const els = ((circuit as { elements?: unknown[] } | null)?.elements ?? []) as RawLoad[];
  const count = new Map<string, number>();
  for (const e of els) {
    if (e.type === 'load' && e.connection === 'single' && e.between?.includes('n') && typeof e.each?.kw === 'number' && e.bus && !isPrivateName(e.bus)) count.set(e.bus, (count.get(e.bus) ?? 0) + 1);
  }
  return [...count].map(([bus, loads]) => ({ bus, loads }));
}

const S = 240;
const dot = symbol(symbolCircle, 10)() ?? '';

/** The star point's locus: each combination's neutral-to-earth voltage as a dot on the phasor plane (V). */
function LocusPlot({ env }: { env: LostNeutralEnvelope }) {
  const r = Math.max(1, ...env.locus.map((p) => Math.hypot(p.re, p.im))) * 1.15;
  const k = (S / 2 - 14) / r;
  const tickV = Number((r / 1.15).toPrecision(2));
  return (
    <svg role="img" aria-label={`Locus of the star point at ${env.bus}: ${env.locus.length} combinations, up to ${(r / 1.15).toFixed(1)} V from earth`} viewBox={`0 0 ${S} ${S}`} className="w-[240px] bg-paper">
      <line x1={0} x2={S} y1={S / 2} y2={S / 2} stroke="#d3d0c6" />
      <line y1={0} y2={S} x1={S / 2} x2={S / 2} stroke="#d3d0c6" />
      <circle cx={S / 2} cy={S / 2} r={tickV * k} fill="none" stroke="#d3d0c6" strokeDasharray="3 3" />
      <text x={S / 2 + tickV * k * 0.71 + 2} y={S / 2 - tickV * k * 0.71 - 2} fontSize={10} fill="#5b6369">
        {tickV} V
      </text>
      {env.locus.map((p, i) => (
        <path key={i} d={dot} transform={`translate(${S / 2 + p.re * k} ${S / 2 - p.im * k})`} fill="#a3261b" fillOpacity={0.45} />
      ))}
      <text x={S - 4} y={S / 2 - 4} textAnchor="end" fontSize={10} fill="#5b6369">
        real (V)
      </text>
      <text x={S / 2 + 4} y={10} fontSize={10} fill="#5b6369">
        imaginary (V)
      </text>
    </svg>
  );
}

export function EnvelopePanel({ circuit, result }: { circuit: unknown; result?: CircuitResult }) {
  const buses = useMemo(() => envelopeBuses(circuit), [circuit]);
  const [bus, setBus] = useState('');
  const [from, setFrom] = useState('10');
  const [to, setTo] = useState('100');
  const [levels, setLevels] = useState('5');
  const [state, setState] = useState<{ status: 'running' | 'done' | 'failed'; env?: LostNeutralEnvelope; error?: string } | null>(null);
  const pool = useRef<SweepPool | null>(null);
  const running = useRef<{ cancel(): void } | null>(null);
  useEffect(
    () => () => {
      running.current?.cancel();
      pool.current?.dispose();
    },
    [],
  );
  const chosen = bus || buses[0]?.bus || '';
  const loads = buses.find((b) => b.bus === chosen)?.loads ?? 0;
  const f = Number(from) / 100;
  const t = Number(to) / 100;
  const n = Number(levels);
  const combos = Number.isInteger(n) && n >= 1 ? n ** loads : NaN;
  const problem = !chosen
    ? null
    : !(Number.isFinite(f) && Number.isFinite(t) && f > 0 && t > 0)
      ? 'Enter the range as percentages above 0.'
      : !(Number.isInteger(n) && n >= 1)
        ? 'The number of levels must be a whole number of at least 1.'
        : combos > MAX_ENVELOPE_COMBINATIONS
          ? `${combos} combinations is more than ${MAX_ENVELOPE_COMBINATIONS}; use fewer levels.`
          : null;
  const cause = result?.buses.find((b) => b.bus === chosen)?.neutralCause;
  if (buses.length === 0) return null;

  const runIt = () => {
    if (problem || !circuit) return;
    running.current?.cancel();
    pool.current ??= new SweepPool(1);
    const { cases: _c, ...plain } = circuit as Record<string, unknown>;
    const job = pool.current.envelope(plain, { bus: chosen, fromFraction: f, toFraction: t, steps: n });
    running.current = job;
    setState({ status: 'running' });
    job.promise.then(
      (env) => setState({ status: 'done', env }),
      (e: Error) => setState(e.message === 'cancelled' ? null : { status: 'failed', error: e.message }),
    );
  };

  const env = state?.env;
  return (
    <section aria-labelledby="envelope-title" className="flex flex-col gap-2">
      <h3 id="envelope-title" className="text-[13px] font-semibold">
        Lost-neutral envelope
      </h3>
      <div className="flex flex-wrap items-center gap-1.5 text-[13px]">
        <label className="flex items-center gap-1">
          bus
          <select aria-label="Envelope bus" className="h-7 rounded-[3px] border border-rule-strong bg-paper px-1" value={chosen} onChange={(e) => setBus(e.target.value)}>
            {buses.map((b) => (
              <option key={b.bus} value={b.bus}>
                {b.bus} ({b.loads} single-phase loads)
              </option>
            ))}
          </select>
        </label>
        <label className="flex items-center gap-1">
          each load from
          <input aria-label="Envelope from (%)" className="h-7 w-14 rounded-[3px] border border-rule-strong bg-paper px-1" value={from} onChange={(e) => setFrom(e.target.value)} />%
        </label>
        <label className="flex items-center gap-1">
          to
          <input aria-label="Envelope to (%)" className="h-7 w-14 rounded-[3px] border border-rule-strong bg-paper px-1" value={to} onChange={(e) => setTo(e.target.value)} />% of its value
        </label>
        <label className="flex items-center gap-1">
          in
          <input aria-label="Envelope levels" className="h-7 w-12 rounded-[3px] border border-rule-strong bg-paper px-1" value={levels} onChange={(e) => setLevels(e.target.value)} />
          levels
        </label>
        <Button size="sm" variant="primary" disabled={!!problem || state?.status === 'running'} onClick={runIt}>
          Run envelope{Number.isFinite(combos) ? ` (${combos} combinations)` : ''}
        </Button>
        {state?.status === 'running' ? (
          <Button size="sm" variant="danger" onClick={() => running.current?.cancel()}>
            Cancel envelope
          </Button>
        ) : null}
        {problem ? <span className="text-[12px] text-danger">{problem}</span> : null}
      </div>
      {cause && cause !== 'open-neutral' && cause !== 'floating-neutral' ? (
        <p className="text-[12px] text-caution">The neutral at {chosen} is not open in the circuit shown: show a case with the neutral open (or open it) for a lost-neutral envelope.</p>
      ) : null}
      {state?.status === 'running' ? <p role="status" className="text-[12px] text-ink-muted">Solving every combination…</p> : null}
      {state?.status === 'failed' ? (
        <p role="alert" className="text-[12px] text-danger">
          ✕ {state.error}
        </p>
      ) : null}
      {env ? (
        <div className="flex flex-wrap gap-4">
          <LocusPlot env={env} />
          <div className="flex flex-col gap-1 text-[12px]">
            <p role="status" className="font-semibold">
              {(env.outsideShare * 100).toFixed(1)} % of {env.solved} combinations put a load outside {env.violationPu[0].toFixed(3)}–{env.violationPu[1].toFixed(3)} pu
              {env.failed ? ` (${env.failed} could not be solved)` : ''}.
            </p>
            <table aria-label="Lost-neutral envelope per load" className="text-[12px]">
              <thead>
                <tr>
                  <th scope="col" className="text-left">Load</th>
                  <th scope="col" className="text-left">Phase</th>
                  <th scope="col" className="text-right">Lowest</th>
                  <th scope="col" className="text-right">Highest</th>
                </tr>
              </thead>
              <tbody>
                {env.loads.map((l) => (
                  <tr key={l.id}>
                    <th scope="row" className="text-left font-normal">
                      {l.id}
                    </th>
                    <td>{l.phase.toUpperCase()}</td>
                    <td className={`num text-right${l.minPu < env.violationPu[0] ? ' font-semibold text-danger' : ''}`}>
                      {l.minVolts.toFixed(1)} V = {l.minPu.toFixed(3)} pu
                    </td>
                    <td className={`num text-right${l.maxPu > env.violationPu[1] ? ' font-semibold text-danger' : ''}`}>
                      {l.maxVolts.toFixed(1)} V = {l.maxPu.toFixed(3)} pu
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
            <p className="max-w-md font-semibold text-danger">A lost neutral is a hazard to remove, not a margin to use: these voltages reach equipment and people.</p>
          </div>
        </div>
      ) : null}
    </section>
  );
}
