/**
 * The product server for the drag benchmark: exactly `npm start` (server/index.ts) except that it
 * serves a client build from WYEWARD_BENCH_DIST, so the benchmark never rebuilds the shared dist/.
 */
import { readConfig } from '../../../server/config.ts';
import { run } from '../../../server/runtime.ts';
import { serveClient } from '../../../server/static-client.ts';

const dist = process.env.WYEWARD_BENCH_DIST;
if (!dist) throw new Error('WYEWARD_BENCH_DIST must name a client build directory');
await run(readConfig(), serveClient(dist));
