/**
 * The fit keeps the diagram clear of the minimap in the pane's bottom-right corner: the whole pane
 * when the fitted diagram misses the minimap, else the larger of the areas above and left of it.
 * The pane and the minimap are laid out by hand (jsdom lays out nothing); the flow is at zoom 1
 * with no offset, so screen and flow coordinates agree.
 */
import { describe, expect, it } from 'vitest';
import { MAX_FIT_ZOOM, fitWithLabels } from '../../../../../src/features/workspace/canvas/view-area.ts';

const PANE = { left: 100, top: 50, width: 1000, height: 600 };
const MINIMAP = { width: 150, height: 96, right: 15, bottom: 15 }; // xyflow's bottom-right panel

function rect(x: number, y: number, w: number, h: number): DOMRect {
  return { x, y, left: x, top: y, width: w, height: h, right: x + w, bottom: y + h, toJSON: () => ({}) } as DOMRect;
}

function layout() {
  const container = document.createElement('div');
  const pane = document.createElement('div');
  pane.className = 'react-flow';
  const mm = document.createElement('div');
  mm.className = 'react-flow__minimap';
  pane.appendChild(mm);
  container.appendChild(pane);
  pane.getBoundingClientRect = () => rect(PANE.left, PANE.top, PANE.width, PANE.height);
  const mmRect = rect(PANE.left + PANE.width - MINIMAP.right - MINIMAP.width, PANE.top + PANE.height - MINIMAP.bottom - MINIMAP.height, MINIMAP.width, MINIMAP.height);
  mm.getBoundingClientRect = () => mmRect;
  return { container, mmRect };
}

/** Fits a diagram of `w`×`h` flow units and returns where it lands on the screen and the zoom. */
function fit(w: number, h: number) {
  const { container, mmRect } = layout();
  let call: { x: number; y: number; zoom: number } | undefined;
  const rf = {
    getNodes: () => [{ id: 'n' }],
    getNodesBounds: () => ({ x: 0, y: 0, width: w, height: h }),
    screenToFlowPosition: (p: { x: number; y: number }) => p,
    setCenter: (x: number, y: number, o: { zoom: number }) => {
      call = { x, y, zoom: o.zoom };
      return Promise.resolve(true);
    },
    fitBounds: () => Promise.resolve(true),
  };
  fitWithLabels(rf as never, container, 0);
  if (!call) throw new Error('no fit');
  // setCenter puts flow point (x, y) at the pane's centre.
  const toScreen = (fx: number, fy: number) => ({ x: PANE.left + PANE.width / 2 + (fx - call!.x) * call!.zoom, y: PANE.top + PANE.height / 2 + (fy - call!.y) * call!.zoom });
  const a = toScreen(0, 0);
  const b = toScreen(w, h);
  return { zoom: call.zoom, box: { left: a.x, top: a.y, right: b.x, bottom: b.y }, mm: mmRect };
}

const clear = (box: { left: number; top: number; right: number; bottom: number }, mm: DOMRect) => box.right <= mm.left || box.bottom <= mm.top || box.left >= mm.right || box.top >= mm.bottom;
const inPane = (box: { left: number; top: number; right: number; bottom: number }) =>
  box.left >= PANE.left && box.top >= PANE.top && box.right <= PANE.left + PANE.width && box.bottom <= PANE.top + PANE.height;

describe('fitWithLabels keeps the diagram clear of the minimap', () => {
  it('a wide, low diagram uses the whole pane, centred: it misses the minimap there', () => {
    const { zoom, box, mm } = fit(800, 100);
    // (P) 12 % margin: the pane width over the diagram's
    expect(zoom).toBeCloseTo(PANE.width / (800 * 1.12), 6);
    expect((box.left + box.right) / 2).toBeCloseTo(PANE.left + PANE.width / 2, 6);
    expect((box.top + box.bottom) / 2).toBeCloseTo(PANE.top + PANE.height / 2, 6);
    expect(clear(box, mm)).toBe(true);
  });

  it('a diagram as wide as the pane and as tall fits above the minimap', () => {
    const { zoom, box, mm } = fit(900, 520);
    expect(inPane(box)).toBe(true);
    expect(clear(box, mm)).toBe(true);
    expect(box.bottom).toBeLessThanOrEqual(mm.top);
    expect(zoom).toBeLessThan(PANE.width / (900 * 1.12));
  });

  it('a tall, narrow diagram fits left of the minimap at a larger zoom than above it', () => {
    const { zoom, box, mm } = fit(700, 500);
    expect(inPane(box)).toBe(true);
    expect(clear(box, mm)).toBe(true);
    const aboveZoom = (mm.top - 8 - PANE.top) / (500 * 1.12);
    const wholePane = Math.min(PANE.width / (700 * 1.12), PANE.height / (500 * 1.12));
    expect(zoom).toBeLessThan(wholePane); // centred in the whole pane it would reach the minimap
    expect(zoom).toBeGreaterThan(aboveZoom);
    expect(box.right).toBeLessThanOrEqual(mm.left);
  });

  it('a small diagram is not blown up past the largest fit zoom', () => {
    expect(fit(40, 30).zoom).toBe(MAX_FIT_ZOOM);
  });
});
