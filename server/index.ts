/** `npm start`: builds the client if dist/ is missing or stale, then one Express process serves the app and /api. */
import path from 'node:path';
import { ensureClientBuild } from './client-build.ts';
import { readConfig } from './config.ts';
import { ROOT, run } from './runtime.ts';
import { serveClient } from './static-client.ts';

const config = readConfig();
await ensureClientBuild(ROOT);
await run(config, serveClient(path.join(ROOT, 'dist')));
