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
 * Run: `node --import tsx tests/bench/workspace/sweep.ts` (SWEEP_RUNS=n runs per size, default 2;
 * SWEEP_TRACE=1 also prints where the page's main thread spent a 10 000-point run, from a
 * chromium trace; SWEEP_PROFILE=1 the page's JavaScript by function).
 */
import { spawn, spawnSync, execSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { cpus, tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type Page } from 'playwright-core';
import { study300 } from './study-300.ts';

const root = path.resolve(import.meta.dirname, '../../..');
const RUNS = Number(process.env.SWEEP_RUNS ?? 2);
const uptime = () => execSync('uptime', { encoding: 'utf8' }).trim();

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const a = srv.address();
      const port = typeof a === 'object' && a ? a.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

/** Frame gaps while armed (a string: tsx's helpers do not exist in the page). */
const FRAMES = `(() => {
  const f = (window.__frames = { armed: false, last: 0, gaps: [], tasks: [] });
  new PerformanceObserver((l) => { if (f.armed) for (const e of l.getEntries()) f.tasks.push(e.duration); }).observe({ type: 'longtask', buffered: false });
  const tick = (t) => { if (f.armed) { if (f.last) f.gaps.push(t - f.last); f.last = t; } requestAnimationFrame(tick); };
  requestAnimationFrame(tick);
})()`;

async function sweep(page: Page, points: number): Promise<{ seconds: number; maxGap: number; over50: number; frames: number; tasks: number[] }> {
  const panel = page.getByRole('region', { name: /^Sweep on the/ });
  await panel.getByLabel('Parameter 1 points').fill(String(points));
  await page.evaluate(`(() => { window.__frames.gaps = []; window.__frames.tasks = []; window.__frames.last = 0; window.__frames.armed = true; })()`);
  await panel.getByRole('button', { name: `Run sweep (${points} points)` }).click();
  const done = `Done: ${points} points in`;
  await page.waitForFunction((d) => Array.from(document.querySelectorAll('[role=status]')).some((s) => (s.textContent ?? '').startsWith(d)), done, { timeout: 600_000, polling: 200 });
  const { gaps, tasks } = (await page.evaluate(`(() => { window.__frames.armed = false; return { gaps: window.__frames.gaps, tasks: window.__frames.tasks }; })()`)) as { gaps: number[]; tasks: number[] };
  const text = await panel.getByRole('status').first().textContent();
  const seconds = Number(/in ([\d.]+) s/.exec(text ?? '')?.[1]);
  return { seconds, maxGap: Math.max(0, ...gaps), over50: gaps.filter((g) => g > 50).length, frames: gaps.length, tasks };
}

const dist = mkdtempSync(path.join(tmpdir(), 'wyeward-sweep-dist-'));
const data = mkdtempSync(path.join(tmpdir(), 'wyeward-sweep-data-'));
const build = spawnSync(process.execPath, [path.join(root, 'node_modules/vite/bin/vite.js'), 'build', '--outDir', dist, '--emptyOutDir', '--logLevel', 'warn'], { cwd: root, encoding: 'utf8' });
if (build.status !== 0) throw new Error(`vite build failed:\n${build.stderr}`);
const port = await freePort();
const server = spawn(process.execPath, ['--import', 'tsx', path.join(import.meta.dirname, 'bench-server.ts')], {
  cwd: root,
  env: { ...process.env, PORT: String(port), DATA_DIR: data, DEMO: '1', NODE_ENV: 'production', WYEWARD_BENCH_DIST: dist, APP_URL: `http://127.0.0.1:${port}` },
  stdio: ['ignore', 'pipe', 'pipe'],
});
let log = '';
server.stdout.on('data', (d) => (log += d));
server.stderr.on('data', (d) => (log += d));
const base = `http://127.0.0.1:${port}`;
const browser = await chromium.launch({
  executablePath: '/usr/bin/chromium',
  headless: true,
  args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
});
try {
  for (let i = 0; ; i++) {
    if (server.exitCode !== null) throw new Error(`server exited:\n${log}`);
    const ok = await fetch(`${base}/api/health`).then((r) => r.ok).catch(() => false);
    if (ok) break;
    if (i > 800) throw new Error(`server did not start:\n${log}`);
    await new Promise((r) => setTimeout(r, 250));
  }
  const page = await browser.newPage({ viewport: { width: 1400, height: 900 } });
  page.on('pageerror', (e) => console.log(`page error: ${e.message}`));
  await page.addInitScript(FRAMES);
  await page.goto(`${base}/sign-in`);
  await page.getByLabel(/e-?mail/i).fill('engineer@wyeward.test');
  await page.getByLabel(/password/i).fill('wyeward-demo');
  await page.getByRole('button', { name: /sign in/i }).click();
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
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
  const workers = await page.evaluate(() => Math.max(1, navigator.hardwareConcurrency || 1));
  await panel.getByLabel('Parameter 1 element').selectOption(load.id);
  await panel.getByLabel('Parameter 1 value').selectOption('each.kw');
  const outputs = await panel.locator('input[type=checkbox]:checked').count();
  console.log(`study: ${circuit.elements.length} elements; parameter ${load.id} every phase › P (kW), half to one and a half of its value; ${outputs} outputs recorded; ${workers} workers`);
  console.log(`before: ${uptime()}`);
  await sweep(page, 200);
  if (process.env.SWEEP_TRACE) {
    const cdp = await page.context().newCDPSession(page);
    const events: { name: string; dur?: number; ph: string; tid: number; pid: number; args?: { name?: string } }[] = [];
    cdp.on('Tracing.dataCollected', (e) => void events.push(...(e.value as unknown as typeof events)));
    const finished = new Promise((r) => cdp.once('Tracing.tracingComplete', r));
    await cdp.send('Tracing.start', { categories: 'devtools.timeline', transferMode: 'ReportEvents' });
    await sweep(page, 10000);
    await cdp.send('Tracing.end');
    await finished;
    const main = (events as { name: string; ph: string; tid: number; pid: number; args?: { name?: string } }[]).find((e) => e.ph === 'M' && e.name === 'thread_name' && e.args?.name === 'CrRendererMain');
    console.log(`trace: ${events.length} events`);
    const sums = new Map<string, number>();
    for (const e of events) if (e.ph === 'X' && e.dur && (!main || (e.tid === main.tid && e.pid === main.pid))) sums.set(e.name, (sums.get(e.name) ?? 0) + e.dur / 1000);
    for (const [k, ms] of [...sums].sort((a, b) => b[1] - a[1]).slice(0, 20)) console.log(`${ms.toFixed(0)} ms  ${k}`);
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
  for (const n of [1000, 10000]) {
    for (let r = 0; r < RUNS; r++) {
      const m = await sweep(page, n);
      const line = `| ${n.toLocaleString('en')} | ${m.seconds.toFixed(2)} s | ${Math.round(n / m.seconds)} | ${m.maxGap.toFixed(0)} ms | ${m.over50} of ${m.frames} | ${m.tasks.length}, longest ${Math.max(0, ...m.tasks).toFixed(0)} ms | ${uptime().replace(/.*load average: /, '')} |`;
      rows.push(line);
      console.log(line);
    }
  }
  console.log('\n| points | Run → last point | points / s | longest frame gap | gaps > 50 ms | long tasks on the page (> 50 ms) | load average after (1, 5, 15 min) |');
  console.log('|---:|---:|---:|---:|---:|---|---|');
  for (const r of rows) console.log(r);
  console.log(`\nmachine: ${cpus().length} cores; after: ${uptime()} (headless chromium, software rendering)`);
} finally {
  await browser.close();
  server.kill('SIGTERM');
  await new Promise((r) => setTimeout(r, 1500));
  rmSync(dist, { recursive: true, force: true });
  rmSync(data, { recursive: true, force: true });
}
