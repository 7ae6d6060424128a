/**
 * Bench page (served by the vite dev server, never built into the product): the results panel on a
 * demo circuit solved live in the real Web Worker, and a worker round-trip measurement on the
 * 300-element study. `?demo=<key>&standard=<iec-60445|north-american>&select=<id>` or `?bench=roundtrip`.
 */
import '@fontsource/ibm-plex-sans/latin-400.css';
import '@fontsource/ibm-plex-sans/latin-600.css';
import '@fontsource/ibm-plex-mono/latin-400.css';
import '../../../src/index.css';

import { createRoot } from 'react-dom/client';
import { demoCircuits } from '../../../shared/engine/index.ts';
import { ResultsPanel } from '../../../src/features/workspace/results/results-panel.tsx';
import type { WiringStandard } from '../../../src/features/workspace/results/phase-style.ts';
import { createWorkerPort } from '../../../src/features/workspace/solve/solve-port.ts';
import type { SolveResponse } from '../../../src/features/workspace/solve/solve-protocol.ts';
import { useLiveSolve } from '../../../src/features/workspace/solve/use-live-solve.ts';
import { editedStudy, study300 } from './study-300.ts';

const q = new URLSearchParams(location.search);
declare global {
  interface Window {
    __bench?: { roundTripMs: number[]; workerMs: number[]; error?: string };
  }
}

function Preview() {
  const demo = demoCircuits.find((d) => d.key === (q.get('demo') ?? 'open-neutral-208y120')) ?? demoCircuits[0];
  const live = useLiveSolve(demo.circuit);
  return (
    <div className="mx-auto max-w-[1100px] p-2">
      <ResultsPanel {...live} selection={q.get('select')} standard={(q.get('standard') as WiringStandard) ?? 'iec-60445'} />
    </div>
  );
}

/** Sequential edits through the real worker: page-side time from post to answer (includes the structured-clone copies). */
async function roundTrip(runs: number) {
  const base = study300();
  let resolve: (r: SolveResponse) => void = () => {};
  const port = createWorkerPort(
    (r) => resolve(r),
    (m) => (window.__bench = { roundTripMs: [], workerMs: [], error: m }),
  );
  const ask = (id: number) =>
    new Promise<{ res: SolveResponse; ms: number }>((ok) => {
      const t0 = performance.now();
      resolve = (res) => ok({ res, ms: performance.now() - t0 });
      port.post({ id, circuit: editedStudy(base, id) });
    });
  const roundTripMs: number[] = [];
  const workerMs: number[] = [];
  for (let i = 0; i < runs + 5; i++) {
    const { res, ms } = await ask(i);
    if (!res.ok) {
      window.__bench = { roundTripMs, workerMs, error: res.error.message };
      return;
    }
    if (i >= 5) {
      roundTripMs.push(ms);
      workerMs.push(res.ms);
    }
  }
  port.terminate();
  window.__bench = { roundTripMs, workerMs };
}

if (q.get('bench') === 'roundtrip') void roundTrip(Number(q.get('runs') ?? 30));
else createRoot(document.getElementById('root')!).render(<Preview />);
