/**
 * Security headers on every response (helmet): a Content-Security-Policy the built app passes
 * (scripts, styles, fonts, workers and fetches only from the app's own origin, no inline script),
 * no framing by any site (frame-ancestors 'none', X-Frame-Options DENY), nosniff, and a
 * Referrer-Policy that sends no path to other sites. In development (vite middleware) the
 * hot-reload client needs inline scripts and a websocket, so the policy allows those there only.
 */
import type { RequestHandler } from 'express';
import helmet from 'helmet';

export function securityHeaders({ dev = false }: { dev?: boolean } = {}): RequestHandler {
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        scriptSrc: dev ? ["'self'", "'unsafe-inline'"] : ["'self'"],
        // Style attributes set by React through the CSSOM are not inline CSS; inline <style> and style="" are.
        // @xyflow/react and the canvas set element styles (positions, transforms) from script: allowed by 'self'.
        styleSrc: dev ? ["'self'", "'unsafe-inline'"] : ["'self'"],
        styleSrcAttr: ["'unsafe-inline'"],
        imgSrc: ["'self'", 'data:'],
        fontSrc: ["'self'", 'data:'],
        connectSrc: dev ? ["'self'", 'ws:', 'wss:'] : ["'self'"],
        workerSrc: ["'self'"],
        objectSrc: ["'none'"],
        baseUri: ["'self'"],
        formAction: ["'self'"],
        frameAncestors: ["'none'"],
      },
    },
    frameguard: { action: 'deny' },
    referrerPolicy: { policy: 'strict-origin-when-cross-origin' },
    strictTransportSecurity: false, // set by the TLS-terminating proxy, which knows whether https is in use
    crossOriginEmbedderPolicy: false,
  });
}
