/** Security headers (server/security-headers.ts) on API answers and on the served client. */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { closeDb, type Db } from '../../server/db/index.ts';
import { serveClient } from '../../server/static-client.ts';
import { makeApp } from './helpers.ts';
import { openTestDb } from './test-db.ts';

let db: Db;

beforeAll(async () => {
  db = await openTestDb();
});

afterAll(async () => {
  await closeDb(db);
});

function directives(csp: string): Record<string, string> {
  return Object.fromEntries(csp.split(';').map((d) => d.trim().split(/\s+/)).filter((p) => p[0]).map(([k, ...v]) => [k, v.join(' ')]));
}

describe('security headers', () => {
  it('the served page gets a CSP without inline script, no framing, nosniff and a Referrer-Policy', async () => {
    const t = makeApp(db);
    const dist = mkdtempSync(path.join(tmpdir(), 'wyeward-dist-'));
    writeFileSync(path.join(dist, 'index.html'), '<!doctype html><title>x</title><script type="module" src="/assets/app.js"></script>');
    const app = createApp({ db, config: t.config, mailer: t.mailer, objects: t.objects, mountClient: serveClient(dist) });
    const res = await request(app).get('/studies/abc');
    expect(res.status).toBe(200);
    const csp = directives(String(res.headers['content-security-policy']));
    expect(csp['default-src']).toBe("'self'");
    expect(csp['script-src']).toBe("'self'"); // no 'unsafe-inline', no 'unsafe-eval'
    expect(csp['style-src']).toBe("'self'");
    expect(csp['frame-ancestors']).toBe("'none'");
    expect(csp['object-src']).toBe("'none'");
    expect(csp['connect-src']).toBe("'self'");
    expect(res.headers['x-frame-options']).toBe('DENY');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['referrer-policy']).toBe('strict-origin-when-cross-origin');
    expect(res.headers['x-powered-by']).toBeUndefined();
  });

  it('API answers carry them too, with a request id', async () => {
    const t = makeApp(db);
    const res = await request(t.app).get('/api/health');
    expect(res.headers['content-security-policy']).toMatch(/frame-ancestors 'none'/);
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/);
  });

  it('development mode allows the hot-reload client (inline script, websocket) and nothing more', async () => {
    const t = makeApp(db);
    const app = createApp({ db, config: t.config, mailer: t.mailer, objects: t.objects, dev: true });
    const csp = directives(String((await request(app).get('/api/health')).headers['content-security-policy']));
    expect(csp['script-src']).toBe("'self' 'unsafe-inline'");
    expect(csp['connect-src']).toBe("'self' ws: wss:");
    expect(csp['frame-ancestors']).toBe("'none'");
  });
});
