/**
 * Benchmark (prints figures, asserts nothing): the PDF report of the 300-element study
 * (tests/bench/workspace/study-300.ts), as GET /api/studies/:id/report.pdf makes it — in the work
 * pool's worker thread (a study this size is not run inline) — cold (thread start, modules, fonts)
 * and warm (median of N), and inline on this thread for comparison. Prints the workload and
 * `uptime` before and after, with the process CPU time of each run (all threads: the steadier figure
 * on a shared machine). Issue target: ≤ 3 s.
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
/** Wall and process CPU time (every thread) of one run, ms. */
async function timed<T>(fn: () => Promise<T>): Promise<{ wall: number; cpu: number; value: T }> {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const value = await fn();
  const c = process.cpuUsage(c0);
  return { wall: performance.now() - t0, cpu: (c.user + c.system) / 1000, value };
}
const cold = await timed(() => pool.report(input));
const warm: { wall: number; cpu: number }[] = [];
for (let i = 0; i < N; i++) warm.push(await timed(() => pool.report(input)));
await pool.close();
const inline: { wall: number; cpu: number }[] = [];
for (let i = 0; i < N; i++) inline.push(await timed(() => renderReportPdf(input)));
const pages = /\/Type \/Pages[^>]*\/Count (\d+)/.exec(Buffer.from(cold.value).toString('latin1'))?.[1] ?? '?';
console.log(`workload: ${circuit.elements.length} elements; report of ${pages} pages, ${cold.value.byteLength} bytes`);
console.log(`work pool (what the endpoint does): cold ${s(cold.wall)} wall (${s(cold.cpu)} CPU); warm median ${s(median(warm.map((w) => w.wall)))} wall (${s(median(warm.map((w) => w.cpu)))} CPU), min ${s(Math.min(...warm.map((w) => w.wall)))}, max ${s(Math.max(...warm.map((w) => w.wall)))}, ${N} runs`);
console.log(`inline on this thread: first ${s(inline[0].wall)} wall (${s(inline[0].cpu)} CPU), median ${s(median(inline.map((w) => w.wall)))} wall (${s(median(inline.map((w) => w.cpu)))} CPU)`);
console.log(`after: ${uptime()}`);
