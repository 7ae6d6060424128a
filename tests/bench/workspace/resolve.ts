/**
 * Benchmark (prints figures, asserts nothing): re-solve time of the live-solve worker's handler on
 * a 300-element study, in Node. Run: `node --import tsx tests/bench/workspace/resolve.ts`.
 * - cold: a fresh handler's first request (JIT cold, analysis included);
 * - warm value edit: one load's kW changes each time (the topology is reused), median of N; sent as
 *   the page sends it (only the changed element, re-validated and re-expanded alone), and whole;
 * - warm topology edit: a service neutral opens and closes in turn (re-analysis each time);
 * - the parts of a warm request: validate + expand, solver, results; and structuredClone of the
 *   response (what postMessage pays to copy it back to the page).
 * Issue target: re-solve in the worker under 50 ms.
 */
import { prepareCircuit, resolveLimits, solveCircuit, createNetwork, type CircuitInput, type CircuitElementInput } from '../../../shared/engine/index.ts';
import { buildResults } from '../../../shared/engine/results/build-results.ts';
import { createSolveHandler } from '../../../src/features/workspace/solve/solve-handler.ts';
import { createRequestEncoder } from '../../../src/features/workspace/solve/solve-request.ts';
import { editedStudy, study300 } from './study-300.ts';
import { cpus, loadavg } from 'node:os';

const N = Number(process.env.BENCH_RUNS ?? 40);
const median = (xs: number[]) => {
  const s = xs.slice().sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
const f = (x: number) => `${x.toFixed(x < 10 ? 2 : 1)} ms`;

const base = study300();
console.log(`machine: ${cpus().length} cores, load average ${loadavg().map((x) => x.toFixed(1)).join(' / ')} (shared; figures inflate with load)`);
const t = (fn: () => void) => {
  const t0 = performance.now();
  fn();
  return performance.now() - t0;
};

// Cold: the first request of a fresh handler in this process.
const cold = createSolveHandler();
const coldRes = cold({ id: 1, circuit: base });
if (!coldRes.ok) throw new Error(coldRes.error.message);
const r = coldRes.result;
console.log(`study: ${base.elements.length} elements, ${r.buses.length} buses, ${Object.keys(r.nodes).length} nodes, ${r.flags.length} flags`);
console.log(`cold first request (fresh handler, JIT cold): ${f(coldRes.ms)}`);

// Warm up the JIT, then measure value edits on one handler (topology reused).
const handler = createSolveHandler();
const encode = createRequestEncoder();
for (let i = 0; i < 10; i++) handler(encode({ id: i, circuit: editedStudy(base, i) }));
const valueEdit: number[] = [];
const wholeEdit: number[] = [];
const analyze: number[] = [];
const clone: number[] = [];
const whole = createSolveHandler();
for (let i = 0; i < 10; i++) whole({ id: i, circuit: editedStudy(base, i) });
for (let i = 0; i < N; i++) {
  const c = editedStudy(base, i + 100);
  const res = handler(structuredClone(encode({ id: 1000 + i, circuit: c })));
  if (!res.ok) throw new Error(res.error.message);
  valueEdit.push(res.ms);
  analyze.push(res.timings.analyzeMs);
  const w = whole({ id: 1000 + i, circuit: c });
  if (!w.ok) throw new Error(w.error.message);
  wholeEdit.push(w.ms);
}
const last = handler({ id: 9999, circuit: base });
for (let i = 0; i < Math.min(N, 15); i++) clone.push(t(() => structuredClone(last)));
const json: number[] = [];
for (let i = 0; i < Math.min(N, 15); i++) json.push(t(() => JSON.parse(JSON.stringify(last))));
console.log(`warm value edit, handler (the changed element validated + expanded, solve, results): median ${f(median(valueEdit))}, min ${f(Math.min(...valueEdit))}, max ${f(Math.max(...valueEdit))} (analysis ${f(median(analyze))}); the whole circuit sent each time: median ${f(median(wholeEdit))}`);
console.log(`structuredClone of the response (postMessage copy, ${(JSON.stringify(last).length / 1e6).toFixed(2)} MB as JSON): median ${f(median(clone))}; JSON round trip ${f(median(json))}`);

// Topology edits: open / close the first service neutral in turn.
const sw = base.elements.findIndex((e) => e.type === 'switch3');
const toggled = (open: boolean): CircuitInput => {
  const elements = base.elements.slice();
  elements[sw] = { ...(elements[sw] as object), open: open ? ['n'] : [] } as CircuitElementInput;
  return { ...base, elements };
};
const topoEdit: number[] = [];
for (let i = 0; i < N; i++) {
  const res = handler(structuredClone(encode({ id: 5000 + i, circuit: toggled(i % 2 === 0) })));
  if (!res.ok) throw new Error(res.error.message);
  topoEdit.push(res.ms);
}
console.log(`warm topology edit (open/close a service neutral): median ${f(median(topoEdit))}`);

// The parts of a warm request, and solveCircuit (no cached network) for comparison.
const prep: number[] = [];
const solve: number[] = [];
const build: number[] = [];
const direct: number[] = [];
const net = createNetwork(prepareCircuit(base).primitives);
for (let i = 0; i < N; i++) {
  const c = editedStudy(base, i + 300);
  let p!: ReturnType<typeof prepareCircuit>;
  prep.push(t(() => (p = prepareCircuit(c))));
  let sol!: ReturnType<typeof net.solve>;
  solve.push(t(() => (net.update(p.primitives), (sol = net.solve()))));
  build.push(t(() => buildResults(p.circuit, p.context, p.expansions, sol, resolveLimits(p.circuit.limits))));
  direct.push(t(() => solveCircuit(c)));
}
console.log(`parts (median): validate + expand ${f(median(prep))}, update + solve ${f(median(solve))}, results ${f(median(build))}`);
console.log(`solveCircuit without a cached network: median ${f(median(direct))}`);
console.log(`target: re-solve under 50 ms → ${median(valueEdit) < 50 ? 'met' : 'NOT met'} in Node on this machine (${N} runs)`);
