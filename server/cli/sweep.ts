/**
 * `npm run -s sweep -- <file.json> --set <element>.<field>[.<subfield>…]=<from>:<to>:<steps>[:log]
 * [--set … a second one] [--case <id>] [--json]`: solve a circuit file at every point of a sweep of
 * one or two numeric parameters (steps = number of points, both ends included; `:log` spaces them
 * logarithmically; with two parameters every combination, the first varying slowest).
 *
 * CSV by default: a header with units, then one row per point: the parameter values, every bus's
 * voltage magnitudes (each phase to neutral — to earth where the bus has no neutral — and the
 * neutral to earth), and a `status` column ("ok" or the reason the point failed). The safety caution
 * goes to stderr so the CSV stays plain. With --json:
 * `{ "parameters": ["KITCHEN.each.kw"], "points": [ { "values": [1.5], "nodes": {…}, "elements": {…}, "flags": […] } ] }`,
 * each point's nodes/elements/flags exactly what `solve --json` prints for that circuit, or
 * `{ "values": […], "error": { "code", "message" } }` for a point that fails.
 * `--envelope <bus> [--levels <from>:<to>:<steps>]` instead of --set: the lost-neutral envelope of
 * that bus (see runEnvelope).
 * A failing point never stops the sweep. Exit codes as for solve: 0 every point solved; 2 invalid
 * input (file, options, parameter paths, a case), or some point left an invalid circuit; 3 some
 * point could not be solved (one stderr line: how many, and the first).
 */
import { readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import {
  EngineError,
  InvalidCircuitError,
  applyCase,
  lostNeutralEnvelope,
  parseCircuit,
  setPath,
  sweepCircuit,
  sweepPoints,
  type CircuitInput,
  type CircuitResult,
  type SweepParameter,
} from '../../shared/engine/index.ts';
import { CAUTION, exitCodeOf, jsonResult, solveOne } from './solve.ts';

const USAGE = 'usage: sweep <file.json> (--set <element>.<field>[.<subfield>…]=<from>:<to>:<steps>[:log] [--set …] | --envelope <bus> [--levels <from>:<to>:<steps>]) [--case <id>] [--json]';

function fail(code: number, message: string): never {
  process.stderr.write(`sweep: ${message.split('\n')[0]}\n`);
  process.exit(code);
}

/** `KITCHEN.each.kw=0.5:6:12` or `ROD.ohms=0.1:1e6:25:log` → a sweep parameter. */
export function parseSetOption(spec: string): SweepParameter {
  const eq = spec.lastIndexOf('=');
  if (eq <= 0) throw new Error(`--set ${spec}: write it as <element>.<field>=<from>:<to>:<steps>`);
  const path = spec.slice(0, eq);
  const parts = spec.slice(eq + 1).split(':');
  const scale = parts.length === 4 ? parts.pop() : 'linear';
  if (parts.length !== 3 || (scale !== 'linear' && scale !== 'log')) throw new Error(`--set ${spec}: the range is <from>:<to>:<steps>, optionally followed by :log`);
  const [from, to, steps] = parts.map((x) => (x.trim() === '' ? NaN : Number(x)));
  if (!Number.isFinite(from) || !Number.isFinite(to)) throw new Error(`--set ${spec}: from and to must be numbers`);
  if (!Number.isInteger(steps) || steps < 1) throw new Error(`--set ${spec}: steps is the number of points, a whole number ≥ 1`);
  return { path, from, to, steps, scale };
}

/** Unit of a swept value, from its field name (empty when the field does not say). */
export function parameterUnit(circuit: CircuitInput, path: string): string {
  const fields = path.split('.');
  const last = fields[fields.length - 1];
  const parent = fields[fields.length - 2];
  const units: Record<string, string> = { kw: 'kW', kvar: 'kvar', kvLL: 'kV', ratedVolts: 'V', pu: 'pu', angleDeg: '°', rOhms: 'Ω', lHenry: 'H', cFarad: 'F', earthOhms: 'Ω', ohms: 'Ω', shortCircuitMva: 'MVA', kva: 'kVA', frequencyHz: 'Hz' };
  if (last === 'length') {
    const el = circuit.elements.find((e) => path.startsWith(`${e.id}.`)) as { lengthUnit?: string } | undefined;
    return el?.lengthUnit ?? '';
  }
  if ((last === 're' || last === 'im' || last === 'mag') && parent === 'ohms') return 'Ω';
  return units[last] ?? '';
}

/** CSV cell: quoted when it holds a comma, quote or line break. */
const cell = (s: string) => (/[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
const number = (x: number) => String(Number(x.toPrecision(10)));

/** The CSV voltage columns of one result: header → |V| in volts, buses in result order. */
export function voltageColumns(r: CircuitResult): Map<string, number> {
  const out = new Map<string, number>();
  for (const b of r.buses) {
    const ref = b.lnReference === 'neutral' ? 'n' : 'earth';
    for (const [c, v] of Object.entries(b.lineToNeutral)) out.set(`${b.bus} ${c}-${ref} (V)`, v.mag);
    if (b.neutralToEarth) out.set(`${b.bus} n-earth (V)`, b.neutralToEarth.mag);
  }
  return out;
}

/** Run the sweep CLI on its arguments (exits the process on errors). */
export function main(argv: string[]): void {
  const params: SweepParameter[] = [];
  const args: string[] = [];
  let caseId = 'base';
  let envelopeBus: string | undefined;
  let levels: string | undefined;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const name = ['--set', '--case', '--envelope', '--levels'].find((n) => a === n || a.startsWith(`${n}=`));
    if (name) {
      const v = a.includes('=') && a.indexOf('=') === name.length ? a.slice(name.length + 1) : argv[++i];
      if (!v || v.startsWith('--')) fail(2, `${name} needs a value (${USAGE})`);
      if (name === '--case') caseId = v;
      else if (name === '--envelope') envelopeBus = v;
      else if (name === '--levels') levels = v;
      else {
        try {
          params.push(parseSetOption(v));
        } catch (e) {
          fail(2, (e as Error).message);
        }
      }
    } else if (a !== '--json') args.push(a);
  }
  const asJson = argv.includes('--json');
  const unknownFlag = args.find((a) => a.startsWith('--'));
  if (unknownFlag) fail(2, `unknown option ${unknownFlag} (${USAGE})`);
  if (args.length !== 1) fail(2, USAGE);
  if (envelopeBus !== undefined && params.length > 0) fail(2, `--envelope and --set cannot be used together (${USAGE})`);
  if (levels !== undefined && envelopeBus === undefined) fail(2, `--levels goes with --envelope (${USAGE})`);
  if (envelopeBus === undefined && (params.length < 1 || params.length > 2)) fail(2, `give one or two --set parameters (${USAGE})`);
  const file = args[0];
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (e) {
    fail(2, `cannot read ${file}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
  }
  let input: unknown;
  try {
    input = JSON.parse(text);
  } catch (e) {
    fail(2, `${file} is not valid JSON: ${(e as Error).message}`);
  }

  if (envelopeBus !== undefined) {
    runEnvelope(input, caseId, envelopeBus, levels, asJson);
    return;
  }
  // everything that is wrong before the first point is invalid input (exit 2)
  let base: CircuitInput;
  let points: number[][];
  const paths = params.map((p) => p.path);
  try {
    base = applyCase(input as Record<string, unknown>, caseId);
    parseCircuit(base);
    for (const p of params) setPath(base, p.path, p.from); // the path names a numeric field of an element
    points = sweepPoints(params);
  } catch (e) {
    if (e instanceof EngineError) fail(2, e.message);
    throw e;
  }
  // a path naming a field the element does not have fails at every point: say so once, as bad input
  try {
    parseCircuit(sweepCircuit(base, paths, points[0]));
  } catch (e) {
    const unknownField = e instanceof InvalidCircuitError && e.issues.find((i) => /unrecognized key/i.test(i.message));
    if (unknownField) fail(2, `parameter ${paths.join(' or ')}: ${unknownField.message} (${unknownField.path})`);
  }

  // a reader that stops early (| head) ends the sweep quietly
  process.stdout.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code === 'EPIPE') process.exit(0);
    throw e;
  });
  process.stderr.write(`${CAUTION}\n`);
  const write = (s: string) => process.stdout.write(s);
  const failures: { values: number[]; error: EngineError }[] = [];
  const rows: { values: number[]; volts?: Map<string, number>; error?: string }[] = [];
  if (asJson) write(`{"parameters":${JSON.stringify(paths)},"points":[`);
  points.forEach((values, k) => {
    const outcome = solveOne(sweepCircuit(base, paths, values));
    if ('error' in outcome) failures.push({ values, error: outcome.error });
    if (asJson) {
      const body = 'error' in outcome ? { values, error: { code: outcome.error.code, message: outcome.error.message } } : (() => {
        const j = jsonResult(outcome.result);
        return { values, nodes: j.nodes, elements: j.elements, flags: j.flags };
      })();
      write(`${k ? ',' : ''}${JSON.stringify(body)}`);
    } else rows.push('error' in outcome ? { values, error: outcome.error.message } : { values, volts: voltageColumns(outcome.result) });
  });
  if (asJson) write(']}\n');
  else {
    // columns: every voltage seen at any point, in order of first appearance
    const columns: string[] = [];
    const seen = new Set<string>();
    for (const r of rows) for (const c of r.volts?.keys() ?? []) if (!seen.has(c)) (seen.add(c), columns.push(c));
    const header = [...paths.map((p) => {
      const unit = parameterUnit(base, p);
      return unit ? `${p} (${unit})` : p;
    }), ...columns, 'status'];
    let out = `${header.map(cell).join(',')}\n`;
    for (const r of rows) {
      const volts = columns.map((c) => (r.volts?.has(c) ? number(r.volts.get(c)!) : ''));
      out += `${[...r.values.map(number), ...volts, cell(r.error ?? 'ok')].join(',')}\n`;
      if (out.length > 1 << 20) (write(out), (out = ''));
    }
    write(out);
  }
  if (failures.length) {
    const worst = Math.max(...failures.map((f) => exitCodeOf(f.error)));
    const first = failures[0];
    fail(worst, `${failures.length} of ${points.length} points failed; first at ${paths.map((p, i) => `${p} = ${number(first.values[i])}`).join(', ')}: ${first.error.message}`);
  }
}

/**
 * --envelope <bus>: the lost-neutral envelope of that bus (the circuit, or --case, must have its
 * neutral open): each single-phase kW load from --levels (default 0.1:1:5, fractions of its value),
 * every combination. Text: per load its worst voltages, and the share outside the violation band;
 * --json: the whole envelope (locus included). Exit 3 when some combination could not be solved.
 */
function runEnvelope(input: unknown, caseId: string, bus: string, levels: string | undefined, asJson: boolean): void {
  let fractions: SweepParameter;
  try {
    fractions = parseSetOption(`levels=${levels ?? '0.1:1:5'}`);
  } catch (e) {
    fail(2, (e as Error).message.replace('--set levels=', '--levels '));
  }
  let env: ReturnType<typeof lostNeutralEnvelope>;
  try {
    const circuit = applyCase(input as Record<string, unknown>, caseId);
    parseCircuit(circuit);
    env = lostNeutralEnvelope(circuit, { bus, fromFraction: fractions.from, toFraction: fractions.to, steps: fractions.steps });
  } catch (e) {
    if (e instanceof EngineError) fail(2, e.message);
    throw e;
  }
  process.stderr.write(`${CAUTION}\n`);
  if (asJson) process.stdout.write(`${JSON.stringify(env)}\n`);
  else {
    const pct = (x: number) => `${(100 * x).toFixed(0)} %`;
    const out = [
      `Lost-neutral envelope at ${bus}: each load from ${pct(fractions.from)} to ${pct(fractions.to)} of its value in ${fractions.steps} levels, ${env.solved} combinations solved`,
      'A lost neutral is a hazard to remove, not a margin to use.',
      ...env.loads.map((l) => `  ${l.id} (${l.phase}-n): ${l.minVolts.toFixed(1)} V to ${l.maxVolts.toFixed(1)} V (${l.minPu.toFixed(3)} to ${l.maxPu.toFixed(3)} pu of ${l.ratedVolts.toFixed(1)} V)`),
      `Combinations with a load outside ${env.violationPu[0].toFixed(3)}–${env.violationPu[1].toFixed(3)} pu: ${(100 * env.outsideShare).toFixed(1)} %`,
      '',
    ];
    process.stdout.write(out.join('\n'));
  }
  if (env.failed > 0) fail(3, `${env.failed} of ${env.failed + env.solved} combinations could not be solved`);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) main(process.argv.slice(2));
