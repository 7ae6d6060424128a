/**
 * Pure geometry of the phasor diagram: a round-number scale, complex values → screen coordinates
 * (real axis to the right, imaginary axis UP, so angles read counter-clockwise as in every
 * textbook phasor diagram), arrow heads and label positions. No DOM; tested on its own.
 */
import type { BusResult, Phasor, SequenceResult } from '../../../../shared/engine/index.ts';

export interface Pt {
  x: number;
  y: number;
}
/** A complex value, re/im in the diagram's unit (V or A). */
export interface Cxy {
  re: number;
  im: number;
}

/**
 * The round step (1, 2, 2.5 or 5 × 10^k) that divides `max` into about `divisions` rings, and
 * the axis extent (a whole number of steps ≥ max). For max ≤ 0: step 1, extent 1.
 */
export function niceScale(max: number, divisions = 4): { step: number; extent: number } {
  if (!(max > 0) || !Number.isFinite(max)) return { step: 1, extent: 1 };
  const raw = max / divisions;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const norm = raw / mag;
  const f = norm <= 1 ? 1 : norm <= 2 ? 2 : norm <= 2.5 ? 2.5 : norm <= 5 ? 5 : 10;
  const step = f * mag;
  // Guard against floating-point leftovers (e.g. 150/50 = 3.0000000000000004).
  const n = Math.max(1, Math.ceil(max / step - 1e-9));
  return { step, extent: n * step };
}

/** Maps complex values to screen pixels in a square of `size` px with `padding` px left around the plot. */
export interface Frame {
  size: number;
  padding: number;
  /** Screen centre (the origin of the complex plane). */
  cx: number;
  cy: number;
  /** Pixels per unit (V or A). */
  k: number;
  step: number;
  extent: number;
  toScreen(z: Cxy): Pt;
}

/** A frame whose extent holds every value in `values` (origin at the centre). */
export function makeFrame(values: readonly Cxy[], size: number, padding: number, divisions = 4): Frame {
  const max = values.reduce((m, z) => Math.max(m, Math.hypot(z.re, z.im)), 0);
  const { step, extent } = niceScale(max, divisions);
  const cx = size / 2;
  const cy = size / 2;
  const k = (size / 2 - padding) / extent;
  return { size, padding, cx, cy, k, step, extent, toScreen: (z) => ({ x: cx + z.re * k, y: cy - z.im * k }) };
}

/** The three points of an arrow head at `tip`, pointing from `tail` to `tip`; null for a zero-length vector. */
export function arrowHead(tail: Pt, tip: Pt, length = 9, halfWidth = 3.5): [Pt, Pt, Pt] | null {
  const dx = tip.x - tail.x;
  const dy = tip.y - tail.y;
  const len = Math.hypot(dx, dy);
  if (len < 1e-9) return null;
  const h = Math.min(length, len * 0.5); // short vectors keep a visible shaft
  const w = (halfWidth * h) / length;
  const ux = dx / len;
  const uy = dy / len;
  const bx = tip.x - ux * h;
  const by = tip.y - uy * h;
  return [
    { x: tip.x, y: tip.y },
    { x: bx - uy * w, y: by + ux * w },
    { x: bx + uy * w, y: by - ux * w },
  ];
}

/** Where a vector's label goes: `gap` px beyond the tip along the vector, anchored away from it. */
export function labelPosition(tail: Pt, tip: Pt, gap = 10): { x: number; y: number; anchor: 'start' | 'middle' | 'end'; baseline: 'auto' | 'middle' | 'hanging' } {
  const dx = tip.x - tail.x;
  const dy = tip.y - tail.y;
  const len = Math.hypot(dx, dy);
  const ux = len > 1e-9 ? dx / len : 1;
  const uy = len > 1e-9 ? dy / len : 0;
  const anchor = ux > 0.35 ? 'start' : ux < -0.35 ? 'end' : 'middle';
  const baseline = uy > 0.35 ? 'hanging' : uy < -0.35 ? 'auto' : 'middle';
  return { x: tip.x + ux * gap, y: tip.y + uy * gap, anchor, baseline };
}

/**
 * Label of a side (a line-to-line vector between two phase points, which already carry the
 * line-to-neutral labels): at the middle of the side, `gap` px out on the side away from `away`.
 */
export function midLabelPosition(tail: Pt, tip: Pt, away: Pt, gap = 9): { x: number; y: number; anchor: 'start' | 'middle' | 'end'; baseline: 'auto' | 'middle' | 'hanging' } {
  const mx = (tail.x + tip.x) / 2;
  const my = (tail.y + tip.y) / 2;
  const dx = tip.x - tail.x;
  const dy = tip.y - tail.y;
  const len = Math.hypot(dx, dy);
  if (len < 1e-9) return { x: mx, y: my, anchor: 'middle', baseline: 'middle' };
  let nx = -dy / len;
  let ny = dx / len;
  if ((mx - away.x) * nx + (my - away.y) * ny < 0) {
    nx = -nx;
    ny = -ny;
  }
  const anchor = nx > 0.35 ? 'start' : nx < -0.35 ? 'end' : 'middle';
  const baseline = ny > 0.35 ? 'hanging' : ny < -0.35 ? 'auto' : 'middle';
  return { x: mx + nx * gap, y: my + ny * gap, anchor, baseline };
}

/** One vector of the diagram, in the complex plane. */
export interface DiagramVector {
  id: string;
  /** Which set it belongs to. */
  set: 'ln' | 'll' | 'shift' | 'sequence';
  /** Conductor or pair the style comes from ('a', 'ab', 'n'…); sequence: '0', '1', '2'. */
  key: string;
  from: Cxy;
  to: Cxy;
  /** The phasor it stands for (to − from). */
  value: Phasor;
}

const sub = (a: Cxy, b: Cxy): Cxy => ({ re: a.re - b.re, im: a.im - b.im });
const ORIGIN: Cxy = { re: 0, im: 0 };

/**
 * The bus picture with earth at the origin: the phase points are the voltages to earth, the
 * neutral point sits at V_n-earth (the neutral-shift vector runs origin → N), line-to-neutral
 * vectors run N → phase point, line-to-line vectors run between phase points (V_ab from b to a).
 * A bus without a neutral draws its phase-to-earth set from the origin.
 */
export function busVectors(bus: BusResult): DiagramVector[] {
  const out: DiagramVector[] = [];
  const n: Cxy = bus.lnReference === 'neutral' && bus.neutralToEarth ? bus.neutralToEarth : ORIGIN;
  if (bus.lnReference === 'neutral' && bus.neutralToEarth) {
    out.push({ id: 'shift', set: 'shift', key: 'n', from: ORIGIN, to: n, value: bus.neutralToEarth });
  }
  for (const [ph, v] of Object.entries(bus.lineToNeutral)) {
    const tip = bus.toEarth[ph] ?? { re: n.re + v.re, im: n.im + v.im };
    out.push({ id: `ln-${ph}`, set: 'ln', key: ph, from: n, to: tip, value: v });
  }
  for (const [pair, v] of Object.entries(bus.lineToLine)) {
    const [p, q] = pair.length === 2 ? [pair[0], pair[1]] : [pair, ''];
    const head = bus.toEarth[p];
    const tail = bus.toEarth[q];
    if (head && tail) out.push({ id: `ll-${pair}`, set: 'll', key: pair, from: tail, to: head, value: v });
  }
  return out;
}

/** Sequence components as vectors from the origin: zero, positive, negative. */
export function sequenceVectors(seq: SequenceResult): DiagramVector[] {
  return [
    { id: 'seq-1', set: 'sequence', key: '1', from: ORIGIN, to: seq.positive, value: seq.positive },
    { id: 'seq-2', set: 'sequence', key: '2', from: ORIGIN, to: seq.negative, value: seq.negative },
    { id: 'seq-0', set: 'sequence', key: '0', from: ORIGIN, to: seq.zero, value: seq.zero },
  ];
}

/** A vector laid out on screen: shaft ends, head triangle, label position. */
export interface ScreenVector extends DiagramVector {
  tail: Pt;
  tip: Pt;
  head: [Pt, Pt, Pt] | null;
  label: ReturnType<typeof labelPosition>;
  /** Screen length of the vector, px. */
  length: number;
}

/** Lay vectors out in a frame that holds all their end points. */
export function layoutVectors(vectors: readonly DiagramVector[], size: number, padding: number): { frame: Frame; vectors: ScreenVector[] } {
  const frame = makeFrame(vectors.flatMap((v) => [v.from, v.to]), size, padding);
  return {
    frame,
    vectors: vectors.map((v) => {
      const tail = frame.toScreen(v.from);
      const tip = frame.toScreen(v.to);
      // Line-to-line labels go mid-side, outward from the origin, so they never sit on the phase-point labels.
      const label = v.set === 'll' ? midLabelPosition(tail, tip, { x: frame.cx, y: frame.cy }) : labelPosition(tail, tip);
      return { ...v, tail, tip, head: arrowHead(tail, tip), label, length: Math.hypot(tip.x - tail.x, tip.y - tail.y) };
    }),
  };
}

/** Tick values along one half-axis: step, 2·step… up to the extent. */
export function ticks(frame: Pick<Frame, 'step' | 'extent'>): number[] {
  const n = Math.round(frame.extent / frame.step);
  return Array.from({ length: n }, (_, i) => (i + 1) * frame.step);
}
