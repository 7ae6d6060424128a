/**
 * Helpers of the browser sweep benchmark (tests/bench/workspace/sweep.ts): the frame-gap
 * distribution of a run, and where the page's main thread went during the late frames, from a
 * chromium trace (CDP Tracing, "toplevel" and "devtools.timeline" categories). Prints; asserts nothing.
 */

/** A frame gap: when it ended (ms after the Run click, page clock) and how long it was. */
export interface Gap {
  at: number;
  ms: number;
}

export interface GapStats {
  frames: number;
  over50: number;
  max: number;
  p50: number;
  p95: number;
  p99: number;
  /** Gaps per bucket: ≤ 20, 20–33, 33–50, 50–100, > 100 ms. */
  buckets: number[];
}

const quantile = (sorted: number[], q: number) => (sorted.length ? sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)] : 0);

export function gapStats(gaps: readonly number[]): GapStats {
  const s = [...gaps].sort((a, b) => a - b);
  const edges = [20, 33.4, 50, 100, Infinity];
  const buckets = edges.map(() => 0);
  for (const g of s) buckets[edges.findIndex((e) => g <= e)]++;
  return { frames: s.length, over50: s.filter((g) => g > 50).length, max: s.length ? s[s.length - 1] : 0, p50: quantile(s, 0.5), p95: quantile(s, 0.95), p99: quantile(s, 0.99), buckets };
}

export interface TraceEvent {
  name: string;
  cat?: string;
  ph: string;
  ts: number;
  dur?: number;
  /** Thread (CPU) time, µs: far below dur when the thread waited for a core. */
  tdur?: number;
  tid: number;
  pid: number;
  args?: { name?: string; data?: { functionName?: string; url?: string; lineNumber?: number; type?: string; nodeName?: string } };
}

const words = (e: TraceEvent) => {
  const d = e.args?.data;
  if (e.name === 'FunctionCall' && d) return `FunctionCall ${d.functionName || '(anonymous)'} ${(d.url ?? '').split('/').pop()}:${d.lineNumber ?? ''}`;
  if (e.name === 'EventDispatch' && d?.type) return `EventDispatch ${d.type}`;
  return e.name;
};

/**
 * Prints the main thread's work during a traced run: the top-level tasks over 50 ms (with their
 * largest parts), and for each late frame (gap > 50 ms) how much of the gap the main thread was
 * busy — a late frame with an idle main thread was the page waiting for a core, not doing work.
 */
export function printTrace(events: TraceEvent[], gaps: Gap[], log: (s: string) => void = console.log) {
  const mark = events.find((e) => e.name === 'sweep-start' && (e.ph === 'R' || e.ph === 'I' || e.ph === 'n' || e.ph === 'b'));
  const mains = events.filter((e) => e.ph === 'M' && e.name === 'thread_name' && e.args?.name === 'CrRendererMain');
  const main = mains.find((m) => mark && m.pid === mark.pid) ?? mains[0];
  if (!main || !mark) {
    log(`trace: no main thread or no start mark (${events.length} events)`);
    return;
  }
  const onMain = events.filter((e) => e.tid === main.tid && e.pid === main.pid && e.ph === 'X' && e.dur !== undefined);
  const t0 = mark.ts;
  // from the task the Run click ran in (the mark is made inside it)
  const tasks = onMain.filter((e) => (e.name === 'ThreadControllerImpl::RunTask' || e.name === 'RunTask') && e.ts + (e.dur ?? 0) >= t0).sort((a, b) => a.ts - b.ts);
  // nested RunTask events (a task inside a task) are counted once, by the outer one
  const top: TraceEvent[] = [];
  for (const t of tasks) if (!top.length || t.ts >= top[top.length - 1].ts + (top[top.length - 1].dur ?? 0)) top.push(t);
  const busy = top.reduce((n, t) => n + (t.dur ?? 0), 0) / 1000;
  const cpu = top.reduce((n, t) => n + (t.tdur ?? 0), 0) / 1000;
  const end = top.length ? (top[top.length - 1].ts + (top[top.length - 1].dur ?? 0) - t0) / 1000 : 0;
  log(`trace: main thread busy ${busy.toFixed(0)} ms (of which running on a core ${cpu.toFixed(0)} ms) in ${top.length} tasks over ${end.toFixed(0)} ms after Run`);
  const paints = onMain.filter((e) => e.ts >= t0 && e.name === 'Paint' && e.args?.data && e.args.data.nodeName === '#document');
  log(`  the page painted again ${paints.length} times: ${(paints.reduce((n, e) => n + (e.tdur ?? 0), 0) / 1000).toFixed(0)} ms on a core, ${(paints.reduce((n, e) => n + (e.dur ?? 0), 0) / 1000).toFixed(0)} ms in all`);
  const sums = new Map<string, [number, number]>();
  for (const e of onMain) {
    if (e.ts < t0 || e.name === 'ThreadControllerImpl::RunTask' || e.name === 'RunTask') continue;
    const [cpuMs, allMs] = sums.get(words(e)) ?? [0, 0];
    sums.set(words(e), [cpuMs + (e.tdur ?? 0) / 1000, allMs + (e.dur ?? 0) / 1000]);
  }
  log('  main thread by event (inclusive, ms on a core / in all):');
  for (const [k, [c, a]] of [...sums].sort((x, y) => y[1][0] - x[1][0]).slice(0, 14)) log(`    ${c.toFixed(0).padStart(6)} / ${a.toFixed(0).padStart(6)}  ${k}`);
  // a task's largest parts, each as time on a core / in all (ms)
  const parts = (t: TraceEvent) => {
    const inside = onMain.filter((e) => e !== t && e.ts >= t.ts && e.ts + (e.dur ?? 0) <= t.ts + (t.dur ?? 0) && e.name !== 'ThreadControllerImpl::RunTask' && e.name !== 'RunTask');
    return inside
      .sort((a, b) => (b.tdur ?? b.dur ?? 0) - (a.tdur ?? a.dur ?? 0))
      .slice(0, 6)
      .map((e) => `${words(e)} ${((e.tdur ?? 0) / 1000).toFixed(1)}/${((e.dur ?? 0) / 1000).toFixed(0)}`)
      .join('; ');
  };
  const ms = (t: TraceEvent) => `${((t.tdur ?? 0) / 1000).toFixed(1)} ms on a core, ${((t.dur ?? 0) / 1000).toFixed(0)} ms in all`;
  const long = top.filter((t) => (t.dur ?? 0) > 50_000);
  log(`  main-thread tasks > 50 ms: ${long.length}`);
  for (const t of long) log(`    +${((t.ts - t0) / 1000).toFixed(0)} ms: ${ms(t)} — ${parts(t)}`);
  const heavy = top.filter((t) => (t.tdur ?? 0) > 8_000);
  log(`  main-thread tasks over 8 ms on a core: ${heavy.length}`);
  for (const t of heavy) log(`    +${((t.ts - t0) / 1000).toFixed(0)} ms: ${ms(t)} — ${parts(t)}`);
  const late = gaps.filter((g) => g.ms > 50);
  log(`  late frames (gap > 50 ms): ${late.length}`);
  for (const g of late) {
    const a = t0 + (g.at - g.ms) * 1000;
    const b = t0 + g.at * 1000;
    const over = top.filter((t) => t.ts < b && t.ts + (t.dur ?? 0) > a);
    const busy = over.reduce((n, t) => n + (Math.min(b, t.ts + (t.dur ?? 0)) - Math.max(a, t.ts)) / 1000, 0);
    const big = over.sort((x, y) => (y.dur ?? 0) - (x.dur ?? 0))[0];
    const cpu = over.reduce((n, t) => n + (t.tdur ?? 0) / 1000, 0);
    log(`    +${(g.at - g.ms).toFixed(0)}…${g.at.toFixed(0)} ms (${g.ms.toFixed(0)} ms): main thread busy ${busy.toFixed(0)} ms (its tasks ${cpu.toFixed(1)} ms on a core)${big ? `; largest task ${ms(big)} — ${parts(big)}` : ''}`);
  }
}
