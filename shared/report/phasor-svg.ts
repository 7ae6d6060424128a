/**
 * A bus's voltage phasors as SVG (vector) for the report: the voltages to earth of each phase and
 * of the neutral drawn from the origin (earth), and dashed from the neutral's tip to each phase's
 * tip the line-to-neutral voltages the loads see, so a shifted star point is plain to see.
 * Angles counter-clockwise from the positive real axis (RMS phasors, the engine's convention).
 */
import type { BusResult, Phasor } from '../engine/index.ts';
import { formatMagnitude } from './format.ts';

const COLOURS: Record<string, string> = { a: '#9b2c2c', b: '#1f2937', c: '#1d4ed8', '1': '#9b2c2c', '2': '#1d4ed8', n: '#6b7280' };

const label = (c: string) => (c === 'n' ? 'N' : c.toUpperCase());

/** The legend of a bus's diagram: each phase's line-to-neutral magnitude and the neutral shift, with its colour. */
export function phasorLegend(bus: BusResult): { text: string; colour: string }[] {
  const out = Object.keys(bus.toEarth)
    .filter((c) => c !== 'n')
    .map((c) => ({ text: `${label(c)}–N ${bus.lineToNeutral[c] ? formatMagnitude(bus.lineToNeutral[c].mag) : ''} V`, colour: COLOURS[c] ?? '#000' }));
  if (bus.toEarth.n) out.push({ text: `N–E ${formatMagnitude(bus.toEarth.n.mag)} V`, colour: COLOURS.n });
  return out;
}

/**
 * The phasor diagram of one bus as SVG text (size × size units). Without `labels` the drawing has
 * no text (the PDF sets the bus name and `phasorLegend` as its own text: SVG text is slow to embed).
 */
export function phasorSvg(bus: BusResult, fontFamily: string, size = 220, { labels = true }: { labels?: boolean } = {}): string {
  // Room at the edges for the labels ("C–N 167.3 V").
  const r = size / 2 - (labels ? 50 : 12);
  const cx = size / 2;
  const cy = size / 2;
  const phases = Object.keys(bus.toEarth).filter((c) => c !== 'n');
  const all: Phasor[] = Object.values(bus.toEarth);
  const scale = r / Math.max(1e-9, ...all.map((p) => p.mag));
  const pt = (p: Phasor) => ({ x: cx + p.re * scale, y: cy - p.im * scale });
  const font = `font-family="${fontFamily.replace(/"/g, '')}"`;
  const parts = [
    `<line x1="${cx - r - 10}" y1="${cy}" x2="${cx + r + 10}" y2="${cy}" stroke="#d1d5db" stroke-width="0.6"/>`,
    `<line x1="${cx}" y1="${cy - r - 10}" x2="${cx}" y2="${cy + r + 10}" stroke="#d1d5db" stroke-width="0.6"/>`,
  ];
  const arrow = (p: Phasor, colour: string, dashed: boolean, from = { x: cx, y: cy }) => {
    const to = pt(p);
    const dx = to.x - from.x;
    const dy = to.y - from.y;
    const len = Math.hypot(dx, dy);
    if (len < 1) return '';
    const ux = dx / len;
    const uy = dy / len;
    const head = `${to.x},${to.y} ${to.x - 7 * ux + 3 * uy},${to.y - 7 * uy - 3 * ux} ${to.x - 7 * ux - 3 * uy},${to.y - 7 * uy + 3 * ux}`;
    return `<line x1="${from.x}" y1="${from.y}" x2="${to.x}" y2="${to.y}" stroke="${colour}" stroke-width="${dashed ? 0.9 : 1.4}"${dashed ? ' stroke-dasharray="3,2"' : ''}/>${dashed ? '' : `<polygon points="${head}" fill="${colour}"/>`}`;
  };
  const n = bus.toEarth.n;
  for (const c of phases) {
    const p = bus.toEarth[c];
    parts.push(arrow(p, COLOURS[c] ?? '#000', false));
    if (n) parts.push(arrow(p, COLOURS[c] ?? '#000', true, pt(n)));
    const t = pt(p);
    const ln = bus.lineToNeutral[c];
    if (labels) parts.push(`<text x="${t.x + (t.x >= cx ? 4 : -4)}" y="${t.y + (t.y >= cy ? 10 : -4)}" font-size="8" text-anchor="${t.x >= cx ? 'start' : 'end'}" fill="${COLOURS[c] ?? '#000'}" ${font}>${label(c)}–N ${ln ? formatMagnitude(ln.mag) : ''} V</text>`);
  }
  if (n) {
    parts.push(arrow(n, COLOURS.n, false));
    const t = pt(n);
    if (labels) parts.push(`<text x="${t.x + 4}" y="${t.y + 10}" font-size="8" fill="${COLOURS.n}" ${font}>N–E ${formatMagnitude(n.mag)} V</text>`);
  }
  if (labels) parts.push(`<text x="4" y="12" font-size="9" font-weight="bold" ${font}>${bus.bus.replace(/[<>&"']/g, '')}</text>`);
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${size}" height="${size}" viewBox="0 0 ${size} ${size}">${parts.join('')}</svg>`;
}
