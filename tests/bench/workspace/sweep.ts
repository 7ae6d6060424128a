/**
 * Benchmark (prints figures, asserts nothing): browser sweeps in chromium on a 100-element study
 * (tests/bench/workspace/study-300.ts cut to 100 elements), production build, driven through the
 * workspace's sweep panel as a user would: one load's kW over 1 000 and then 10 000 points, the
 * panel's three default outputs recorded, in the pool of Web Workers (one per logical core the
 * browser reports). Prints, per run, the time from Run to the last point (the panel's own figure),
 * points per second, and the page's frames while it ran: the longest gap between animation frames
 * and how many gaps passed 50 ms, and the page's long tasks (the page's own work over 50 ms, as
 * opposed to frames late because the cores were busy) (an init script keeps a requestAnimationFrame loop; the product
 * code is not touched). A warm-up sweep of 200 points runs first (workers started, code compiled).
 * Targets (issue 10): 1 000 points ≤ 1 s, 10 000 points ≤ 10 s with a frame every ≤ 50 ms.
 * Frame gaps are reported as a distribution (longest, count over 50 ms, p50/p95/p99, buckets) and
 * counted from the Run click until the finished run has been painted.
 * Run: `node --import tsx tests/bench/workspace/sweep.ts` (SWEEP_RUNS=n runs per size, default 2;
 * SWEEP_LATE=1 lists when each late frame happened; every run prints chromium's CPU by kind of thread
 * from /proc (SWEEP_THREADS=1: by thread); SWEEP_TRACE=1 (or =<points>) also prints where
 * the page's main thread spent a 10 000-point run, from a chromium trace: its tasks over 50 ms and,
 * per late frame, how busy the main thread was; SWEEP_TRACE_FILE=<path> writes the
 * trace's events there, SWEEP_TRACE_CATEGORIES=<list> sets the trace categories; SWEEP_CONTAIN=<selector> gives those elements paint
 * containment (experiments); SWEEP_2D=1 sweeps two parameters instead, 100 × 100 points (heat maps); SWEEP_PROFILE=1 the page's JavaScript by function).
 */
import { execSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { cpus } from 'node:os';
import type { Page } from 'playwright-core';
import { startBenchProduct } from './bench-product.ts';
import { study300 } from './study-300.ts';
import { chromiumThreadCpu, threadCpuDelta } from './proc-threads.ts';
import { gapStats, printTrace, type Gap, type GapStats, type TraceEvent } from './sweep-trace.ts';

const RUNS = Number(process.env.SWEEP_RUNS ?? 2);
const uptime = () => execSync('uptime', { encoding: 'utf8' }).trim();


/** Frame gaps while armed, each with the time it ended (a string: tsx's helpers do not exist in the page). */
const FRAMES = `(() => {
  const f = (window.__frames = { armed: false, last: 0, gaps: [], tasks: [] });
  new PerformanceObserver((l) => { if (f.armed) for (const e of l.getEntries()) f.tasks.push(e.duration); }).observe({ type: 'longtask', buffered: false });
  const tick = (t) => { if (f.armed) { if (f.last) f.gaps.push([t, t - f.last]); f.last = t; } requestAnimationFrame(tick); };
  requestAnimationFrame(tick);
})()`;

interface Measured {
  seconds: number;
  gaps: Gap[];
  stats: GapStats;
  tasks: number[];
  /** CPU ms of chromium's threads from the Run click to the end, by thread. */
  threads: [string, number][];
}

/** Chromium's CPU by kind of thread: the page's main thread, the sweep workers, the compositor, raster, the GPU process, the rest. */
function threadSummary(threads: [string, number][]): string {
  const groups: [string, RegExp][] = [
    ['main', /^renderer:\d+ (CrRendererMain|chromium)$/],
    ['sweep workers', /^renderer:\d+ (DedicatedWorker|wyeward-sweep)/],
    ['compositor', /^renderer:\d+ Compositor$/],
    ['raster', /^renderer:\d+ CompositorTile/],
    ['thread pool (V8 GC and compilation, raster)', /^renderer:\d+ ThreadPool/],
    ['GPU process', /^gpu-process:/],
    ['browser', /^browser:/],
  ];
  const sums = groups.map(() => 0);
  let other = 0;
  for (const [k, ms] of threads) {
    const g = groups.findIndex(([, re]) => re.test(k));
    if (g >= 0) sums[g] += ms;
    else other += ms;
  }
  return [...groups.map(([name], i) => `${name} ${sums[i]}`), `other ${other}`].join(', ') + ' ms';
}

/** Runs a sweep of `points` in all (one parameter of that many points, or with SWEEP_2D two of its square root each). */
async function sweep(page: Page, points: number): Promise<Measured> {
  const panel = page.getByRole('region', { name: /^Sweep on the/ });
  if (await panel.getByLabel('Parameter 2 points').count()) {
    const side = Math.round(Math.sqrt(points));
    await panel.getByLabel('Parameter 1 points').fill(String(side));
    await panel.getByLabel('Parameter 2 points').fill(String(points / side));
  } else await panel.getByLabel('Parameter 1 points').fill(String(points));
  const marks = (await page.evaluate(`performance.getEntriesByName('sweep-done').length`)) as number;
  await page.evaluate(`(() => { window.__frames.gaps = []; window.__frames.tasks = []; window.__frames.last = 0; window.__frames.armed = true; })()`);
  const cpu0 = chromiumThreadCpu();
  await panel.getByRole('button', { name: `Run sweep (${points} points)` }).click();
  // while it runs, only a cheap look at the page's marks (a query over the whole page every poll would be work on the page's thread)
  await page.waitForFunction((n) => performance.getEntriesByName('sweep-done').length > n, marks, { timeout: 600_000, polling: 250 });
  const done = `Done: ${points} points in`;
  await page.waitForFunction((d) => Array.from(document.querySelectorAll('[role=status]')).some((s) => (s.textContent ?? '').startsWith(d)), done, { timeout: 60_000, polling: 'raf' });
  // frames are counted until the finished run is on screen (its last commit included), then a little longer
  await page.evaluate(`new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(() => setTimeout(r, 100))))`);
  const { gaps, tasks, start } = (await page.evaluate(
    `(() => { window.__frames.armed = false; const m = performance.getEntriesByName('sweep-start'); return { gaps: window.__frames.gaps, tasks: window.__frames.tasks, start: m.length ? m[m.length - 1].startTime : 0 }; })()`,
  )) as { gaps: [number, number][]; tasks: number[]; start: number };
  const threads = threadCpuDelta(cpu0, chromiumThreadCpu());
  const text = await panel.getByRole('status').first().textContent();
  const seconds = Number(/in ([\d.]+) s/.exec(text ?? '')?.[1]);
  return { seconds, gaps: gaps.map(([t, ms]) => ({ at: t - start, ms })), stats: gapStats(gaps.map((g) => g[1])), tasks, threads };
}

const product = await startBenchProduct('sweep', { initScript: FRAMES });
const { base, page } = product;
try {
  const circuit = study300(100);
  const load = circuit.elements.find((e) => e.type === 'load' && 'each' in e)!;
  const created = await page.evaluate(async (c) => {
    const res = await fetch('/api/studies', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ name: 'Bench: sweep, 100 elements', content: { circuit: c } }) });
    return { status: res.status, body: await res.json() };
  }, circuit);
  if (created.status !== 201) throw new Error(`study not created: ${JSON.stringify(created)}`);
  await page.goto(`${base}/studies/${created.body.id}`);
  const panel = page.getByRole('region', { name: /^Sweep on the/ });
  await panel.waitFor({ timeout: 120_000 });
  await page.getByRole('table', { name: 'Bus voltages' }).waitFor({ timeout: 120_000 });
  // an experiment: paint containment tried on other parts of the workspace (set through the CSSOM: the CSP refuses a style element)
  if (process.env.SWEEP_CONTAIN) await page.evaluate((sel) => document.querySelectorAll<HTMLElement>(sel).forEach((el) => (el.style.contain = 'paint')), process.env.SWEEP_CONTAIN);
  const workers = await page.evaluate(() => Math.max(1, navigator.hardwareConcurrency || 1));
  await panel.getByLabel('Parameter 1 element').selectOption(load.id);
  await panel.getByLabel('Parameter 1 value').selectOption('each.kw');
  const outputs = await panel.locator('input[type=checkbox]:checked').count();
  console.log(`study: ${circuit.elements.length} elements; parameter ${load.id} every phase › P (kW), half to one and a half of its value; ${outputs} outputs recorded; ${workers} workers`);
  console.log(`before: ${uptime()}`);
  await sweep(page, 200);
  if (process.env.SWEEP_2D) {
    // two parameters (a heat map per output): the first load's kW and a second load's, each over 100 points
    const other = circuit.elements.find((e) => e.type === 'load' && 'each' in e && e.id !== load.id)!;
    await panel.getByRole('button', { name: '+ Second parameter (heat map)' }).click();
    await panel.getByLabel('Parameter 2 element').selectOption(other.id);
    await panel.getByLabel('Parameter 2 value').selectOption('each.kw');
    console.log(`two parameters: ${load.id} and ${other.id} every phase › P (kW), 100 × 100 points`);
  }
  if (process.env.SWEEP_TRACE) {
    const cdp = await page.context().newCDPSession(page);
    const events: TraceEvent[] = [];
    cdp.on('Tracing.dataCollected', (e) => void events.push(...(e.value as unknown as TraceEvent[])));
    const finished = new Promise((r) => cdp.once('Tracing.tracingComplete', r));
    await cdp.send('Tracing.start', { categories: process.env.SWEEP_TRACE_CATEGORIES ?? 'toplevel,devtools.timeline,blink.user_timing', transferMode: 'ReportEvents' });
    const m = await sweep(page, Number(process.env.SWEEP_TRACE) > 1 ? Number(process.env.SWEEP_TRACE) : 10000);
    await cdp.send('Tracing.end');
    await finished;
    console.log(`traced run: ${m.seconds.toFixed(2)} s, longest frame gap ${m.stats.max.toFixed(0)} ms, ${m.stats.over50} of ${m.stats.frames} gaps > 50 ms; ${uptime()}`);
    printTrace(events, m.gaps);
    if (process.env.SWEEP_TRACE_FILE) writeFileSync(process.env.SWEEP_TRACE_FILE, JSON.stringify({ events, gaps: m.gaps }));
  }
  if (process.env.SWEEP_PROFILE) {
    const cdp = await page.context().newCDPSession(page);
    await cdp.send('Profiler.enable');
    await cdp.send('Profiler.start');
    await sweep(page, 10000);
    const { profile } = (await cdp.send('Profiler.stop')) as { profile: { nodes: { id: number; callFrame: { functionName: string; url: string; lineNumber: number }; hitCount?: number }[]; samples?: number[]; timeDeltas?: number[] } };
    const self = new Map<string, number>();
    const byId = new Map(profile.nodes.map((n) => [n.id, n]));
    (profile.samples ?? []).forEach((id, i) => {
      const n = byId.get(id)!;
      const k = `${n.callFrame.functionName || '(anon)'} ${n.callFrame.url.split('/').pop()}:${n.callFrame.lineNumber}`;
      self.set(k, (self.get(k) ?? 0) + (profile.timeDeltas?.[i] ?? 0) / 1000);
    });
    for (const [k, ms] of [...self].sort((a, b) => b[1] - a[1]).slice(0, 25)) console.log(`${ms.toFixed(0)} ms  ${k}`);
  }
  const rows: string[] = [];
  const header = [
    '| points | Run → last point | points / s | longest frame gap | gaps > 50 ms | gap p50 / p95 / p99 | gaps ≤ 20, ≤ 33, ≤ 50, ≤ 100, > 100 ms | long tasks on the page (> 50 ms) | load average after (1, 5, 15 min) |',
    '|---:|---:|---:|---:|---:|---:|---|---|---|',
  ];
  for (const n of process.env.SWEEP_2D ? [10000] : [1000, 10000]) {
    for (let r = 0; r < RUNS; r++) {
      const m = await sweep(page, n);
      const s = m.stats;
      const line = `| ${n.toLocaleString('en')} | ${m.seconds.toFixed(2)} s | ${Math.round(n / m.seconds)} | ${s.max.toFixed(0)} ms | ${s.over50} of ${s.frames} | ${s.p50.toFixed(0)} / ${s.p95.toFixed(0)} / ${s.p99.toFixed(0)} ms | ${s.buckets.join(', ')} | ${m.tasks.length}, longest ${Math.max(0, ...m.tasks).toFixed(0)} ms | ${uptime().replace(/.*load average: /, '')} |`;
      rows.push(line);
      console.log(line);
      console.log(`    CPU by thread (/proc, Run to painted): ${threadSummary(m.threads)}`);
      if (process.env.SWEEP_THREADS) for (const [k, ms] of m.threads) console.log(`      ${String(ms).padStart(6)} ms  ${k}`);
      if (process.env.SWEEP_LATE) for (const g of m.gaps.filter((x) => x.ms > 50)) console.log(`    late frame: +${(g.at - g.ms).toFixed(0)}…${g.at.toFixed(0)} ms after Run (${g.ms.toFixed(0)} ms)`);
    }
  }
  console.log('');
  for (const h of header) console.log(h);
  for (const r of rows) console.log(r);
  console.log(`\nmachine: ${cpus().length} cores; after: ${uptime()} (headless chromium, software rendering)`);
} finally {
  await product.close();
}
