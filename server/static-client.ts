/** Serves the built client from dist/: its files, and index.html for every other non-API path (the SPA's own routes). */
import path from 'node:path';
import express, { type Express } from 'express';

/** Returns a `mountClient` for createApp that serves `dist`. */
export function serveClient(dist: string): (app: Express) => void {
  return (app) => {
    app.use(express.static(dist, { index: false }));
    // Express 5 path syntax (STACK.md E4): '/{*splat}' also matches '/'.
    app.get('/{*splat}', (_req, res) => {
      res.sendFile(path.join(dist, 'index.html'));
    });
  };
}
