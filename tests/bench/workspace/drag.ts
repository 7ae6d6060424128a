/**
 * Benchmark (prints figures): frame times in chromium while a node of the workspace canvas is
 * dragged, on the 300-element study, in a production build. Builds the client into a temporary
 * directory, starts the product on it (bench-server.ts, fresh data, demo accounts), signs in as the
 * demo engineer, creates the study through the API, opens its workspace and drags a bus node for
 * about two seconds while requestAnimationFrame records frame intervals. Also saves a screenshot
 * (test-artifacts/workspace-results/workspace-300.png). Run: `node --import tsx tests/bench/workspace/drag.ts`.
 */
import { mkdirSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import path from 'node:path';
import { startBenchProduct } from './bench-product.ts';
import { study300 } from './study-300.ts';

const root = path.resolve(import.meta.dirname, '../../..');
const shots = path.join(root, 'test-artifacts', 'workspace-results');
const pct = (xs: number[], p: number) => {
  const s = xs.slice().sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))];
};


// DRAG_PROFILE=1: an unminified build and a CPU profile of the drag, to see where frame time goes.
const profile = process.env.DRAG_PROFILE === '1';
const product = await startBenchProduct('drag', { unminified: profile });
const { base, page } = product;
try {
  const created = await page.evaluate(async (circuit) => {
    const res = await fetch('/api/studies', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ name: 'Bench: 300-element feeder', content: { circuit } }) });
    return { status: res.status, body: await res.json() };
  }, study300());
  if (created.status !== 201) throw new Error(`study not created: ${JSON.stringify(created)}`);
  const t0 = Date.now();
  await page.goto(`${base}/studies/${created.body.id}`);
  await page.locator('.react-flow__node').first().waitFor({ timeout: 120_000 });
  const nodes = await page.locator('.react-flow__node').count();
  console.log(`workspace open with ${nodes} canvas nodes after ${((Date.now() - t0) / 1000).toFixed(1)} s`);
  await page.waitForTimeout(1500);
  // Zoom in a little so nodes are big enough to grab (fit view shows all 300 elements tiny).
  await page.locator('.react-flow__pane').hover();
  await page.mouse.wheel(0, -400);
  await page.waitForTimeout(500);
  mkdirSync(shots, { recursive: true });
  await page.screenshot({ path: path.join(shots, 'workspace-300.png') });

  // Drag a bus node well inside the view along a loop while recording frame intervals.
  // Pick a bus node whose bar is really under the pointer (inside the pane, not under the minimap).
  const pick = (await page.evaluate(`(() => {
    for (const el of document.querySelectorAll('.react-flow__node-bus')) {
      const r = el.getBoundingClientRect();
      const x = r.left + r.width * 0.6, y = r.top + r.height * 0.45;
      const hit = document.elementFromPoint(x, y);
      if (hit && el.contains(hit) && !hit.closest('.react-flow__handle')) return { id: el.getAttribute('data-id'), x, y, w: r.width, h: r.height };
    }
    return null;
  })()`)) as { id: string; x: number; y: number; w: number; h: number } | null;
  if (!pick) throw new Error('no bus node is reachable on screen');
  const node = page.locator(`.react-flow__node[data-id="${pick.id}"]`);
  const box = (await node.boundingBox())!;
  const cx = pick.x;
  const cy = pick.y;
  console.log(`dragging ${pick.id} (${pick.w.toFixed(0)}×${pick.h.toFixed(0)} px on screen)`);
  // A string, not a function: tsx's transform adds helpers (__name) that do not exist in the page.
  await page.evaluate(`(() => {
    window.__frames = [];
    window.__stop = false;
    let last = performance.now();
    const tick = (t) => { window.__frames.push(t - last); last = t; if (!window.__stop) requestAnimationFrame(tick); };
    requestAnimationFrame(tick);
  })()`);
  const cdp = profile ? await page.context().newCDPSession(page) : null;
  if (cdp) {
    await cdp.send('Profiler.enable');
    await cdp.send('Profiler.setSamplingInterval', { interval: 500 });
    await cdp.send('Profiler.start');
  }
  await page.mouse.move(cx, cy);
  await page.mouse.down();
  const steps = 120;
  for (let i = 1; i <= steps; i++) {
    const a = (2 * Math.PI * i) / steps;
    await page.mouse.move(cx + (100 * i) / steps + 60 * Math.sin(a), cy + 40 * (1 - Math.cos(a)));
    await page.waitForTimeout(16);
  }
  await page.mouse.up();
  const frames = (await page.evaluate('(() => { window.__stop = true; return window.__frames.slice(1); })()')) as number[];
  if (cdp) {
    const { profile: prof } = (await cdp.send('Profiler.stop')) as { profile: { nodes: { id: number; callFrame: { functionName: string; url: string; lineNumber: number } }[]; samples: number[]; timeDeltas: number[] } };
    const self = new Map<number, number>();
    prof.samples.forEach((id, i) => self.set(id, (self.get(id) ?? 0) + (prof.timeDeltas[i] ?? 0)));
    const byFn = new Map<string, number>();
    for (const n of prof.nodes) {
      const key = `${n.callFrame.functionName || '(anonymous)'} ${n.callFrame.url.split('/').pop()}:${n.callFrame.lineNumber}`;
      byFn.set(key, (byFn.get(key) ?? 0) + (self.get(n.id) ?? 0));
    }
    const total = [...byFn.values()].reduce((a, b) => a + b, 0);
    console.log('CPU profile of the drag, top self time:');
    for (const [k, us] of [...byFn].sort((a, b) => b[1] - a[1]).slice(0, 25)) console.log(`  ${((100 * us) / total).toFixed(1)} %  ${(us / 1000).toFixed(0)} ms  ${k}`);
  }
  const after = (await node.boundingBox())!;
  console.log(`dragged node moved by ${Math.hypot(after.x - box.x, after.y - box.y).toFixed(0)} px (the pointer ends 100 px right of where it started; snap to grid may round)`);
  const long = frames.filter((f) => f > 50).length;
  console.log(
    `drag (${steps} mouse moves): ${frames.length} frames, interval median ${pct(frames, 50).toFixed(1)} ms, p95 ${pct(frames, 95).toFixed(1)} ms, max ${Math.max(...frames).toFixed(1)} ms, ${long} frame(s) over 50 ms`,
  );
  console.log(`machine: ${cpus().length} cores, load average ${loadavg().map((x) => x.toFixed(1)).join(' / ')} (headless, software rendering)`);
} finally {
  await product.close();
}
