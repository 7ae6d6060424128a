/**
 * The read-only overlay drawn on the canvas while a case is shown: the case's name and each of its
 * changes in words against the base (the changed elements are outlined on the canvas by the page).
 */
import type { StudyCase } from '../../../../shared/engine/index.ts';
import { overrideRows } from './case-model.ts';

export function CaseOverlay({ c, circuit }: { c: StudyCase; circuit: unknown }) {
  const rows = overrideRows(c, circuit);
  return (
    <aside aria-label="Case shown on the canvas" className="pointer-events-none absolute bottom-2 left-2 z-10 max-w-[55%] rounded-[2px] border border-accent bg-panel/95 px-2 py-1 text-[12px]">
      <p className="font-semibold">
        Case “{c.name && c.name.trim() ? c.name : c.id}” (read-only view)
      </p>
      {rows.length === 0 ? <p className="text-ink-muted">No changes: the same as the base.</p> : null}
      <ul>
        {rows.map((r) => (
          <li key={`${r.changeIndex}:${r.field ?? ''}`}>{r.text}</li>
        ))}
      </ul>
    </aside>
  );
}
