/** Serves the built client from dist/: its files, and index.html for every other non-API path (the SPA's own routes). */
import path from 'node:path';
import express, { type Express } from 'express';

/** Returns a `mountClient` for createApp that serves `dist`. */
export function serveClient(dist: string): (app: Express) => void {
  return (app) => {
    app.use(express.static(dist, { index: false }));
    // Express 5 path syntax (path-to-regexp 8: a bare '*' is no longer a wildcard): '/{*splat}' also matches '/'.
    app.get('/{*splat}', (_req, res) => {
      res.sendFile(path.join(dist, 'index.html'));
    });
  };
}
