import { serialize as v8s } from 'node:v8';
import { radialFeeder } from './tests/bench/feeder.ts';
import { findJsonProblem } from './shared/api/limits.ts';
import { studyFileSchema } from './shared/api/transfer.ts';
const circuit = radialFeeder(2453, 7);
const body = JSON.stringify({ format: 'wyeward-study', version: 1, name: 'x', circuit, layout: { note: 'bench' } });
for (let i = 0; i < 3; i++) {
  const r: string[] = [];
  let t = performance.now();
  const lap = (n: string) => { r.push(`${n} ${(performance.now() - t).toFixed(1)}`); t = performance.now(); };
  const parsed = JSON.parse(body); lap('parse');
  findJsonProblem(parsed); lap('guard');
  const z = studyFileSchema.safeParse(parsed); lap('zod');
  v8s(z.data!.circuit); lap('v8ser');
  const s = JSON.stringify({ circuit: z.data!.circuit, layout: z.data!.layout }); lap('stringify');
  Buffer.from(s); lap('tobuf');
  console.log(r.join(', '));
}
