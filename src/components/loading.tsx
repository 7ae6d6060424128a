/** A quiet loading line with a text alternative. */
export function Loading({ label = 'Loading…' }: { label?: string }) {
  return (
    <p role="status" className="px-1 py-3 text-sm text-ink-muted">
      {label}
    </p>
  );
}
