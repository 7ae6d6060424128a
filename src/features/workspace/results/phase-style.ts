/**
 * Phase colours, dash patterns and labels for the two wiring-colour standards the study settings
 * offer. Colour is never the only cue: every phase also has its own dash pattern and a label.
 * - IEC 60445 (conductor identification): L1 brown, L2 black, L3 grey, N blue (V: IEC 60445 colour list).
 * - North American common practice for 208Y/120 V and 120/240 V: A black, B red, C blue, neutral
 *   white or grey (P; drawn grey so that it reads on a light panel).
 * Split-phase legs 1 and 2 take the first two phase styles.
 */

/** The selectable wiring-colour standards. */
export type WiringStandard = 'iec-60445' | 'north-american';

export const WIRING_STANDARDS: { id: WiringStandard; name: string }[] = [
  { id: 'iec-60445', name: 'IEC 60445 (L1 brown, L2 black, L3 grey, N blue)' },
  { id: 'north-american', name: 'North American practice (A black, B red, C blue, N white/grey)' },
];

/** How one conductor (or a line-to-line pair) is drawn. */
export interface PhaseStyle {
  /** Stroke colour (CSS). */
  color: string;
  /** SVG stroke-dasharray; empty for a solid line. */
  dash: string;
  /** Short label shown beside the line (L1, A, N, L1–L2…). */
  label: string;
  /** Plain-words name of the colour, for accessible descriptions and legends. */
  colorName: string;
}

type Slot = 'a' | 'b' | 'c' | 'n';

// One dash pattern per slot, the same under both standards, so a print in grey still tells them apart.
const DASH: Record<Slot, string> = { a: '', b: '7 3', c: '9 3 2 3', n: '2 3' };

const COLOURS: Record<WiringStandard, Record<Slot, { color: string; colorName: string; label: string }>> = {
  'iec-60445': {
    a: { color: '#7b4a22', colorName: 'brown', label: 'L1' },
    b: { color: '#1f1f1f', colorName: 'black', label: 'L2' },
    c: { color: '#7f7f7f', colorName: 'grey', label: 'L3' },
    n: { color: '#1d5fa8', colorName: 'blue', label: 'N' },
  },
  'north-american': {
    a: { color: '#1f1f1f', colorName: 'black', label: 'A' },
    b: { color: '#b3261e', colorName: 'red', label: 'B' },
    c: { color: '#1d5fa8', colorName: 'blue', label: 'C' },
    n: { color: '#8c8c8c', colorName: 'white/grey', label: 'N' },
  },
};

function slotOf(conductor: string): Slot | null {
  switch (conductor.toLowerCase()) {
    case 'a':
    case '1':
      return 'a';
    case 'b':
    case '2':
      return 'b';
    case 'c':
      return 'c';
    case 'n':
      return 'n';
    default:
      return null;
  }
}

function single(conductor: string, standard: WiringStandard): PhaseStyle | null {
  const slot = slotOf(conductor);
  if (!slot) return null;
  const c = COLOURS[standard][slot];
  // Split-phase legs are called L1/L2 under both standards (P).
  const label = conductor === '1' || conductor === '2' ? `L${conductor}` : c.label;
  return { color: c.color, colorName: c.colorName, dash: DASH[slot], label };
}

/**
 * Style of a conductor ('a', 'b', 'c', 'n', split-phase '1', '2') or of a line-to-line pair
 * ('ab', 'bc', 'ca', '12': drawn like its first conductor, labelled with both). Unknown names get
 * a neutral ink with their own name as label.
 */
export function phaseStyle(phase: string, standard: WiringStandard = 'iec-60445'): PhaseStyle {
  const one = single(phase, standard);
  if (one) return one;
  if (phase.length === 2) {
    const first = single(phase[0], standard);
    const second = single(phase[1], standard);
    if (first && second) return { ...first, label: `${first.label}–${second.label}` };
  }
  return { color: '#1c2226', colorName: 'ink', dash: '', label: phase };
}

/** Label of a line-to-neutral voltage, e.g. "L1–N" or "A–N". */
export function lnLabel(phase: string, standard: WiringStandard, reference: 'neutral' | 'earth' = 'neutral'): string {
  return `${phaseStyle(phase, standard).label}–${reference === 'neutral' ? phaseStyle('n', standard).label : 'E'}`;
}
