/** `npm run dev`: one process, Express with vite in middleware mode, so the client hot-reloads against the real API. */
import { createServer as createHttpServer } from 'node:http';
import { createServer } from 'vite';
import { readConfig } from './config.ts';
import { ROOT, run } from './runtime.ts';

const config = readConfig();
const server = createHttpServer();
// The hot-reload socket rides on the app's own port, so two dev servers never fight over vite's default HMR port.
const vite = await createServer({
  root: ROOT,
  configFile: `${ROOT}/vite.config.ts`,
  server: { middlewareMode: true, ws: { server } },
  appType: 'spa',
});

await run(config, (app) => app.use(vite.middlewares), { server, dev: true, onClose: () => vite.close() });
