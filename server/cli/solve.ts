/**
 * `npm run -s solve -- <file.json> [--json [--full]] [--case <id> | --all-cases] [--timings]`: solve a
 * Wyeward circuit file, or one of its study cases (`--case`), or the base and every case
 * (`--all-cases`: with --json `{ "cases": { "base": {…}, "<id>": {…} } }`, each entry exactly what
 * `--json` prints for that case, or `{ "error": { code, message } }` for a case that fails).
 *
 * Without --json: a readable report (buses, element currents, faults, totals, flags) with the
 * safety caution. With --json: the results as JSON on stdout: `nodes` (voltage to earth per node)
 * and `elements[id].currents` (conventions in docs/circuit-format.md), plus faults, totals,
 * floating parts and flags; `--full` adds the per-bus results and all per-element fields.
 * Exit codes: 0 solved; 2 invalid input (unreadable file, malformed JSON, schema errors);
 * 3 a network that cannot be solved. Errors are one short stderr line naming the element or node,
 * never a stack trace. `--timings` adds one stderr line splitting the run (start-up and imports,
 * read, JSON parse, validate + expand, solve, results, output; after the lean start handed the
 * run over, its read and its scan count in start-up, and read shows 0 ms). Big JSON results are written in
 * chunks (see writeJson); a primitive-only file's --json is written straight from arrays
 * (printed-json.ts), by the typed path from the file's text when it takes the file
 * (shared/engine/typed: no JSON.parse, no element objects; through the launcher that is the
 * lean start, solve-lean.ts, before this module is even loaded), else from the general solver's
 * solution. Kept light on purpose (it is benchmarked against ngspice): file → parse → solve →
 * write, importing only the engine.
 */
import { pathToFileURL } from 'node:url';
import { writePrintedPrimitiveJson, writePrintedResult } from './printed-json.ts';
import { chunkedWriter } from './printed-write.ts';
import { printTimings } from './timings.ts';
import { readText } from './read-text.ts';
import { writeOut } from './stdout.ts';
// the engine's modules one by one, not its index: the index also loads the demo circuits and the
// balancing code at start-up, which this CLI never uses
import { EngineError } from '../../shared/engine/errors.ts';
import { circuitResults, prepareCircuit } from '../../shared/engine/solve-circuit.ts';
import { solvePrimitives } from '../../shared/engine/solver/index.ts';
import { applyCase, caseLabel, circuitCases } from '../../shared/engine/cases/apply-case.ts';
import { BASE_CASE_ID, type StudyCase } from '../../shared/engine/schema/cases.ts';
import { printedPrimitiveResultOfText } from '../../shared/engine/typed/printed-scanned.ts';
import type { Phasor } from '../../shared/engine/phasor.ts';
import type { CircuitResult } from '../../shared/engine/results/types.ts';

export const CAUTION =
  'CAUTION: Wyeward is an engineering aid. Results are only as good as the model; designs must follow local codes and be checked under licensed practice. Lost-neutral conditions put dangerous voltages on equipment.';

/** Exit with one line on stderr. */
export function fail(code: number, message: string): never {
  process.stderr.write(`solve: ${message.split('\n')[0]}\n`);
  process.exit(code);
}

const num = (x: number) => (x >= 1e4 ? x.toFixed(0) : x >= 1e-3 || x === 0 ? x.toPrecision(4) : x.toExponential(2));
const fmt = (p: Phasor) => `${num(p.mag)}∠${p.angleDeg.toFixed(1)}°`;
const pad = (s: string, n: number) => (s.length >= n ? s : s + ' '.repeat(n - s.length));

/** The readable report. */
export function formatReport(r: CircuitResult): string {
  const out: string[] = [];
  out.push(`Wyeward circuit report${r.name ? `: ${r.name}` : ''}`);
  out.push(CAUTION);
  out.push(`RMS phasors (magnitude∠degrees); sequence ${r.conventions.sequence}; S = V·I* (load convention); ${r.frequencyHz} Hz; earth is the 0 V reference.`);
  out.push('');
  out.push('Buses');
  for (const b of r.buses) {
    const ln = Object.entries(b.lineToNeutral).map(([k, v]) => `${k}-${b.lnReference === 'neutral' ? 'n' : 'e'} ${fmt(v)} V`);
    const ll = Object.entries(b.lineToLine).map(([k, v]) => `${k} ${fmt(v)} V`);
    let line = `  ${pad(b.bus, 12)} ${ln.join('  ')}`;
    if (ll.length) line += ` | ${ll.join('  ')}`;
    out.push(line);
    const extra: string[] = [];
    if (b.neutralToEarth) extra.push(`n-earth ${fmt(b.neutralToEarth)} V${b.neutralShiftPercent !== undefined ? ` (${b.neutralShiftPercent.toFixed(1)} % of nominal)` : ''}`);
    if (b.sequence) extra.push(`V0 ${fmt(b.sequence.zero)} V1 ${fmt(b.sequence.positive)} V2 ${fmt(b.sequence.negative)} V`);
    if (b.sequenceToNeutral) extra.push(`to n: V0 ${fmt(b.sequenceToNeutral.zero)} V1 ${fmt(b.sequenceToNeutral.positive)} V2 ${fmt(b.sequenceToNeutral.negative)} V`);
    if (b.iecUnbalancePercent !== undefined) extra.push(`unbalance IEC ${b.iecUnbalancePercent.toFixed(2)} % NEMA ${b.nemaUnbalancePercent!.toFixed(2)} % IEEE ${b.ieeeUnbalancePercent!.toFixed(2)} %`);
    if (b.neutralOpenAt?.length) extra.push(`neutral open at ${b.neutralOpenAt.join(', ')}`);
    if (b.floating) extra.push('FLOATING (no path to earth)');
    if (extra.length) out.push(`  ${pad('', 12)} ${extra.join('; ')}`);
  }
  out.push('');
  out.push('Elements (currents per conductor; blocks: into the element at each port, sources: out of the source)');
  for (const e of Object.values(r.elements)) {
    const parts: string[] = [];
    if (e.ports) {
      for (const p of e.ports) parts.push(`${p.bus ?? p.nodes[0]}: ${p.conductors.map((c, k) => `${c} ${fmt(p.currents[k])} A`).join('  ')}`);
    } else parts.push(e.currents.map((c) => `${fmt(c)} A`).join('  '));
    out.push(`  ${pad(e.id, 12)} ${pad(e.type, 22)} ${parts.join(' | ')}`);
    const extra = [`S ${(e.power.re / 1000).toFixed(3)} kW ${(e.power.im / 1000).toFixed(3)} kvar`];
    if (e.losses) extra.push(`losses ${(e.losses.re / 1000).toFixed(3)} kW`);
    if (e.loadingPercent !== undefined) extra.push(`loading ${e.loadingPercent.toFixed(1)} %`);
    if (e.phaseShift) extra.push(`shift ${e.phaseShift.vectorGroup} (${e.phaseShift.convention}): LV lags HV by ${e.phaseShift.lvLagsHvDeg}° in ABC`);
    if (e.earthCurrent) extra.push(`earth ${fmt(e.earthCurrent)} A`);
    out.push(`  ${pad('', 12)} ${extra.join('; ')}`);
  }
  if (r.loads.length) {
    out.push('');
    out.push('Loads (voltage across their own terminals, per unit of their rating)');
    for (const l of r.loads) {
      const parts = l.branches.map((b) => `${b.fromConductor}-${b.toConductor} ${fmt(b.voltage)} V${b.pu !== undefined ? ` = ${b.pu.toFixed(3)} pu` : ''}${b.status === 'ok' ? '' : ` ${b.status.toUpperCase()}`}`);
      out.push(`  ${pad(l.id, 12)} ${parts.join('  ')}`);
    }
  }
  if (r.faults.length) {
    out.push('');
    out.push('Faults');
    for (const f of r.faults) {
      out.push(`  ${pad(f.id, 12)} ${f.kind} at ${f.bus} (${f.phases.join(',')}): Ia ${fmt(f.phaseCurrents.a)} Ib ${fmt(f.phaseCurrents.b)} Ic ${fmt(f.phaseCurrents.c)} A; I0 ${fmt(f.sequence.zero)} I1 ${fmt(f.sequence.positive)} I2 ${fmt(f.sequence.negative)} A; earth ${fmt(f.earthCurrent)} A`);
    }
  }
  const t = r.totals;
  out.push('');
  out.push(`Totals: sources ${(t.sourcePower.re / 1000).toFixed(3)} kW ${(t.sourcePower.im / 1000).toFixed(3)} kvar; loads ${(t.loadPower.re / 1000).toFixed(3)} kW; losses ${(t.losses.re / 1000).toFixed(3)} kW; balance residual ${t.powerBalanceResidual.mag.toExponential(2)} VA; largest KCL residual ${t.maxKclResidualAmps.toExponential(2)} A`);
  out.push('');
  out.push(`Flags (${r.limits.name})`);
  if (r.flags.length === 0) out.push('  none');
  for (const f of r.flags) out.push(`  ${pad(f.severity.toUpperCase(), 9)} ${f.message}`);
  out.push('');
  return out.join('\n');
}

/**
 * The JSON written with --json: `nodes`, `elements[id].currents` (+ type, direction, ports of
 * blocks), faults, totals, floating parts and flags. `--full` adds the per-bus results and every
 * per-element field (larger: about 4× on big feeders).
 */
export function jsonResult(r: CircuitResult, full = false) {
  const elements: Record<string, unknown> = {};
  for (const e of Object.values(r.elements)) {
    if (full) elements[e.id] = e;
    else if (e.ports) elements[e.id] = { type: e.type, currentDirection: e.currentDirection, ports: e.ports.map((p) => ({ bus: p.bus, conductors: p.conductors })), currents: e.currents };
    else elements[e.id] = { type: e.type, currents: e.currents };
  }
  return {
    format: 'wyeward-result',
    version: 1,
    conventions: r.conventions,
    nodes: r.nodes,
    elements,
    ...(full ? { buses: r.buses, loads: r.loads } : {}),
    faults: r.faults,
    totals: r.totals,
    floating: r.floating,
    flags: r.flags,
    iterations: r.iterations,
  };
}

/** Entries of a big record serialized per JSON.stringify call in writeJson. */
const BATCH = 256;

/**
 * Write `value` as JSON plus a newline through `write`, in chunks of about `chunkChars`: the same
 * text as `JSON.stringify(value) + '\n'`, but the large records (nodes, elements) are serialized
 * a batch of entries at a time, so a 20 000-bus result (~32 MB) never exists as one string and one buffer.
 */
export function writeJson(value: Record<string, unknown>, write: (chunk: string) => void, chunkChars = 1 << 20, end = '\n'): void {
  const { push, end: finish } = chunkedWriter(write, chunkChars);
  push('{');
  let first = true;
  for (const [key, v] of Object.entries(value)) {
    if (v === undefined || typeof v === 'function' || typeof v === 'symbol') continue; // as JSON.stringify
    push(`${first ? '' : ','}${JSON.stringify(key)}:`);
    first = false;
    const isRecord = v !== null && typeof v === 'object' && !Array.isArray(v) && typeof (v as { toJSON?: unknown }).toJSON !== 'function';
    if (!isRecord || Object.keys(v as object).length < 1000) {
      push(JSON.stringify(v));
      continue;
    }
    // entries in batches of BATCH: one native JSON.stringify per batch instead of per entry
    // (measured: ~40 000 small calls cost more than the text itself). A batch is a null-prototype
    // object (so a key "__proto__" stays a key) filled in the record's own key order; integer-like
    // keys come first in both, so each batch's text is the matching slice of the record's text.
    push('{');
    let firstEntry = true;
    let batch: Record<string, unknown> = Object.create(null);
    let inBatch = 0;
    const flush = () => {
      const text = JSON.stringify(batch);
      if (text.length > 2) {
        push(`${firstEntry ? '' : ','}${text.slice(1, -1)}`);
        firstEntry = false;
      }
      batch = Object.create(null);
      inBatch = 0;
    };
    for (const k of Object.keys(v as object)) {
      batch[k] = (v as Record<string, unknown>)[k];
      if (++inBatch === BATCH) flush();
    }
    if (inBatch) flush();
    push('}');
  }
  push(`}${end}`);
  finish();
}

/**
 * Run the CLI on its arguments (exits the process on errors). Called directly or by
 * solve-launcher.mjs, after the lean start (solve-lean.ts) declined the run: `handOver.text` is then
 * the file's text, already read and already declined by the typed path.
 */
export function main(argv: string[], handOver?: { text?: string }): void {
  const t0 = performance.now();
  const switches = new Set(['--json', '--full', '--timings', '--all-cases']);
  const args: string[] = [];
  let caseId: string | undefined;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--case' || a.startsWith('--case=')) {
      const v = a === '--case' ? argv[++i] : a.slice('--case='.length);
      if (!v || v.startsWith('--')) fail(2, `--case needs the id of a case (${USAGE})`);
      caseId = v;
    } else if (!switches.has(a)) args.push(a);
  }
  const asJson = argv.includes('--json');
  const full = argv.includes('--full');
  const timings = argv.includes('--timings');
  const allCases = argv.includes('--all-cases');
  const unknownFlag = args.find((a) => a.startsWith('--'));
  if (unknownFlag) fail(2, `unknown option ${unknownFlag} (${USAGE})`);
  if (args.length !== 1) fail(2, USAGE);
  if (allCases && caseId !== undefined) fail(2, `--case and --all-cases cannot be used together (${USAGE})`);
  const file = args[0];
  const marks: [string, number][] = [];
  const mark = (label: string) => marks.push([label, performance.now()]);
  let text: string;
  const declined = handOver?.text !== undefined;
  if (declined) text = handOver.text!;
  else {
    try {
      text = readText(file);
    } catch (e) {
      fail(2, `cannot read ${file}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
    }
  }
  mark('read');
  // --json of a primitive-only file: the typed path from the text (same bytes as the general path;
  // it declines anything else, which then takes the general path below)
  if (asJson && !full && !allCases && caseId === undefined && !declined) {
    const before = marks.length;
    let printed: ReturnType<typeof printedPrimitiveResultOfText>;
    try {
      printed = printedPrimitiveResultOfText(text, (stage) => mark(stage === 'scan' ? 'scan (parse + validate)' : 'solve'));
    } catch {
      printed = undefined; // never expected; the general path then reports in its own words
    }
    if (printed) {
      writePrintedResult(printed, writeOut);
      mark('results + JSON write');
      if (timings) printTimings(t0, marks);
      return;
    }
    marks.length = before; // a declined file: its time counts in the general path's first stage
  }
  let input: unknown;
  try {
    input = JSON.parse(text);
  } catch (e) {
    fail(2, `${file} is not valid JSON: ${(e as Error).message}`);
  }
  mark('JSON parse');
  if (allCases) {
    solveAllCases(input, asJson, full);
    return;
  }
  let studyCase: StudyCase | undefined;
  if (caseId !== undefined && caseId !== BASE_CASE_ID) {
    try {
      studyCase = circuitCases(input).find((c) => c.id === caseId);
      input = applyCase(input as Record<string, unknown>, caseId);
    } catch (e) {
      if (e instanceof EngineError) fail(2, e.message);
      throw e;
    }
    mark('apply case');
  }
  let result: CircuitResult | undefined;
  const write = writeOut;
  try {
    // solveCircuit's steps, one by one so that --timings can split them
    const prepared = prepareCircuit(input);
    mark('validate + expand');
    const solution = solvePrimitives(prepared.primitives);
    mark('solve');
    // --json of a primitive-only file: only what is printed, straight from the solution (same bytes)
    if (asJson && !full && writePrintedPrimitiveJson(prepared, solution, write)) mark('results + JSON write');
    else {
      result = circuitResults(prepared, solution);
      mark('results');
    }
  } catch (e) {
    if (e instanceof EngineError) fail(e.code === 'invalid-circuit' ? 2 : 3, e.message);
    fail(3, `internal error: ${(e as Error).message ?? String(e)}`);
  }
  if (result && asJson) {
    writeJson(jsonResult(result, full), write);
    mark('JSON write');
  } else if (result) {
    writeOut((studyCase ? `${caseHeading(studyCase)}\n` : '') + formatReport(result));
    mark('report');
  }
  if (timings) printTimings(t0, marks);
}

const USAGE = 'usage: solve <file.json> [--json [--full]] [--case <id> | --all-cases]';

/** The line above a case's readable report. */
const caseHeading = (c: StudyCase) => `Study ${caseLabel(c)}${c.name ? ` (${c.id})` : ''}: the base circuit with ${c.changes.length} change${c.changes.length === 1 ? '' : 's'}`;

/** Solve one circuit file (no cases): the results, or the engine error. */
export function solveOne(input: unknown): { result: CircuitResult } | { error: EngineError } {
  try {
    const prepared = prepareCircuit(input);
    return { result: circuitResults(prepared, solvePrimitives(prepared.primitives)) };
  } catch (e) {
    if (e instanceof EngineError) return { error: e };
    return { error: new EngineError('non-convergence', `internal error: ${(e as Error).message ?? String(e)}`) };
  }
}

/** Exit code of an engine error, as for a single solve: 2 invalid input, 3 cannot be solved. */
export const exitCodeOf = (e: EngineError) => (e.code === 'invalid-circuit' ? 2 : 3);

/**
 * --all-cases: the base and every case, in file order. A case that fails is reported in its entry
 * (JSON) or in its section (report) and the others still run; the exit code is then that of the
 * worst failure, with one stderr line naming the first failing case.
 */
function solveAllCases(input: unknown, asJson: boolean, full: boolean): void {
  let cases: StudyCase[];
  try {
    cases = circuitCases(input);
  } catch (e) {
    if (e instanceof EngineError) fail(2, e.message);
    throw e;
  }
  const write = writeOut;
  const failures: { label: string; error: EngineError }[] = [];
  const entries: [string, StudyCase | undefined][] = [[BASE_CASE_ID, undefined], ...cases.map((c): [string, StudyCase] => [c.id, c])];
  if (asJson) write('{"cases":{');
  entries.forEach(([id, c], k) => {
    let outcome: ReturnType<typeof solveOne>;
    try {
      outcome = solveOne(applyCase(input as Record<string, unknown>, id));
    } catch (e) {
      if (!(e instanceof EngineError)) throw e;
      outcome = { error: e };
    }
    if ('error' in outcome) failures.push({ label: c ? caseLabel(c) : 'the base circuit', error: outcome.error });
    if (asJson) {
      write(`${k ? ',' : ''}${JSON.stringify(id)}:`);
      if ('error' in outcome) write(JSON.stringify({ error: { code: outcome.error.code, message: outcome.error.message } }));
      else writeJson(jsonResult(outcome.result, full), write, 1 << 20, '');
    } else {
      write(`${c ? caseHeading(c) : 'Base circuit'}\n`);
      write('error' in outcome ? `  cannot be solved: ${outcome.error.message}\n\n` : formatReport(outcome.result));
      write('\n');
    }
  });
  if (asJson) write('}}\n');
  if (failures.length) {
    const worst = Math.max(...failures.map((f) => exitCodeOf(f.error)));
    const more = failures.length > 1 ? ` (and ${failures.length - 1} more case${failures.length > 2 ? 's' : ''} failed)` : '';
    const { label, error } = failures[0];
    fail(worst, `${error.message.startsWith(label) ? error.message : `${label}: ${error.message}`}${more}`);
  }
}

// Run only as a program (tests and tools may import the formatters).
if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) main(process.argv.slice(2));
