/** Seeded generators of hostile input for the fuzz suite: strings, numbers, JSON shapes, ids, file names. */

/** mulberry32: a small seeded PRNG (public-domain algorithm), so every run sends the same requests. */
export function rng(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const int = (n: number) => Math.floor(next() * n);
  const pick = <T>(xs: readonly T[]): T => xs[int(xs.length)];
  const chance = (p: number) => next() < p;
  return { next, int, pick, chance };
}
export type Rng = ReturnType<typeof rng>;

/** A value nested `depth` levels deep, kept as a marker and written out by toJson (JSON.stringify would overflow the stack). */
export class Deep {
  constructor(
    readonly depth: number,
    readonly kind: 'array' | 'object',
  ) {}
  text(): string {
    return this.kind === 'array' ? `${'['.repeat(this.depth)}1${']'.repeat(this.depth)}` : `${'{"a":'.repeat(this.depth)}1${'}'.repeat(this.depth)}`;
  }
}
export function deep(depth: number, kind: 'array' | 'object' = 'array'): Deep {
  return new Deep(depth, kind);
}

/** JSON text of a value that may hold Deep markers. */
export function toJson(v: unknown): string {
  const deeps: Deep[] = [];
  const text = JSON.stringify(v, (_k, x) => (x instanceof Deep ? `__DEEP_${deeps.push(x) - 1}__` : x)) ?? 'null';
  return text.replace(/"__DEEP_(\d+)__"/g, (_m, i: string) => deeps[Number(i)].text());
}

export const HOSTILE_STRINGS = [
  '\u0000',
  'name\u0000with nul',
  '\ud800',
  'lone \udc00 low',
  'x\ud83d',
  'crlf\r\nSet-Cookie: a=b',
  '',
  ' ',
  'a'.repeat(5000),
  'é'.repeat(300),
  "'; drop table users; --",
  '%00',
  '../../etc/passwd',
  '{"a":1}',
  '<script>alert(1)</script>',
  '\u202etxt.exe',
  '🙂'.repeat(100),
  '00000000-0000-0000-0000-000000000000',
  '------------------------------------',
  'not-a-uuid',
  '12345678-1234-1234-1234-1234567890ab\u0000',
];

export const HOSTILE_NUMBERS = [2147483648, 2147483647, -1, 0, 1.5, 1e308, -1e308, Number.MAX_SAFE_INTEGER, 9007199254740993, 1e21];

/** Some hostile value of any JSON type. */
export function hostileValue(r: Rng): unknown {
  switch (r.int(9)) {
    case 0:
    case 1:
    case 2:
      return r.pick(HOSTILE_STRINGS);
    case 3:
      return r.pick(HOSTILE_NUMBERS);
    case 4:
      return r.pick([null, true, false, [], {}]);
    case 5:
      return deep(r.pick([10, 70, 3000, 5000]), r.chance(0.5) ? 'array' : 'object');
    case 6:
      return { [r.pick(HOSTILE_STRINGS)]: r.pick(HOSTILE_STRINGS) };
    case 7:
      return Array.from({ length: r.int(5) }, () => r.pick(HOSTILE_STRINGS));
    default:
      return r.pick(['ok', 1, 'owner', 'approve', 'request']);
  }
}

/** A copy of `v` with one leaf (or the whole value) replaced by a hostile value, sometimes with an extra key. */
export function mutate(r: Rng, v: unknown): unknown {
  if (r.chance(0.08)) return hostileValue(r);
  if (v === null || typeof v !== 'object') return r.chance(0.7) ? hostileValue(r) : v;
  const copy: Record<string, unknown> | unknown[] = Array.isArray(v) ? [...v] : { ...(v as Record<string, unknown>) };
  const keys = Object.keys(copy);
  if (keys.length === 0 || r.chance(0.1)) {
    (copy as Record<string, unknown>)[r.chance(0.5) ? r.pick(HOSTILE_STRINGS) : 'extra'] = hostileValue(r);
    return copy;
  }
  const k = r.pick(keys);
  (copy as Record<string, unknown>)[k] = mutate(r, (copy as Record<string, unknown>)[k]);
  return copy;
}

/** A path segment that is hostile once percent-encoded (lone surrogates cannot be encoded: their UTF-8-like bytes are sent). */
export function hostileSegment(r: Rng, valid: string[]): string {
  if (r.chance(0.4)) return r.pick(valid);
  const s = r.pick([...HOSTILE_STRINGS, '%ED%A0%80', '%C0%80', '%FF', '%']);
  if (s.startsWith('%')) return s;
  try {
    return encodeURIComponent(s).slice(0, 3000) || 'x';
  } catch {
    return '%ED%A0%80';
  }
}

/** A query-string value, percent-encoded (or raw broken escapes). */
export function hostileQueryValue(r: Rng): string {
  const s = r.pick([...HOSTILE_STRINGS, '2147483648', '-5', '1e400', 'NaN', 'true']);
  try {
    return encodeURIComponent(s);
  } catch {
    return '%ED%A0%80';
  }
}
