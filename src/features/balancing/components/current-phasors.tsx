/**
 * Phasor diagrams of the phase and neutral currents where the neutral is measured, before and after
 * balancing, on one common scale so the two can be compared. Each phasor has its own dash pattern
 * and label (A, B, C, N) and the magnitudes are written in a list beside it: colour is never the
 * only cue.
 */
import type { BalanceResponse } from '../../../../shared/api/balancing.ts';

type Set4 = BalanceResponse['currents']['before'];
const KEYS = ['a', 'b', 'c', 'n'] as const;
const STYLE: Record<(typeof KEYS)[number], { label: string; dash: string; color: string }> = {
  a: { label: 'A', dash: '', color: '#7b4a22' },
  b: { label: 'B', dash: '7 3', color: '#1f1f1f' },
  c: { label: 'C', dash: '9 3 2 3', color: '#6f6f6f' },
  n: { label: 'N', dash: '2 3', color: '#1d5fa8' },
};
const SIZE = 180;
const R = 72;

const mag = (z: { re: number; im: number }) => Math.hypot(z.re, z.im);
const angle = (z: { re: number; im: number }) => (Math.atan2(z.im, z.re) * 180) / Math.PI;

function Diagram({ title, set, scale }: { title: string; set: Set4; scale: number }) {
  const c = SIZE / 2;
  return (
    <figure className="flex items-start gap-3">
      <svg role="img" aria-label={`${title}: ${KEYS.map((k) => `${STYLE[k].label} ${mag(set[k]).toFixed(1)} A at ${angle(set[k]).toFixed(0)}°`).join(', ')}`} width={SIZE} height={SIZE} viewBox={`0 0 ${SIZE} ${SIZE}`} className="shrink-0 rounded-[3px] border border-rule bg-panel">
        <circle cx={c} cy={c} r={R} fill="none" stroke="#d0d0d0" strokeDasharray="2 4" />
        <line x1={c - R - 6} y1={c} x2={c + R + 6} y2={c} stroke="#e0e0e0" />
        <line x1={c} y1={c - R - 6} x2={c} y2={c + R + 6} stroke="#e0e0e0" />
        {KEYS.map((k) => {
          const z = set[k];
          const x = c + (R * z.re) / scale;
          const y = c - (R * z.im) / scale;
          const m = mag(z) / scale;
          return (
            <g key={k}>
              <line x1={c} y1={c} x2={x} y2={y} stroke={STYLE[k].color} strokeWidth={2} strokeDasharray={STYLE[k].dash} />
              {m > 0.08 ? (
                <text x={c + (R * 1.12 * z.re) / scale} y={c - (R * 1.12 * z.im) / scale} fontSize={11} textAnchor="middle" dominantBaseline="middle" fill={STYLE[k].color}>
                  {STYLE[k].label}
                </text>
              ) : null}
            </g>
          );
        })}
      </svg>
      <figcaption className="text-[13px]">
        <p className="font-semibold">{title}</p>
        <ul className="num mt-1">
          {KEYS.map((k) => (
            <li key={k}>
              {STYLE[k].label}: {mag(set[k]).toFixed(1)} A ∠{angle(set[k]).toFixed(0)}°
            </li>
          ))}
        </ul>
        <p className="mt-1 text-[12px] text-ink-muted">Circle: {scale.toFixed(0)} A</p>
      </figcaption>
    </figure>
  );
}

export function CurrentPhasors({ currents }: { currents: BalanceResponse['currents'] }) {
  const scale = Math.max(1e-9, ...KEYS.flatMap((k) => [mag(currents.before[k]), mag(currents.after[k])]));
  return (
    <div className="flex flex-wrap gap-6" aria-label="Current phasors before and after">
      <Diagram title={`Currents ${currents.at}, before`} set={currents.before} scale={scale} />
      <Diagram title={`Currents ${currents.at}, after`} set={currents.after} scale={scale} />
    </div>
  );
}
