/** `npm start`: builds the client if dist/ is missing or stale, then one Express process serves the app and /api. */
import path from 'node:path';
import express from 'express';
import { ensureClientBuild } from './client-build.ts';
import { readConfig } from './config.ts';
import { ROOT, run } from './runtime.ts';

const config = readConfig();
await ensureClientBuild(ROOT);
const dist = path.join(ROOT, 'dist');

await run(config, (app) => {
  app.use(express.static(dist, { index: false }));
  // Express 5 path syntax (STACK.md E4): every other path is the single-page app.
  app.get('/{*splat}', (_req, res) => {
    res.sendFile(path.join(dist, 'index.html'));
  });
});
