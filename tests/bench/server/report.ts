/**
 * Benchmark (prints figures, asserts nothing): the PDF report of the 300-element study
 * (tests/bench/workspace/study-300.ts), as GET /api/studies/:id/report.pdf makes it — in the work
 * pool's worker thread (a study this size is not run inline) — cold (thread start, modules, fonts)
 * and warm (median of N), and inline on this thread for comparison. Prints the workload and
 * `uptime` before and after. Issue target: ≤ 3 s.
 * Run: `node --import tsx tests/bench/server/report.ts` (BENCH_RUNS=n, default 5).
 */
import { execFileSync } from 'node:child_process';
import { cpus } from 'node:os';
import { renderReportPdf, type ReportInput } from '../../../server/report/pdf.ts';
import { createWorkPool } from '../../../server/work/pool.ts';
import { study300 } from '../workspace/study-300.ts';

const N = Number(process.env.BENCH_RUNS ?? 5);
const uptime = () => execFileSync('uptime', { encoding: 'utf8' }).trim();
const median = (xs: number[]) => xs.slice().sort((a, b) => a - b)[xs.length >> 1];
const s = (ms: number) => `${(ms / 1000).toFixed(2)} s`;

const circuit = study300();
const input: ReportInput = {
  study: { name: 'Bench feeder (300 elements)', team: 'Bench team' },
  revision: { number: 1, author: 'Bench', createdAt: new Date().toISOString(), message: '' },
  review: { status: 'Draft — not reviewed', approved: false },
  units: 'si',
  content: { circuit },
  madeAt: new Date().toISOString(),
};

console.log(`machine: ${cpus().length} cores; before: ${uptime()}`);
const pool = createWorkPool({ threads: 1, timeoutMs: 120_000 });
let t0 = performance.now();
const first = await pool.report(input);
const cold = performance.now() - t0;
const warm: number[] = [];
for (let i = 0; i < N; i++) {
  t0 = performance.now();
  await pool.report(input);
  warm.push(performance.now() - t0);
}
await pool.close();
const inline: number[] = [];
for (let i = 0; i < N; i++) {
  t0 = performance.now();
  await renderReportPdf(input);
  inline.push(performance.now() - t0);
}
console.log(`workload: ${circuit.elements.length} elements; report ${first.byteLength} bytes`);
console.log(`work pool (what the endpoint does): cold ${s(cold)}, warm median ${s(median(warm))} (min ${s(Math.min(...warm))}, max ${s(Math.max(...warm))}, ${N} runs)`);
console.log(`inline on this thread: first ${s(inline[0])}, median ${s(median(inline))}`);
console.log(`after: ${uptime()}`);
