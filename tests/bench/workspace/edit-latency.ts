/**
 * Benchmark (prints figures, asserts nothing): edit → results painted, in chromium, on every demo
 * study and on the 300-element study, in a production build. Measurement only: the page is
 * instrumented from outside (an init script), the product code is not touched.
 *
 * Per edit of a load's kW (type a value in the properties panel, press Enter), performance marks:
 * - input: the Enter keydown that applies the edit (capture listener on the document);
 * - post: the page hands the solve request to the Web Worker (Worker.prototype.postMessage wrapped);
 * - answer: the worker's answer arrives on the page (a message listener registered before the app's);
 *   the worker's own time for the request (`ms` of the answer: validate, expand, solve, results);
 * - commit: the first DOM mutation after the answer (React's commit of the new results);
 * - paint: a task queued from the next animation frame after that commit (the frame has been painted);
 * - settled: the same after the last DOM mutation the answer caused (tables that follow the diagram
 *   in a later render included); an edit counts once nothing has changed for 300 ms.
 * Prints medians per study of input→post (debounce and React), post→answer (worker round trip:
 * clone in, solve, clone out), of which in the worker, answer→commit, commit→paint and input→paint.
 * Issue 14 targets: input→paint ≤ 50 ms median on every demo study, ≤ 100 ms on a 300-element study.
 * Builds the client into a temporary directory and starts the product on it (bench-server.ts, fresh
 * data, demo accounts), like drag.ts. Run: `node --import tsx tests/bench/workspace/edit-latency.ts`
 * (EDIT_RUNS=n edits per study, default 15; EDIT_STUDIES=<regex> picks studies by name; EDIT_PROFILE=1 prints
 * a CPU profile and a timeline of the main thread per study; EDIT_CPU=1 the main thread's CPU time
 * from input to paint per edit, from a light trace; with EDIT_PROFILE=1 and EDIT_TRACE=<path prefix> also
 * writes each study's trace as <prefix>-<study>.json).
 */
import { writeFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import type { Page } from 'playwright-core';
import { startBenchProduct } from './bench-product.ts';
import { study300 } from './study-300.ts';

const RUNS = Number(process.env.EDIT_RUNS ?? 15);
/** EDIT_STUDIES=<regex>: only the studies whose name matches. */
const ONLY = process.env.EDIT_STUDIES ? new RegExp(process.env.EDIT_STUDIES, 'i') : null;
/**
 * EDIT_PROFILE=1: a CPU profile of the page's main thread over each study's edits (unminified
 * build), printed as the functions with the most self time, and a timeline trace summed by event
 * (script, style, layout, paint).
 */
const PROFILE = process.env.EDIT_PROFILE === '1';
/**
 * EDIT_CPU=1: a light trace (top-level tasks only) of each study's edits, and per edit the CPU time of
 * the page's main thread from input to paint (thread time of its tasks, so waiting for a core on a
 * loaded machine is not counted) — a figure to compare code before and after when the load varies.
 */
const CPU = process.env.EDIT_CPU === '1' && !PROFILE;
const median = (xs: number[]) => {
  const s = xs.filter((x) => Number.isFinite(x)).sort((a, b) => a - b);
  if (s.length === 0) return NaN;
  return s.length % 2 ? s[(s.length - 1) >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};


/** The page-side instrumentation (a string: tsx's helpers do not exist in the page). */
const INSTRUMENT = `(() => {
  const lat = (window.__lat = { marks: {}, workerMs: NaN, armed: false });
  const mark = (k) => { if (lat.armed && lat.marks[k] === undefined) { lat.marks[k] = performance.now(); performance.mark('lat-' + k); } };
  document.addEventListener('keydown', (e) => { if (e.key === 'Enter' && lat.armed) mark('input'); }, true);
  const post = Worker.prototype.postMessage;
  Worker.prototype.postMessage = function (...args) { if (lat.marks.input !== undefined) mark('post'); return post.apply(this, args); };
  const W = window.Worker;
  window.Worker = class extends W {
    constructor(...args) {
      super(...args);
      this.addEventListener('message', (e) => {
        if (lat.marks.post === undefined || lat.marks.answer !== undefined) return;
        mark('answer');
        lat.workerMs = e.data && typeof e.data.ms === 'number' ? e.data.ms : NaN;
      });
    }
  };
  lat.seq = 0;
  lat.lastMutation = NaN;
  new MutationObserver(() => {
    if (!lat.armed || lat.marks.answer === undefined) return;
    if (lat.marks.commit === undefined) {
      mark('commit');
      requestAnimationFrame(() => setTimeout(() => mark('paint'), 0));
    }
    // settled: the frame after the last mutation the answer caused (tables rendered after the diagram)
    lat.lastMutation = performance.now();
    const seq = ++lat.seq;
    requestAnimationFrame(() => setTimeout(() => { if (seq === lat.seq) { lat.marks.settled = performance.now(); performance.mark('lat-settled'); } }, 0));
  }).observe(document, { subtree: true, childList: true, characterData: true, attributes: true });
})()`;

interface EditFigures {
  study: string;
  elements: number;
  load: string;
  inputToPost: number[];
  roundTrip: number[];
  inWorker: number[];
  answerToCommit: number[];
  commitToPaint: number[];
  total: number[];
  /** Input → the frame after the last change the answer made (every table updated). */
  settled: number[];
  /** EDIT_CPU=1: CPU time of the page's main thread from input to paint, per edit. */
  mainCpu?: number[];
}

/** Per edit (lat-input → lat-paint), the thread time of the main thread's top-level tasks that start in that window, ms. */
function mainThreadCpu(events: TraceEvent[]): number[] {
  const marks = events.filter((e) => e.name === 'lat-input' || e.name === 'lat-paint').sort((a, b) => a.ts - b.ts);
  if (marks.length === 0) return [];
  // The page's main thread is the one the marks are made on.
  const main = `${marks[0].pid}:${marks[0].tid}`;
  const isTask = (e: TraceEvent) => e.ph === 'X' && (e.name === 'ThreadControllerImpl::RunTask' || e.name === 'RunTask') && `${e.pid}:${e.tid}` === main;
  const tasks = events.filter(isTask).sort((a, b) => a.ts - b.ts);
  const out: number[] = [];
  for (let i = 0; i < marks.length; i++) {
    if (marks[i].name !== 'lat-input') continue;
    const end = marks.slice(i + 1).find((m) => m.name === 'lat-paint' || m.name === 'lat-input');
    if (!end || end.name !== 'lat-paint') continue;
    let cpu = 0;
    let until = -Infinity; // tasks nested in one already counted are skipped
    // The task the input mark falls in started just before it: tasks are taken from 1 ms before the mark.
    for (const e of tasks) {
      if (e.ts < marks[i].ts - 1000 || e.ts >= end.ts || e.ts < until) continue;
      cpu += (e.tdur ?? e.dur ?? 0) / 1000;
      until = e.ts + (e.dur ?? 0);
    }
    out.push(cpu);
  }
  return out;
}

/** Open a study, pick a load with a kW field, apply RUNS edits and collect the marks. */
async function measureStudy(page: Page, base: string, id: string, name: string): Promise<EditFigures | string> {
  const detail = await page.evaluate(async (sid) => (await fetch(`/api/studies/${sid}`)).json(), id);
  const elements: { type: string; id: string; each?: object; phases?: Record<string, object>; total?: object }[] = detail?.content?.circuit?.elements ?? detail?.study?.content?.circuit?.elements ?? [];
  const hasKw = (e: (typeof elements)[number]) => e.type === 'load' && JSON.stringify(e.each ?? e.phases ?? e.total ?? {}).includes('"kw"');
  const loads = elements.filter(hasKw);
  if (loads.length === 0) return `${name}: no load given in kW`;
  await page.goto(`${base}/studies/${id}`);
  await page.locator('.react-flow__node').first().waitFor({ timeout: 120_000 });
  await page.waitForTimeout(1500);
  let form = null;
  let chosen = '';
  for (const l of loads) {
    const node = page.locator(`.react-flow__node[data-id="${l.id}"]`);
    if ((await node.count()) === 0) continue;
    await node.first().click({ force: true });
    const f = page.locator(`form[aria-label="Properties of ${l.id}"]`);
    try {
      await f.waitFor({ timeout: 5000 });
    } catch {
      continue;
    }
    form = f;
    chosen = l.id;
    break;
  }
  if (!form) return `${name}: no load could be selected on the canvas`;
  const label = form.locator('label', { hasText: '(kW)' }).first();
  const inputId = await label.getAttribute('for');
  if (!inputId) return `${name}: no kW field`;
  const input = page.locator(`[id="${inputId}"]`);
  const start = Number((await input.inputValue()).replace(/[^\d.eE+-]/g, '')) || 1;
  const cdp = PROFILE || CPU ? await page.context().newCDPSession(page) : null;
  const traceEvents: TraceEvent[] = [];
  if (cdp && CPU) {
    cdp.on('Tracing.dataCollected', (e) => void traceEvents.push(...(e.value as unknown as TraceEvent[])));
    await cdp.send('Tracing.start', { categories: 'toplevel,blink.user_timing', transferMode: 'ReportEvents' });
  } else if (cdp) {
    await cdp.send('Profiler.enable');
    await cdp.send('Profiler.setSamplingInterval', { interval: 200 });
    await cdp.send('Profiler.start');
    cdp.on('Tracing.dataCollected', (e) => void traceEvents.push(...(e.value as unknown as TraceEvent[])));
    await cdp.send('Tracing.start', { categories: 'devtools.timeline,disabled-by-default-devtools.timeline,blink.user_timing', transferMode: 'ReportEvents' });
  }
  const out: EditFigures = { study: name, elements: elements.length, load: chosen, inputToPost: [], roundTrip: [], inWorker: [], answerToCommit: [], commitToPaint: [], total: [], settled: [] };
  for (let r = 0; r < RUNS; r++) {
    await page.evaluate(`(() => { window.__lat.marks = {}; window.__lat.workerMs = NaN; window.__lat.armed = false; })()`);
    await input.fill(String(+(start * (r % 2 ? 1 : 1.1 + 0.01 * r)).toPrecision(6)));
    await page.evaluate(`(() => { window.__lat.armed = true; })()`);
    await input.press('Enter');
    // Polled by a promise evaluated through the DevTools protocol: waitForFunction compiles its
    // predicate inside the page, which the product's CSP (no 'unsafe-eval') refuses now and then.
    const painted = await page.evaluate(`new Promise((resolve) => {
      const t0 = performance.now();
      // painted, then settled: no mutation for 300 ms after the last one's frame (at most 20 s in all)
      const done = () => { const l = window.__lat; return l.marks.paint !== undefined && l.marks.settled !== undefined && l.marks.settled >= l.lastMutation && performance.now() - l.lastMutation > 300; };
      const poll = () => done() ? resolve(true) : performance.now() - t0 > 20000 ? resolve(false) : setTimeout(poll, 5);
      poll();
    })`);
    if (!painted) {
      const m = await page.evaluate(`window.__lat.marks`);
      console.log(`  ${name}: edit ${r + 1} did not reach a paint within 20 s (marks ${JSON.stringify(m)})`);
      continue;
    }
    const { marks: m, workerMs } = (await page.evaluate(`({ marks: window.__lat.marks, workerMs: window.__lat.workerMs })`)) as { marks: Record<string, number>; workerMs: number };
    out.inputToPost.push(m.post - m.input);
    out.roundTrip.push(m.answer - m.post);
    out.inWorker.push(workerMs);
    out.answerToCommit.push(m.commit - m.answer);
    out.commitToPaint.push(m.paint - m.commit);
    out.total.push(m.paint - m.input);
    out.settled.push(m.settled - m.input);
    await page.waitForTimeout(100);
  }
  if (cdp && CPU) {
    const done = new Promise<void>((resolve) => cdp.once('Tracing.tracingComplete', () => resolve()));
    await cdp.send('Tracing.end');
    await done;
    out.mainCpu = mainThreadCpu(traceEvents);
    await cdp.detach();
  } else if (cdp) {
    const { profile } = (await cdp.send('Profiler.stop')) as { profile: CpuProfile };
    const done = new Promise<void>((resolve) => cdp.once('Tracing.tracingComplete', () => resolve()));
    await cdp.send('Tracing.end');
    await done;
    printProfile(name, profile, traceEvents, out.total.length);
    if (process.env.EDIT_TRACE) {
      const file = `${process.env.EDIT_TRACE}-${name.replace(/[^A-Za-z0-9]+/g, '-').slice(0, 40)}.json`;
      writeFileSync(file, JSON.stringify({ traceEvents }));
      console.log(`trace written to ${file} (open it in chrome://tracing or the Performance panel)`);
    }
    await cdp.detach();
  }
  return out;
}

interface CpuProfile {
  nodes: { id: number; callFrame: { functionName: string; url: string; lineNumber: number }; children?: number[] }[];
  startTime: number;
  samples: number[];
  timeDeltas: number[];
}
interface TraceEvent {
  name: string;
  ph: string;
  dur?: number;
  /** Thread (CPU) time, µs. */
  tdur?: number;
  ts: number;
  tid: number;
  pid: number;
  args?: { data?: { frame?: string } };
}

/** Self time per function (ms per edit) and main-thread timeline events by name. */
function printProfile(study: string, profile: CpuProfile, allEvents: TraceEvent[], edits: number): void {
  // Only what happens between an edit's input and its settled mark (user-timing marks in the trace;
  // the CPU profile and the trace share the clock): typing the value and the waits are left out.
  const windows: [number, number][] = [];
  for (const e of [...allEvents].filter((x) => x.name.startsWith('lat-')).sort((a, b) => a.ts - b.ts)) {
    if (e.name === 'lat-input') windows.push([e.ts, e.ts]);
    else if (e.name === 'lat-settled' && windows.length > 0) windows[windows.length - 1][1] = e.ts;
  }
  const inWindow = (t: number) => windows.some(([a, b]) => t >= a && t <= b);
  const events = allEvents.filter((e) => inWindow(e.ts));
  const sampleTimes: number[] = [];
  let clock = profile.startTime;
  for (const d of profile.timeDeltas) sampleTimes.push((clock += d));
  const keep = profile.samples.map((_, i) => inWindow(sampleTimes[i]));
  profile = { ...profile, samples: profile.samples.map((id, i) => (keep[i] ? id : -1)) };
  const byId = new Map(profile.nodes.map((n) => [n.id, n] as const));
  const self = new Map<string, number>();
  profile.samples.forEach((id, i) => {
    const n = byId.get(id);
    if (!n) return;
    const f = n.callFrame;
    const key = `${f.functionName || '(anonymous)'} ${f.url.split('/').pop()}:${f.lineNumber + 1}`;
    self.set(key, (self.get(key) ?? 0) + (profile.timeDeltas[i] ?? 0) / 1000);
  });
  // Total (inclusive) time of the page's own functions: each sample counts once per function on its stack.
  const parent = new Map<number, number>();
  for (const n of profile.nodes) for (const c of n.children ?? []) parent.set(c, n.id);
  const total = new Map<string, number>();
  profile.samples.forEach((id, i) => {
    const seen = new Set<string>();
    for (let cur: number | undefined = id; cur !== undefined; cur = parent.get(cur)) {
      const f = byId.get(cur)?.callFrame;
      if (!f || !/study-workspace|index-|\.js/.test(f.url) || !f.functionName) continue;
      const key = `${f.functionName} ${f.url.split('/').pop()}:${f.lineNumber + 1}`;
      if (seen.has(key)) continue;
      seen.add(key);
      total.set(key, (total.get(key) ?? 0) + (profile.timeDeltas[i] ?? 0) / 1000);
    }
  });
  const per = Math.max(1, edits);
  console.log(`\nprofile of ${study} (${edits} edits; ms per edit, total time of the page's functions):`);
  for (const [k, ms] of [...total].sort((a, b) => b[1] - a[1]).slice(0, 60)) console.log(`  ${(ms / per).toFixed(2).padStart(8)}  ${k}`);
  console.log(`\nprofile of ${study} (${edits} edits; ms per edit, self time):`);
  for (const [k, ms] of [...self].filter(([k]) => !k.startsWith('(idle)') && !k.startsWith('(program)')).sort((a, b) => b[1] - a[1]).slice(0, 30)) console.log(`  ${(ms / per).toFixed(2).padStart(8)}  ${k}`);
  // The renderer main thread: the thread with the most RunTask time in the renderer process.
  const busy = new Map<string, number>();
  for (const e of events) if (e.ph === 'X' && e.name === 'RunTask' && e.dur) busy.set(`${e.pid}:${e.tid}`, (busy.get(`${e.pid}:${e.tid}`) ?? 0) + e.dur);
  const main = [...busy].sort((a, b) => b[1] - a[1])[0]?.[0];
  const sums = new Map<string, number>();
  for (const e of events) if (e.ph === 'X' && e.dur && `${e.pid}:${e.tid}` === main) sums.set(e.name, (sums.get(e.name) ?? 0) + e.dur / 1000);
  console.log(`timeline of the main thread (ms per edit, inclusive):`);
  for (const [k, ms] of [...sums].sort((a, b) => b[1] - a[1]).slice(0, 18)) console.log(`  ${(ms / per).toFixed(2).padStart(8)}  ${k}`);
}

const product = await startBenchProduct('edit', { unminified: PROFILE, initScript: INSTRUMENT });
const { base, page } = product;
try {
  const created = await page.evaluate(async (circuit) => {
    const res = await fetch('/api/studies', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ name: 'Bench: 300-element feeder', content: { circuit } }) });
    return { status: res.status, body: await res.json() };
  }, study300());
  if (created.status !== 201) throw new Error(`study not created: ${JSON.stringify(created)}`);
  const list = await page.evaluate(async () => (await fetch('/api/studies?pageSize=50')).json());
  const items: { id: string; name: string }[] = list.items ?? list.studies ?? list;
  const results: EditFigures[] = [];
  for (const s of items) {
    if (ONLY && !ONLY.test(s.name)) continue;
    const r = await measureStudy(page, base, s.id, s.name);
    if (typeof r === 'string') console.log(`skipped ${r}`);
    else {
      results.push(r);
      console.log(`measured ${r.study} (${r.elements} elements, load ${r.load}): input→paint median ${median(r.total).toFixed(1)} ms over ${r.total.length} edits`);
    }
  }
  const f = (xs: number[]) => median(xs).toFixed(1);
  console.log('\n| study | elements | edits | input→post | post→answer | of which in the worker | answer→commit | commit→paint | input→paint (median) | target | input→settled (median) |');
  console.log('|---|---:|---:|---:|---:|---:|---:|---:|---:|---|---:|');
  for (const r of results) console.log(`| ${r.study} | ${r.elements} | ${r.total.length} | ${f(r.inputToPost)} ms | ${f(r.roundTrip)} ms | ${f(r.inWorker)} ms | ${f(r.answerToCommit)} ms | ${f(r.commitToPaint)} ms | ${f(r.total)} ms | ${r.elements >= 250 ? '≤ 100 ms' : '≤ 50 ms'} | ${f(r.settled)} ms |`);
  if (CPU) {
    console.log('\n| study | edits traced | main-thread CPU, input → paint (median) | min | max |');
    console.log('|---|---:|---:|---:|---:|');
    for (const r of results) if (r.mainCpu) console.log(`| ${r.study} | ${r.mainCpu.length} | ${f(r.mainCpu)} ms | ${Math.min(...r.mainCpu).toFixed(1)} ms | ${Math.max(...r.mainCpu).toFixed(1)} ms |`);
  }
  console.log(`\nmachine: ${cpus().length} cores, load average ${loadavg().map((x) => x.toFixed(1)).join(' / ')} (headless chromium, software rendering)`);
} finally {
  await product.close();
}
