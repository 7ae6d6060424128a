/**
 * @mentions in comment text. A mention is `@token` (letters, digits, `.`, `_`, `-`, `+`) that
 * matches, case-insensitively, a member's e-mail local part, their name without spaces, or their
 * first name when exactly one member has it. Pure TypeScript: the client uses it for previews.
 */

export interface MentionCandidate {
  id: string;
  name: string;
  email: string;
}

const TOKEN_RE = /(^|[^A-Za-z0-9._+-])@([A-Za-z0-9._+-]+)/g;

/** The mention tokens of a text, lower-cased, trailing dots removed ("@idunn." at a sentence end). */
export function mentionTokens(text: string): string[] {
  const out: string[] = [];
  for (const m of text.matchAll(TOKEN_RE)) {
    const t = m[2].replace(/\.+$/, '').toLowerCase();
    if (t) out.push(t);
  }
  return out;
}

/** Members mentioned in `text`, each once, in order of first mention. */
export function findMentions<T extends MentionCandidate>(text: string, members: readonly T[]): T[] {
  const byKey = new Map<string, T>();
  const firstNames = new Map<string, T[]>();
  for (const m of members) {
    byKey.set(m.email.split('@')[0].toLowerCase(), m);
    byKey.set(m.name.replace(/\s+/g, '').toLowerCase(), m);
    const first = m.name.trim().split(/\s+/)[0]?.toLowerCase();
    if (first) firstNames.set(first, [...(firstNames.get(first) ?? []), m]);
  }
  const found: T[] = [];
  for (const t of mentionTokens(text)) {
    const hit = byKey.get(t) ?? (firstNames.get(t)?.length === 1 ? firstNames.get(t)![0] : undefined);
    if (hit && !found.includes(hit)) found.push(hit);
  }
  return found;
}
