/** Where to go after sign-in: only a same-site path, never another origin (open-redirect guard). */
export function safeNext(next: string | null): string {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return '/';
  if (next.startsWith('/sign-in') || next.startsWith('/sign-up')) return '/';
  return next;
}
