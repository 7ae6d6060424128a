/** `npm run dev`: one process, Express with vite in middleware mode, so the client hot-reloads against the real API. */
import { createServer } from 'vite';
import { readConfig } from './config.ts';
import { ROOT, run } from './runtime.ts';

const config = readConfig();
const vite = await createServer({ root: ROOT, configFile: `${ROOT}/vite.config.ts`, server: { middlewareMode: true }, appType: 'spa' });

await run(
  config,
  (app) => {
    app.use(vite.middlewares);
  },
  () => vite.close(),
);
