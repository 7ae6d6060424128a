/**
 * Parameters of the circuit format in the words of the property forms ("P (kW)", "rated voltage
 * (kV, line to line)") and values as users type them ("0.19 + j0.38", "A and neutral", "closed"):
 * used where a stored parameter is shown to people (the revision diff, import errors).
 * Pure TypeScript, shared by server and client.
 */
import { conductorWords, type CircuitNames } from './user-names.ts';

const WORDS: Record<string, string> = {
  bus: 'bus',
  from: 'from bus',
  to: 'to bus',
  node: 'connection point',
  id: 'name',
  type: 'kind of element',
  kvLL: 'rated voltage (kV, line to line)',
  kva: 'rating (kVA)',
  kvHigh: 'HV rated voltage (kV)',
  kvLow: 'LV rated voltage (kV)',
  percentR: 'resistance (%)',
  percentX: 'reactance (%)',
  percentZ: 'impedance (%)',
  xOverR: 'X/R',
  connection: 'connection',
  between: 'conductors',
  each: 'every phase',
  total: 'three-phase total',
  phases: 'phases',
  kw: 'P (kW)',
  kvar: 'Q (kvar)',
  model: 'load model',
  ohms: 'impedance (Ω)',
  rOhms: 'R (Ω)',
  lHenry: 'L (H)',
  cFarad: 'C (F)',
  arrangement: 'R, L, C arrangement',
  length: 'length',
  lengthUnit: 'length unit',
  perLengthUnit: 'per-length data given per',
  impedance: 'impedance',
  ohmsPerLength: 'Z per length (Ω)',
  z1PerLength: 'Z1 per length (Ω)',
  z0PerLength: 'Z0 per length (Ω)',
  neutralOhmsPerLength: 'neutral Z per length (Ω)',
  siemensPerLength: 'shunt admittance per length (S)',
  shunt: 'shunt',
  open: 'open conductors',
  opened: 'opened conductors',
  closed: 'state',
  conductors: 'conductors',
  earthing: 'star-point earthing',
  hvEarthing: 'HV star-point earthing',
  lvEarthing: 'LV star-point earthing',
  angleDeg: 'angle (°)',
  voltsLN: 'leg-to-neutral voltage (V)',
  lowVolts: 'secondary voltage, leg to leg (V)',
  primary: 'primary conductors',
  vectorGroup: 'vector group',
  kind: 'kind',
  earthOhms: 'impedance to earth (Ω)',
  ratedVolts: 'rated voltage (V)',
  shortCircuitMva: 'short-circuit level (MVA)',
  z0OverZ1: 'Z0/Z1',
  z1: 'Z1 (Ω)',
  z0: 'Z0 (Ω)',
  pu: 'EMF (pu)',
  frequencyHz: 'frequency (Hz)',
  sequence: 'phase sequence',
  name: 'name',
  description: 'description',
  limits: 'limits',
  set: 'limit set',
  buses: 'bus',
  label: 'label',
  format: 'file format',
  version: 'format version',
  elements: 'elements',
  re: 'real part',
  im: 'imaginary part',
  mag: 'magnitude',
  earthResistivityOhmM: 'earth resistivity (Ω·m)',
  kronReduceNeutral: 'neutral folded into the phases',
  xFt: 'x (ft)',
  yFt: 'y (ft)',
  gmrFt: 'GMR (ft)',
  rOhmsPerMile: 'R (Ω per mile)',
  voltageWarningPu: 'warning band (pu)',
  voltageViolationPu: 'violation band (pu)',
  unbalancePercent: 'unbalance limit (%)',
  unbalanceMetric: 'unbalance definition',
  neutralShiftPercent: 'neutral shift limit (%)',
  loadingPercent: 'loading limit (%)',
  z: 'constant-impedance share',
  i: 'constant-current share',
  p: 'constant-power share',
};

const PHASE_KEYS: Record<string, string> = { a: 'phase A', b: 'phase B', c: 'phase C', n: 'neutral', ab: 'phases A–B', bc: 'phases B–C', ca: 'phases C–A', '1': 'leg 1', '2': 'leg 2' };

/** One path segment in words: known keys, phase keys, list positions (1-based), else the key as written. */
function segmentWord(seg: string, parent: string | undefined): string {
  if (/^\d+$/.test(seg)) {
    if (parent === 'conductors' || parent === 'ohmsPerLength' || parent === 'siemensPerLength') return `row ${Number(seg) + 1}`;
    return `item ${Number(seg) + 1}`;
  }
  if (Object.hasOwn(PHASE_KEYS, seg) && parent !== undefined && ['phases', 'ohmsPerLength', 'opened'].includes(parent)) return PHASE_KEYS[seg];
  return Object.hasOwn(WORDS, seg) ? WORDS[seg] : seg;
}

/**
 * A dotted parameter path in words, most specific last: `each.kw` → "every phase › P (kW)",
 * `impedance.ohmsPerLength.n` → "impedance › Z per length (Ω) › neutral".
 */
export function parameterWords(path: string): string {
  if (path === '' || path === '(root)') return 'the file';
  const segs = path.replace(/\[(\d+)\]/g, '.$1').split('.').filter((s) => s !== '');
  const out: string[] = [];
  segs.forEach((s, i) => {
    const prev = segs[i - 1];
    // `opened.<field>` is about one connection: say "opened conductors" once.
    if (prev === 'opened') return;
    // A bus keyed by its name in the circuit's bus list: "bus HOUSE".
    if (prev === 'buses' && !/^\d+$/.test(s)) {
      out[out.length - 1] = `bus ${s}`;
      return;
    }
    out.push(segmentWord(s, prev));
  });
  return out.join(' › ');
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

const num = (x: number) => (Number.isFinite(x) ? String(Number(x.toPrecision(10))) : String(x));

/** A complex value as typed in the forms: "0.19 + j0.38", "120∠-30°". Null when `v` is not one. */
export function complexText(v: unknown): string | null {
  if (!isRecord(v)) return null;
  const keys = Object.keys(v).sort().join(',');
  if (keys === 'im,re' && typeof v.re === 'number' && typeof v.im === 'number') {
    if (v.im === 0) return num(v.re);
    return `${num(v.re)} ${v.im < 0 ? '−' : '+'} j${num(Math.abs(v.im))}`;
  }
  if (keys === 'angleDeg,mag' && typeof v.mag === 'number' && typeof v.angleDeg === 'number') return `${num(v.mag)}∠${num(v.angleDeg)}°`;
  return null;
}

const CONDUCTOR_LIST_KEYS = new Set(['open', 'between', 'primary', 'conductors', 'opened', 'phases']);

/** The format's named choices in words, by the parameter they belong to ("perConductor" never shows). */
const CHOICE_WORDS: Record<string, Record<string, string>> = {
  kind: {
    perConductor: 'per conductor',
    matrix: 'impedance matrix',
    sequence: 'sequence impedances',
    carson: 'conductor geometry (Carson)',
    threePhase: 'three-phase',
    threePhaseEarth: 'three-phase to earth',
    lineEarth: 'line to earth',
    lineLine: 'line to line',
    doubleLineEarth: 'two lines to earth',
  },
  connection: { wye: 'wye', wyeFloating: 'floating wye (star point not connected)', delta: 'delta', single: 'single-phase' },
  model: { impedance: 'constant impedance', current: 'constant current', power: 'constant power' },
  earthing: { solid: 'solidly earthed', unearthed: 'unearthed' },
  hvEarthing: { solid: 'solidly earthed', unearthed: 'unearthed' },
  lvEarthing: { solid: 'solidly earthed', unearthed: 'unearthed' },
  set: { 'ansi-c84.1': 'ANSI C84.1', 'iec-en': 'IEC/EN ±10 %' },
  perLengthUnit: { kft: '1000 ft' },
  unbalanceMetric: { iec: 'IEC |V2|/|V1|', nema: 'line voltages (NEMA)', ieee: 'phase voltages (IEEE)' },
};

/**
 * A stored value in words for parameter `path`: numbers as written, conductor lists in words,
 * complex values as "re + jim", switch state as "closed"/"open", bus names as drawn, absent "—",
 * an empty list "none"; anything else as "key value" pairs, never JSON.
 */
export function valueWords(path: string, v: unknown, names?: CircuitNames): string {
  const last = path.split('.').filter((s) => !/^\d+$/.test(s)).pop() ?? '';
  const parent = path.split('.').slice(-2, -1)[0];
  if (v === null || v === undefined) return '—';
  if (typeof v === 'number') return num(v);
  if (typeof v === 'boolean') {
    if (last === 'closed') return v ? 'closed' : 'open';
    return v ? 'yes' : 'no';
  }
  if (typeof v === 'string') {
    if (v === '') return '(empty)';
    if (Object.hasOwn(CHOICE_WORDS, last) && Object.hasOwn(CHOICE_WORDS[last], v)) return CHOICE_WORDS[last][v];
    if (names && (last === 'bus' || last === 'from' || last === 'to')) return names.bus(v);
    if (names) return names.text(v);
    return v;
  }
  const c = complexText(v);
  if (c !== null) return c;
  if (Array.isArray(v)) {
    if (v.length === 0) return 'none';
    if ((CONDUCTOR_LIST_KEYS.has(last) || parent === 'opened') && v.every((x) => typeof x === 'string' && /^[abcn12]$/.test(x))) return conductorWords(v as string[]);
    return v.map((x, i) => valueWords(`${path}.${i}`, x, names)).join(', ');
  }
  if (isRecord(v)) {
    const entries = Object.entries(v).filter(([, x]) => x !== undefined);
    if (entries.length === 0) return 'none';
    return entries.map(([k, x]) => `${segmentWord(k, last)} ${valueWords(`${path}.${k}`, x, names)}`).join(', ');
  }
  return String(v);
}
