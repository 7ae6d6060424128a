/**
 * The canvas values store: a node re-renders only when the entry it reads changes, so a solve
 * that leaves a node's values as they were costs it no render.
 */
import { act, render } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { CanvasValuesContext, createCanvasValuesStore, EMPTY_CANVAS_VALUES, useCanvasValue, type CanvasValues } from '../../../../../src/features/workspace/canvas/canvas-context.tsx';
import type { BusOverlay, DiagramOverlays, ElementOverlay } from '../../../../../src/features/workspace/results/overlays.ts';
import { BusNodeView, sameBusShown } from '../../../../../src/features/workspace/canvas/bus-node.tsx';
import { sameElementShown } from '../../../../../src/features/workspace/canvas/element-node.tsx';
import { sameWireShown } from '../../../../../src/features/workspace/canvas/wire-edge.tsx';
import { ReactFlowProvider } from '@xyflow/react';

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

  it('with a comparison of what is shown, keeps the entry it has while the digits shown are the same', () => {
    let renders = 0;
    function Node() {
      const ov = useCanvasValue((v) => v.overlays?.buses.A, sameBusShown);
      renders++;
      return <span>{ov ? String(ov.vln.a) : '-'}</span>;
    }
    const store = createCanvasValuesStore({ ...EMPTY_CANVAS_VALUES, overlays: overlays({ A: bus('A', 230.01) }) });
    const view = render(
      <CanvasValuesContext.Provider value={store}>
        <Node />
      </CanvasValuesContext.Provider>,
    );
    expect(renders).toBe(1);
    act(() => store.set({ ...store.get(), overlays: overlays({ A: bus('A', 230.04) }) })); // "230.0 V" both times
    expect(renders).toBe(1);
    expect(view.container.textContent).toBe('230.01');
    act(() => store.set({ ...store.get(), overlays: overlays({ A: bus('A', 230.06) }) })); // "230.1 V"
    expect(renders).toBe(2);
    expect(view.container.textContent).toBe('230.06');
    act(() => store.set({ ...store.get(), overlays: null }));
    expect(view.container.textContent).toBe('-');
  });

  it('draws a bus node the same after a solve that moves its values below the digits shown, and anew when they show', () => {
    const store = createCanvasValuesStore({ ...EMPTY_CANVAS_VALUES, overlays: overlays({ A: { ...bus('A', 119.96), neutralShiftV: 1.2344, neutralShiftPercent: 1 } }) });
    const props = { id: 'bus-A', data: { name: 'A', splitPhase: false }, selected: false } as unknown as Parameters<typeof BusNodeView>[0];
    const view = render(
      <ReactFlowProvider>
        <CanvasValuesContext.Provider value={store}>
          <BusNodeView {...props} />
        </CanvasValuesContext.Provider>
      </ReactFlowProvider>,
    );
    const text = () => view.container.textContent ?? '';
    expect(text()).toContain('120.0 V');
    expect(text()).toContain('N–E 1.234 V');
    act(() => store.set({ ...store.get(), overlays: overlays({ A: { ...bus('A', 119.97), neutralShiftV: 1.2341, neutralShiftPercent: 1 } }) }));
    expect(text()).toContain('120.0 V');
    expect(text()).toContain('N–E 1.234 V');
    act(() => store.set({ ...store.get(), overlays: overlays({ A: { ...bus('A', 119.97), neutralShiftV: 1.2346, neutralShiftPercent: 1 } }) }));
    expect(text()).toContain('N–E 1.235 V');
    act(() => store.set({ ...store.get(), overlays: overlays({ A: { ...bus('A', 120.06), neutralShiftV: 1.2346, neutralShiftPercent: 1 } }) }));
    expect(text()).toContain('120.1 V');
  });

  it('compares of an overlay exactly what each node draws', () => {
    const flag = { code: 'voltage-high', severity: 'warning', bus: 'A', conductor: 'a', message: 'A phase a high' } as BusOverlay['flags'][number];
    expect(sameBusShown(bus('A', 230.01), bus('A', 230.04))).toBe(true);
    expect(sameBusShown(bus('A', 99.9951), bus('A', 100.004))).toBe(false); // "99.995"/"100.0": not alike though close
    expect(sameBusShown(bus('A', 230), { ...bus('A', 230), flags: [flag], worstFlag: flag })).toBe(false);
    expect(sameBusShown(bus('A', 230), { ...bus('A', 230), floating: true })).toBe(false);
    expect(sameBusShown(bus('A', 230), undefined)).toBe(false);
    const el = (amps: number, loading?: number, pu = 1.011): ElementOverlay => ({
      id: 'L1',
      type: 'load',
      direction: 'into-element',
      currents: [{ port: 0, bus: 'A', conductor: 'a', mag: amps, angleDeg: -20 }],
      loadingPercent: loading,
      loadBranches: [{ branch: 'a', fromConductor: 'a', toConductor: 'n', voltage: { re: 120, im: 0, mag: 120.01, angleDeg: 0 }, pu, status: 'ok' } as NonNullable<ElementOverlay['loadBranches']>[number]],
      flags: [],
    });
    const same = sameElementShown('iec-60445');
    expect(same(el(10.01), el(10.04))).toBe(true); // currents are drawn by the wires, not the node
    expect(same(el(10, 50.2), el(10, 50.4))).toBe(true);
    expect(same(el(10, 50.2), el(10, 50.6))).toBe(false);
    expect(same(el(10, undefined, 1.011), el(10, undefined, 1.016))).toBe(false);
    expect(sameWireShown(el(10.01), el(10.04))).toBe(true);
    expect(sameWireShown(el(10.01), el(10.06))).toBe(false);
  });
});
