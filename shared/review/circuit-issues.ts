/**
 * Problems of a circuit file in the words of a form error: "element LOAD3: every phase › P (kW)
 * must be a number", never a schema path (`elements[0].each.kw`) or a validator's phrasing
 * ("Invalid input: expected number, received string"). The engine names every problem by its path
 * in the file (shared/engine parseCircuit); this module says where that is (which element, by the
 * name the file gives it) and what is wrong, in words. Pure TypeScript, shared by server and client.
 */
import { parameterWords } from './parameter-words.ts';

export interface CircuitIssue {
  path: string;
  message: string;
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** Fields that hold a plain number in the circuit format. */
const NUMBER_FIELDS = new Set([
  'kw', 'kvar', 'kvLL', 'kva', 'kvHigh', 'kvLow', 'percentR', 'percentX', 'percentZ', 'xOverR', 'length', 'ratedVolts', 'voltsLN', 'lowVolts',
  'angleDeg', 'frequencyHz', 'rOhms', 'lHenry', 'cFarad', 'shortCircuitMva', 'z0OverZ1', 'pu', 're', 'im', 'mag', 'earthResistivityOhmM',
  'xFt', 'yFt', 'gmrFt', 'rOhmsPerMile',
]);
/** Fields that hold a complex value (a number, or re and im, or mag and angleDeg). */
const COMPLEX_FIELDS = new Set(['ohms', 'earthOhms', 'z1', 'z0', 'z1PerLength', 'z0PerLength', 'neutralOhmsPerLength']);

/**
 * Values typed as text where the format wants a number (`"kw": "abc"`): the engine's schema reports
 * these through the union it failed, which names the wrong thing, so they are found first, by name.
 */
export function numberFieldIssues(circuit: unknown, prefix = ''): CircuitIssue[] {
  const out: CircuitIssue[] = [];
  const walk = (v: unknown, path: string, depth: number) => {
    if (depth > 6) return;
    if (Array.isArray(v)) v.forEach((x, i) => walk(x, `${path}[${i}]`, depth + 1));
    else if (isRecord(v)) {
      for (const [k, x] of Object.entries(v)) {
        const p = path ? `${path}.${k}` : k;
        if (NUMBER_FIELDS.has(k) && x !== undefined && typeof x !== 'number' && !isRecord(x) && !Array.isArray(x)) out.push({ path: p, message: 'must be a number' });
        else if (COMPLEX_FIELDS.has(k) && (typeof x === 'string' || typeof x === 'boolean')) out.push({ path: p, message: 'must be a number, or a complex value given by re and im (or mag and angleDeg)' });
        else walk(x, p, depth + 1);
      }
    }
  };
  if (isRecord(circuit) && Array.isArray(circuit.elements)) walk(circuit.elements, `${prefix}elements`, 0);
  return out;
}

const KIND_WORDS: Record<string, string> = { number: 'a number', string: 'text', boolean: 'true or false', array: 'a list', object: 'a group of fields' };

/** A validator message in plain words (the element label `(id "X")` the engine appends is dropped: the caller names the element). */
export function issueMessageWords(message: string): string {
  const m = message.replace(/\s*\(id "[^"]*"\)/, '');
  let x: RegExpExecArray | null;
  if ((x = /^Unrecognized keys?: (.+)$/.exec(m))) return `has a field the format does not know: ${x[1]}`;
  if ((x = /^Invalid option: expected one of (.+)$/.exec(m))) return `must be one of ${x[1].replace(/"/g, '').split('|').join(', ')}`;
  if ((x = /^Too small: expected number to be >(=?)(.+)$/.exec(m))) return x[1] ? `must be at least ${x[2]}` : `must be greater than ${x[2]}`;
  if ((x = /^Too big: expected number to be <(=?)(.+)$/.exec(m))) return x[1] ? `must be at most ${x[2]}` : `must be less than ${x[2]}`;
  if ((x = /^Too small: expected (?:array|string|set) to have >=?(\d+) (?:items|characters)$/.exec(m))) return x[1] === '1' ? 'must not be empty' : `needs at least ${x[1]} entries`;
  if ((x = /^Too big: expected (?:array|string|set) to have <=?(\d+) (?:items|characters)$/.exec(m))) return `has more than ${x[1]} entries`;
  if (/^Invalid input: expected \w+, received undefined$/.test(m)) return 'is missing';
  if ((x = /^Invalid input: expected (\w+), received \w+$/.exec(m))) return `must be ${KIND_WORDS[x[1]] ?? x[1]}`;
  if ((x = /^Invalid input: expected (.+)$/.exec(m))) return `must be ${x[1]}`;
  if ((x = /^unknown element type "([^"]*)"/.exec(m))) return `“${x[1]}” is not a kind of element Wyeward knows (the circuit file format lists them)`;
  if (/^missing element type/.test(m)) return 'does not say what kind of element it is (its type is missing)';
  if (/^expected an element object/.test(m)) return 'is not an element (expected a group of fields with a type)';
  if ((x = /^duplicate element id "([^"]*)"$/.exec(m))) return `two elements are named ${x[1]}; rename one of them`;
  if (/^expected an array of elements$/.test(m)) return 'must be a list of elements';
  if (/^expected a JSON object$/.test(m)) return 'must be a circuit (a JSON object with "format": "wyeward-circuit")';
  return m;
}

/**
 * One problem of a circuit file as a form error: "element LOAD3: every phase › P (kW) must be a
 * number", "frequency (Hz) must be greater than 0". `prefix` is where the circuit sits in the file
 * (`circuit.` in a study file).
 */
export function circuitIssueWords(circuit: unknown, issue: CircuitIssue, prefix = ''): string {
  const path = prefix && issue.path.startsWith(prefix) ? issue.path.slice(prefix.length) : issue.path;
  const msg = issueMessageWords(issue.message);
  const el = /^elements\[(\d+)\](?:\.(.*))?$/.exec(path);
  if (el) {
    const i = Number(el[1]);
    const raw = isRecord(circuit) && Array.isArray(circuit.elements) ? circuit.elements[i] : undefined;
    // The element's name from the file, else from the engine's own label ("(id "LOAD3")") when the file is not at hand.
    const hinted = /\(id "([^"]*)"\)/.exec(issue.message)?.[1] ?? null;
    const id = isRecord(raw) && typeof raw.id === 'string' && raw.id !== '' ? raw.id : hinted || null;
    const who = id ? `element ${id}` : `element ${i + 1} (it has no name)`;
    const rest = el[2];
    const verb = /^(is|has|must|needs|does) /.test(msg);
    if (!rest || rest === 'type') return `${who}: ${rest !== 'type' && verb ? `it ${msg}` : msg}`;
    if (rest === 'id' && msg === 'is missing') return `${who}: its name (id) is missing`;
    return `${who}: ${parameterWords(rest)}${verb ? ' ' : ': '}${msg}`;
  }
  if (path === '(root)' || path === '' || path === '_') return /^[A-Z]/.test(msg) ? msg : `the file ${msg}`;
  if (path === 'elements') return msg.startsWith('two elements') ? msg : `the element list ${msg}`;
  // A message that is already a sentence ("Name is required") or starts with its own field name stands alone.
  const key = path.split('.').pop() ?? '';
  if (/^[A-Z]/.test(msg) || msg.startsWith(`${key} `)) return msg;
  return `${parameterWords(path)}${/^(is|has|must|needs|does) /.test(msg) ? ' ' : ': '}${msg}`;
}

/** Every problem in words, keyed by its path (issues from `numberFieldIssues` first; an engine issue on a parent of one is dropped). */
export function circuitIssueFields(circuit: unknown, issues: readonly CircuitIssue[], prefix = ''): Record<string, string> {
  const fields: Record<string, string> = {};
  const numeric = numberFieldIssues(circuit, '');
  const add = (key: string, text: string) => {
    const had = fields[key];
    if (had === undefined) fields[key] = text;
    else if (!had.split('; ').includes(text.replace(/^element [^:]+: /, ''))) fields[key] = `${had}; ${text.replace(/^element [^:]+: /, '')}`;
  };
  for (const n of numeric) add(`${prefix}${n.path}`, circuitIssueWords(circuit, n));
  const parent = (p: string) => p.replace(/(\.[^.[\]]+|\[\d+\])$/, '');
  for (const issue of issues) {
    // The engine's report of the same mistake, made through the object that holds the field.
    const covered = numeric.some((n) => n.path === issue.path || parent(n.path) === issue.path || (/\.(re|im|mag|angleDeg)$/.test(n.path) && parent(parent(n.path)) === issue.path));
    if (covered) continue;
    add(`${prefix}${issue.path}`, circuitIssueWords(circuit, issue));
  }
  return fields;
}
