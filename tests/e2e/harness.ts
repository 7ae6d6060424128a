/**
 * Browser-test harness: starts the real product (`server/index.ts`, the same entry `npm start` uses)
 * on a free port with a fresh data directory and demo mode on, and drives Debian's chromium through
 * playwright-core. Never downloads a browser: /usr/bin/chromium must exist (tests/run.ts installs it).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';

const root = path.resolve(import.meta.dirname, '../..');
export const CHROMIUM = '/usr/bin/chromium';
export const ARTIFACTS = path.join(root, 'test-artifacts');

export interface RunningProduct {
  baseUrl: string;
  dataDir: string;
  /** The server's process id. */
  pid: number;
  stop(): Promise<void>;
  /** Ends the process at once (SIGKILL: no clean shutdown) and waits for it to be gone. */
  kill(): Promise<void>;
}

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

/** Starts the product as `npm start` would, waits for /api/health, and returns its URL. */
export async function startProduct(env: Record<string, string> = {}): Promise<RunningProduct> {
  const port = await freePort();
  const dataDir = mkdtempSync(path.join(tmpdir(), 'wyeward-e2e-'));
  const child: ChildProcess = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    cwd: root,
    // APP_URL is the address the browser opens: state-changing requests must carry it as their Origin.
    env: { ...process.env, PORT: String(port), DATA_DIR: dataDir, DEMO: '1', NODE_ENV: 'production', APP_URL: `http://127.0.0.1:${port}`, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let log = '';
  child.stdout?.on('data', (d) => (log += d));
  child.stderr?.on('data', (d) => (log += d));
  const baseUrl = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 200_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`the product exited with ${child.exitCode} before serving:\n${log}`);
    try {
      const res = await fetch(`${baseUrl}/api/health`);
      if (res.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`the product did not answer /api/health in time:\n${log}`);
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  return {
    baseUrl,
    dataDir,
    pid: child.pid!,
    async kill() {
      if (child.exitCode === null && child.signalCode === null) {
        const exited = new Promise((r) => child.once('exit', r));
        child.kill('SIGKILL');
        await exited;
      }
    },
    async stop() {
      if (child.exitCode === null && child.signalCode === null) {
        const exited = new Promise((r) => child.once('exit', r));
        child.kill('SIGTERM');
        await Promise.race([exited, new Promise((r) => setTimeout(r, 10_000))]);
        if (child.exitCode === null) child.kill('SIGKILL');
      }
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

/** Launches headless Debian chromium with the flags this closed network needs. */
export async function launchBrowser(): Promise<Browser> {
  if (!existsSync(CHROMIUM)) {
    throw new Error(`${CHROMIUM} is missing: install Debian's chromium (npm test does this when run as root)`);
  }
  return chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
}

/** Saves a full-page screenshot under test-artifacts/ for a person to look at. */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(ARTIFACTS, { recursive: true });
  const file = path.join(ARTIFACTS, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

/** Signs in through the sign-in form, as a person would. */
export async function signIn(page: Page, baseUrl: string, email: string, password = 'wyeward-demo'): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel(/e-?mail/i).fill(email);
  await page.getByLabel(/password/i).fill(password);
  await page.getByRole('button', { name: /sign in/i }).click();
}

/**
 * Opens a page, signs in as `email` and imports `study` through the API as that user (refusing
 * anything but 201); errors thrown in the page are collected in `errors` for the test to check.
 */
export async function signInAndImport(browser: Browser, baseUrl: string, email: string, study: unknown, { acceptDownloads = false } = {}) {
  const page = await browser.newPage({ viewport: { width: 1440, height: 1000 }, acceptDownloads });
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(String(e)));
  await signIn(page, baseUrl, email);
  await page.waitForURL(`${baseUrl}/`);
  const imported = await page.evaluate(async (body) => {
    const res = await fetch('/api/studies/import', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
    return { status: res.status, body: await res.json() };
  }, study);
  if (imported.status !== 201) throw new Error(`the study import was refused (${imported.status}): ${JSON.stringify(imported.body)}`);
  return { page, errors, studyId: imported.body.id as string };
}
