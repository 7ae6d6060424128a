/**
 * Limits every value that enters the API is held to, shared by the server's input boundary and the
 * client's schemas: text the database can store, whole numbers its integer columns hold, JSON no
 * deeper than anything the app writes.
 */
import { z } from 'zod';

/** Largest value of a PostgreSQL `integer` column (2^31 − 1). */
export const INT32_MAX = 2_147_483_647;

/** Deepest JSON accepted anywhere (a study's circuit, layout and settings need about 8 levels). */
export const JSON_MAX_DEPTH = 64;

/** The message for text that cannot be stored: a NUL character or half of a UTF-16 surrogate pair. */
export const BAD_TEXT_MESSAGE = 'Contains a character that cannot be stored (a NUL character or broken Unicode)';

const LONE_SURROGATE = /[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

/** True when `s` holds a NUL character or a lone surrogate (text PostgreSQL refuses). */
export function isBadText(s: string): boolean {
  return s.includes('\u0000') || LONE_SURROGATE.test(s);
}

/** A positive whole number that fits an `integer` column (a version or revision number). */
export function positiveInt32(what = 'Value') {
  return z.number().int(`${what} must be a whole number`).min(1, `${what} must be at least 1`).max(INT32_MAX, `${what} is too large`);
}

/** The same for a query-string parameter. */
export function positiveInt32Query(what = 'Value') {
  return z.coerce.number().int(`${what} must be a whole number`).min(1, `${what} must be at least 1`).max(INT32_MAX, `${what} is too large`);
}

export interface JsonProblem {
  /** Dotted path of the offending value (`content.layout.nodes.3`), `_` for the root. */
  path: string;
  message: string;
}

/**
 * The first problem of a parsed JSON value, or null: text (keys and strings) that cannot be stored,
 * or nesting deeper than `maxDepth`. Iterative, so a hostile 100 000-deep value is measured without
 * exhausting the stack.
 */
export function findJsonProblem(value: unknown, maxDepth = JSON_MAX_DEPTH, root: string[] = []): JsonProblem | null {
  interface Frame {
    v: unknown;
    depth: number;
    key: string | null;
    parent: Frame | null;
  }
  const pathOf = (f: Frame | null, extra?: string): string => {
    const keys: string[] = extra === undefined ? [] : [extra];
    for (let x = f; x && x.key !== null; x = x.parent) keys.push(x.key);
    const full = [...root, ...keys.reverse()];
    return full.length ? full.join('.') : '_';
  };
  const stack: Frame[] = [{ v: value, depth: 0, key: null, parent: null }];
  while (stack.length > 0) {
    const f = stack.pop()!;
    const v = f.v;
    if (typeof v === 'string') {
      if (isBadText(v)) return { path: pathOf(f), message: BAD_TEXT_MESSAGE };
      continue;
    }
    if (typeof v !== 'object' || v === null) continue;
    if (f.depth >= maxDepth) {
      let top = f;
      while (top.parent && top.depth > 3) top = top.parent;
      return { path: pathOf(top), message: `Nested more than ${maxDepth} levels deep` };
    }
    if (Array.isArray(v)) {
      for (let i = 0; i < v.length; i++) stack.push({ v: v[i], depth: f.depth + 1, key: String(i), parent: f });
    } else {
      for (const k in v) {
        if (!Object.prototype.hasOwnProperty.call(v, k)) continue;
        if (isBadText(k)) return { path: pathOf(f), message: BAD_TEXT_MESSAGE };
        stack.push({ v: (v as Record<string, unknown>)[k], depth: f.depth + 1, key: k, parent: f });
      }
    }
  }
  return null;
}

/** zod check for a JSON-shaped value kept verbatim (layout, settings): no deeper than JSON_MAX_DEPTH, storable text. */
export const storableJson = z.unknown().superRefine((v, ctx) => {
  const p = findJsonProblem(v);
  if (p) ctx.addIssue({ code: 'custom', message: p.message, path: p.path === '_' ? [] : p.path.split('.') });
});
