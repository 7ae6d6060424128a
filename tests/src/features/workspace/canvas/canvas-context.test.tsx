/**
 * The canvas values store: a node re-renders only when the entry it reads changes, so a solve
 * that leaves a node's values as they were costs it no render.
 */
import { act, render } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { CanvasValuesContext, createCanvasValuesStore, EMPTY_CANVAS_VALUES, useCanvasValue, type CanvasValues } from '../../../../../src/features/workspace/canvas/canvas-context.tsx';
import type { BusOverlay, DiagramOverlays } from '../../../../../src/features/workspace/results/overlays.ts';

const bus = (name: string, v: number): BusOverlay => ({ bus: name, vln: { a: v }, flags: [], floating: false });
const overlays = (buses: Record<string, BusOverlay>): DiagramOverlays => ({ buses, elements: {} });

describe('useCanvasValue', () => {
  it('re-renders a reader only when its own entry changes', () => {
    const renders: Record<string, number> = { A: 0, B: 0 };
    function Reader({ name }: { name: string }) {
      const ov = useCanvasValue((v) => v.overlays?.buses[name]);
      renders[name]++;
      return <span>{`${name}=${ov?.vln.a ?? '-'}`}</span>;
    }
    const a1 = bus('A', 230);
    const store = createCanvasValuesStore({ ...EMPTY_CANVAS_VALUES, overlays: overlays({ A: a1, B: bus('B', 231) }) });
    const view = render(
      <CanvasValuesContext.Provider value={store}>
        <Reader name="A" />
        <Reader name="B" />
      </CanvasValuesContext.Provider>,
    );
    expect(renders).toEqual({ A: 1, B: 1 });
    // a new solve: A's overlay kept (equal values), B's changed
    const next: CanvasValues = { ...store.get(), overlays: overlays({ A: a1, B: bus('B', 229) }) };
    act(() => store.set(next));
    expect(renders).toEqual({ A: 1, B: 2 });
    expect(view.container.textContent).toBe('A=230B=229');
    // the same values object again: nothing at all
    act(() => store.set(next));
    expect(renders).toEqual({ A: 1, B: 2 });
  });
});
