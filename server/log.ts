/**
 * The server's log: one JSON line per event on stderr (console.error: warnings, errors) or stdout. Values are passed as
 * named fields, never as free text, and every field whose name suggests a secret is redacted, so a
 * password, hash, session id, token or study body cannot reach the log by accident.
 */

const SECRET_KEY = /pass|hash|secret|token|session|cookie|authorization|content|body|params|query/i;

/** Replaces secret-looking fields (recursively) with "[redacted]". */
export function redact(value: unknown, depth = 0): unknown {
  if (depth > 4 || value === null || typeof value !== 'object') return value;
  if (Array.isArray(value)) return value.map((v) => redact(v, depth + 1));
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(value)) out[k] = SECRET_KEY.test(k) ? '[redacted]' : redact(v, depth + 1);
  return out;
}

/** Writes one structured log line. */
export function logEvent(level: 'info' | 'warn' | 'error', fields: Record<string, unknown>): void {
  const line = JSON.stringify({ t: new Date().toISOString(), level, ...(redact(fields) as Record<string, unknown>) });
  if (level === 'info') console.log(line);
  else console.error(line);
}
