/**
 * Instantaneous waveforms over one cycle, v(t) = √2·|V|·cos(ωt + θ), for the chosen voltages of
 * the selected bus and currents of the selected element; volts and amperes on separate charts.
 */
import { line } from 'd3-shape';
import { useId, useState } from 'react';
import type { Phasor } from '../../../../shared/engine/index.ts';
import { formatMagnitude, formatTick } from './format.ts';
import { niceScale } from './phasor-geometry.ts';
import { sampleWaveform } from './waveform.ts';

/** One signal that can be drawn. */
export interface WaveSignal {
  id: string;
  label: string;
  phasor: Phasor;
  color: string;
  dash: string;
}

const W = 420;
const H = 150;
const PAD = { l: 48, r: 10, t: 10, b: 26 };

function Chart({ title, unit, signals, frequencyHz }: { title: string; unit: string; signals: WaveSignal[]; frequencyHz: number }) {
  const peak = Math.max(0, ...signals.map((s) => Math.SQRT2 * s.phasor.mag));
  const { step, extent } = niceScale(peak, 3);
  const periodMs = 1000 / frequencyHz;
  const x = (tMs: number) => PAD.l + (tMs / periodMs) * (W - PAD.l - PAD.r);
  const y = (v: number) => PAD.t + ((extent - v) / (2 * extent)) * (H - PAD.t - PAD.b);
  const yTicks: number[] = [];
  for (let v = -extent; v <= extent + 1e-9 * extent; v += step) yTicks.push(v);
  const xTicks = [0, 0.25, 0.5, 0.75, 1].map((f) => f * periodMs);
  const draw = line<[number, number]>()
    .x((d) => x(d[0]))
    .y((d) => y(d[1]));
  return (
    <svg role="img" aria-label={`${title} over one cycle`} width={W} height={H} viewBox={`0 0 ${W} ${H}`} className="rounded-[3px] border border-rule bg-panel">
      <g aria-hidden="true" fontSize={9} fill="#56606a">
        {yTicks.map((v) => (
          <g key={v}>
            <line x1={PAD.l} x2={W - PAD.r} y1={y(v)} y2={y(v)} stroke={v === 0 ? '#aaa698' : '#e9e7e1'} strokeWidth={0.75} />
            <text x={PAD.l - 4} y={y(v)} textAnchor="end" dominantBaseline="middle" className="num">
              {formatTick(v)}
            </text>
          </g>
        ))}
        {xTicks.map((t) => (
          <text key={t} x={x(t)} y={H - PAD.b + 11} textAnchor="middle" className="num">
            {formatMagnitude(t)}
          </text>
        ))}
        <text x={W - PAD.r} y={H - 3} textAnchor="end" fontSize={10}>
          t (ms)
        </text>
        <text x={4} y={PAD.t + 2} fontSize={10} dominantBaseline="hanging" transform={`rotate(-90 ${4} ${PAD.t + 2})`} textAnchor="end">
          {title} ({unit})
        </text>
      </g>
      {signals.map((s) => {
        const w = sampleWaveform(s.phasor, frequencyHz, 121);
        return <path key={s.id} d={draw(w.t.map((t, i) => [t * 1000, w.y[i]])) ?? ''} fill="none" stroke={s.color} strokeWidth={1.5} strokeDasharray={s.dash || undefined} />;
      })}
    </svg>
  );
}

function Picker({ signals, chosen, onToggle, legend }: { signals: WaveSignal[]; chosen: Set<string>; onToggle: (id: string) => void; legend: string }) {
  const base = useId();
  return (
    <fieldset className="flex flex-wrap gap-x-3 gap-y-0.5 text-[12px]">
      <legend className="mb-0.5 text-[11px] text-ink-muted">{legend}</legend>
      {signals.map((s) => (
        <label key={s.id} htmlFor={`${base}-${s.id}`} className="inline-flex items-center gap-1 whitespace-nowrap">
          <input id={`${base}-${s.id}`} type="checkbox" checked={chosen.has(s.id)} onChange={() => onToggle(s.id)} />
          <svg width="18" height="6" aria-hidden="true">
            <line x1="0" y1="3" x2="18" y2="3" stroke={s.color} strokeWidth={2} strokeDasharray={s.dash || undefined} />
          </svg>
          {s.label}
        </label>
      ))}
    </fieldset>
  );
}

/** Waveform charts for the given voltage and current signals (all chosen at first). */
export function WaveformChart({ voltages, currents, frequencyHz }: { voltages: WaveSignal[]; currents: WaveSignal[]; frequencyHz: number }) {
  const [off, setOff] = useState<Set<string>>(new Set());
  const toggle = (id: string) =>
    setOff((s) => {
      const n = new Set(s);
      if (n.has(id)) n.delete(id);
      else n.add(id);
      return n;
    });
  const onV = voltages.filter((s) => !off.has(s.id));
  const onI = currents.filter((s) => !off.has(s.id));
  const chosen = (list: WaveSignal[]) => new Set(list.filter((s) => !off.has(s.id)).map((s) => s.id));
  return (
    <div className="space-y-2">
      <p className="text-[11px] text-ink-muted">
        One cycle at {frequencyHz} Hz: v(t) = √2·|V|·cos(ωt + θ), from the RMS phasors.
      </p>
      {voltages.length > 0 ? (
        <div>
          <Picker signals={voltages} chosen={chosen(voltages)} onToggle={toggle} legend="Voltages" />
          <Chart title="Voltage" unit="V" signals={onV} frequencyHz={frequencyHz} />
        </div>
      ) : null}
      {currents.length > 0 ? (
        <div>
          <Picker signals={currents} chosen={chosen(currents)} onToggle={toggle} legend="Currents" />
          <Chart title="Current" unit="A" signals={onI} frequencyHz={frequencyHz} />
        </div>
      ) : null}
    </div>
  );
}
