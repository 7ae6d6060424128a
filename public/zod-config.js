// Zod without eval under the app's Content-Security-Policy (see src/lib/zod-csp.ts); runs before the app's modules.
globalThis.__zod_globalConfig = Object.assign(globalThis.__zod_globalConfig || {}, { jitless: true });
