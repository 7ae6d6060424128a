/** The palette: one button per building block and a bus ("Add load", "Add source", …); click adds it at the view centre. */
import { memo } from 'react';
import type { PaletteItem } from '../model/defaults.ts';
import { PALETTE } from '../model/defaults.ts';
import { ElementSymbol } from './symbols.tsx';

export const Palette = memo(function Palette({ onAdd }: { onAdd: (item: PaletteItem) => void }) {
  return (
    <nav aria-label="Palette" className="flex w-[148px] shrink-0 flex-col gap-0.5 overflow-y-auto border-r border-rule bg-panel p-1.5 max-md:w-full max-md:flex-row max-md:items-center max-md:overflow-x-auto max-md:overflow-y-hidden max-md:border-r-0 max-md:border-b">
      <h2 className="px-1 pb-1 text-[11px] uppercase tracking-wide text-ink-muted max-md:shrink-0 max-md:pb-0">Add to diagram</h2>
      {PALETTE.map((item) => (
        <button
          key={item.key}
          type="button"
          aria-label={`Add ${item.name.toLowerCase()}`}
          title={item.hint}
          onClick={() => onAdd(item)}
          className="flex items-center gap-1.5 rounded-[3px] px-1 py-0.5 text-left text-[12px] leading-tight text-ink hover:bg-accent-soft max-md:shrink-0 max-md:whitespace-nowrap"
        >
          <svg width={26} height={26} viewBox="0 0 64 64" aria-hidden="true" className="shrink-0 text-ink">
            {item.kind === 'bus' ? <rect x={4} y={28} width={56} height={8} fill="currentColor" /> : <ElementSymbol element={item.sample} />}
          </svg>
          <span>{item.name}</span>
        </button>
      ))}
    </nav>
  );
});
