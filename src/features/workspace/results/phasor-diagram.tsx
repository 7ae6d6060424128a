/**
 * Phasor diagram of one bus (d3-shape paths): earth at the origin, the neutral-shift vector from
 * earth to the neutral point, the line-to-neutral set from the neutral point, the line-to-line set
 * between the phase points; beside it the sequence components. Labelled axes and a round-number
 * scale; each conductor drawn with its colour, dash pattern and label (colour never the only cue).
 */
import { arc, line } from 'd3-shape';
import { useId, useState } from 'react';
import type { BusResult } from '../../../../shared/engine/index.ts';
import { formatPhasor, formatTick } from './format.ts';
import { lnLabel, phaseStyle, type WiringStandard } from './phase-style.ts';
import { busVectors, layoutVectors, sequenceVectors, ticks, type DiagramVector, type Pt, type ScreenVector } from './phasor-geometry.ts';

const path = line<Pt>()
  .x((p) => p.x)
  .y((p) => p.y);
const ring = arc<{ r: number }>()
  .innerRadius((d) => d.r)
  .outerRadius((d) => d.r)
  .startAngle(0)
  .endAngle(2 * Math.PI);

const SHIFT_COLOUR = '#9c3424';
const SEQ_STYLE: Record<string, { color: string; dash: string; label: string; name: string }> = {
  '1': { color: '#1e5a6b', dash: '', label: 'V1', name: 'V1 positive' },
  '2': { color: '#9c3424', dash: '6 3', label: 'V2', name: 'V2 negative' },
  '0': { color: '#6b5a1e', dash: '2 3', label: 'V0', name: 'V0 zero' },
};

/** Style and label of a vector. */
export function vectorStyle(v: DiagramVector, standard: WiringStandard, lnReference: 'neutral' | 'earth'): { color: string; dash: string; label: string; width: number } {
  if (v.set === 'shift') return { color: SHIFT_COLOUR, dash: '', label: 'N–E shift', width: 2.5 };
  if (v.set === 'sequence') return { color: SEQ_STYLE[v.key].color, dash: SEQ_STYLE[v.key].dash, label: SEQ_STYLE[v.key].label, width: 2 };
  const s = phaseStyle(v.key, standard);
  if (v.set === 'ln') return { color: s.color, dash: s.dash, label: lnLabel(v.key, standard, lnReference), width: 2 };
  return { color: s.color, dash: s.dash, label: s.label, width: 1 };
}

function Axes({ frame, unit, outerOnly = false }: { frame: ReturnType<typeof layoutVectors>['frame']; unit: string; outerOnly?: boolean }) {
  const { cx, cy, k, padding, size } = frame;
  const ts = ticks(frame);
  // Tick labels below the real axis, right of centre; a small diagram labels only its outer ring,
  // and long labels (2500, 5000…) skip rings so they never run into each other (~5.5 px per digit at 9 px).
  const widest = Math.max(...ts.map((t) => formatTick(t).length)) * 5.5 + 6;
  const every = Math.max(1, Math.ceil(widest / (frame.step * k)));
  const labelled = outerOnly ? ts.slice(-1) : ts.filter((_, i) => (ts.length - 1 - i) % every === 0);
  return (
    <g aria-hidden="true">
      {ts.map((t) => (
        <path key={t} d={ring({ r: t * k }) ?? ''} transform={`translate(${cx},${cy})`} fill="none" stroke="#d3d0c6" strokeWidth={0.75} />
      ))}
      <line x1={padding - 8} y1={cy} x2={size - padding + 8} y2={cy} stroke="#aaa698" strokeWidth={0.75} />
      <line x1={cx} y1={padding - 8} x2={cx} y2={size - padding + 8} stroke="#aaa698" strokeWidth={0.75} />
      {labelled.map((t) => (
        <text key={t} x={cx + t * k} y={cy + 11} textAnchor="middle" fontSize={9} fill="#56606a" className="num">
          {formatTick(t)}
        </text>
      ))}
      <text x={size - 4} y={cy - 14} textAnchor="end" fontSize={10} fill="#56606a">
        Re ({unit})
      </text>
      <text x={cx + 5} y={12} fontSize={10} fill="#56606a">
        Im ({unit})
      </text>
    </g>
  );
}

function Vector({ v, style }: { v: ScreenVector; style: ReturnType<typeof vectorStyle> }) {
  // A vector shorter than its arrow head (a neutral shift of a few volts) is a dot: no label to crowd the origin.
  if (v.length < 4) return null;
  return (
    <g>
      <path d={path([v.tail, v.tip]) ?? ''} fill="none" stroke={style.color} strokeWidth={style.width} strokeDasharray={style.dash || undefined} />
      {v.head ? <path d={`${path(v.head)}Z`} fill={style.color} stroke="none" /> : null}
      <text x={v.label.x} y={v.label.y} textAnchor={v.label.anchor} dominantBaseline={v.label.baseline} fontSize={10} fontWeight={600} fill={style.color}>
        {style.label}
      </text>
    </g>
  );
}

/** A legend row: a line sample (colour + dash) with the label and the RMS value. */
function LegendRow({ style, value }: { style: ReturnType<typeof vectorStyle>; value: string }) {
  return (
    <li className="flex items-center gap-1.5 whitespace-nowrap">
      <svg width="26" height="8" aria-hidden="true">
        <line x1="1" y1="4" x2="25" y2="4" stroke={style.color} strokeWidth={Math.max(1.5, style.width)} strokeDasharray={style.dash || undefined} />
      </svg>
      <span className="w-[70px] font-semibold">{style.label}</span>
      <span className="num">{value}</span>
    </li>
  );
}

const SETS: { id: DiagramVector['set']; name: string }[] = [
  { id: 'ln', name: 'Line-to-neutral' },
  { id: 'll', name: 'Line-to-line' },
  { id: 'shift', name: 'Neutral shift' },
];

/** Phasor diagram and sequence components of one bus. */
export function PhasorDiagram({ bus, standard, size = 300 }: { bus: BusResult; standard: WiringStandard; size?: number }) {
  const [shown, setShown] = useState<Record<string, boolean>>({ ln: true, ll: true, shift: true });
  const idBase = useId();
  const all = busVectors(bus);
  // Laid out over every vector, so toggling a set never rescales the picture.
  const { frame, vectors: laidOut } = layoutVectors(all, size, 34);
  const vectors = laidOut.filter((v) => shown[v.set]);
  const seq = bus.sequence ? layoutVectors(sequenceVectors(bus.sequence), 180, 26) : null;
  const ref = bus.lnReference;
  return (
    <div className="flex flex-wrap gap-4">
      <div>
        <svg role="img" aria-label={`Phasor diagram, bus ${bus.bus}`} width={size} height={size} viewBox={`0 0 ${size} ${size}`} className="rounded-[3px] border border-rule bg-panel">
          <Axes frame={frame} unit="V" />
          {vectors
            .slice()
            .sort((a, b) => (a.set === 'll' ? -1 : 0) - (b.set === 'll' ? -1 : 0))
            .map((v) => (
              <Vector key={v.id} v={v} style={vectorStyle(v, standard, ref)} />
            ))}
          {bus.neutralToEarth && shown.shift ? (
            <circle cx={frame.toScreen(bus.neutralToEarth).x} cy={frame.toScreen(bus.neutralToEarth).y} r={3} fill="#fcfcfa" stroke={SHIFT_COLOUR} strokeWidth={1.5} />
          ) : null}
          <text x={6} y={size - 6} fontSize={10} fill="#56606a">
            Scale: one ring = {formatTick(frame.step)} V · origin = earth
          </text>
        </svg>
        <fieldset className="mt-1 flex gap-3 text-[12px]">
          <legend className="sr-only">Sets shown on the phasor diagram</legend>
          {SETS.filter((s) => all.some((v) => v.set === s.id)).map((s) => (
            <label key={s.id} htmlFor={`${idBase}-${s.id}`} className="inline-flex items-center gap-1">
              <input id={`${idBase}-${s.id}`} type="checkbox" checked={shown[s.id]} onChange={(e) => setShown((x) => ({ ...x, [s.id]: e.target.checked }))} />
              {s.name}
            </label>
          ))}
        </fieldset>
      </div>
      <div className="min-w-[220px] text-[12px]">
        <p className="mb-1 text-[11px] text-ink-muted">
          RMS, magnitude∠degrees. {ref === 'neutral' ? 'Line-to-neutral from the neutral point N.' : 'No neutral at this bus: phase-to-earth voltages.'}
        </p>
        <ul className="space-y-0.5">
          {all.map((v) => (
            <LegendRow key={v.id} style={vectorStyle(v, standard, ref)} value={formatPhasor(v.value, 'V')} />
          ))}
        </ul>
        {seq && bus.sequence ? (
          <div className="mt-3">
            <svg role="img" aria-label={`Sequence components, bus ${bus.bus}`} width={180} height={180} viewBox="0 0 180 180" className="rounded-[3px] border border-rule bg-panel">
              <Axes frame={seq.frame} unit="V" outerOnly />
              {seq.vectors.map((v) => (
                <Vector key={v.id} v={v} style={vectorStyle(v, standard, ref)} />
              ))}
            </svg>
            <p className="text-[11px] text-ink-muted">Sequence components of the phase-to-earth voltages (a = 1∠120°); one ring = {formatTick(seq.frame.step)} V.</p>
            <ul className="mt-1 space-y-0.5">
              {sequenceVectors(bus.sequence).map((v) => (
                <LegendRow key={v.id} style={{ ...vectorStyle(v, standard, ref), label: SEQ_STYLE[v.key].name }} value={formatPhasor(v.value, 'V')} />
              ))}
            </ul>
            {bus.sequenceToNeutral ? (
              <>
                <p className="mt-1 text-[11px] text-ink-muted">Of the line-to-neutral voltages (relative to the bus neutral N):</p>
                <ul aria-label={`Sequence components to neutral, bus ${bus.bus}`} className="mt-0.5 space-y-0.5">
                  {sequenceVectors(bus.sequenceToNeutral).map((v) => (
                    <LegendRow key={v.id} style={{ ...vectorStyle(v, standard, ref), label: SEQ_STYLE[v.key].name }} value={formatPhasor(v.value, 'V')} />
                  ))}
                </ul>
              </>
            ) : null}
          </div>
        ) : null}
      </div>
    </div>
  );
}
