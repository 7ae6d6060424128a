/**
 * Zod without its `new Function` fast path: the page's Content-Security-Policy forbids eval, and
 * zod's probe for it (run when the first object schema is built) is reported as a CSP violation
 * even though zod catches the failure. Zod reads `globalThis.__zod_globalConfig` when it loads, so
 * this must run before zod: it imports nothing, and is the first import of each Web Worker. The page
 * gets the same setting from public/zod-config.js, a classic script that runs before any module
 * chunk (a module import cannot be ordered before the chunks the bundler splits zod into).
 */
const g = globalThis as { __zod_globalConfig?: Record<string, unknown> };
g.__zod_globalConfig = Object.assign(g.__zod_globalConfig ?? {}, { jitless: true });

export {};
