/** The workspace document's commands, each on its own (pure functions of a document). */
import { describe, expect, it } from 'vitest';
import { convert } from '../../../../../src/features/workspace/model/conversion.ts';
import { PALETTE } from '../../../../../src/features/workspace/model/defaults.ts';
import * as doc from '../../../../../src/features/workspace/model/document.ts';
import { defaultSettings } from '../../../../../src/features/workspace/model/layout.ts';
import { isElementNode, type WorkspaceNode } from '../../../../../src/features/workspace/model/types.ts';
import { elementSummary } from '../../../../../src/features/workspace/canvas/element-node.tsx';

const item = (key: string) => PALETTE.find((p) => p.key === key)!;
const empty: doc.WorkspaceDoc = { nodes: [], edges: [], settings: defaultSettings() };
const vp: doc.Viewport = { view: { x: 0, y: 0, w: 1000, h: 600 }, covered: [{ x: 850, y: 500, w: 150, h: 100 }] };

function overlap(a: doc.Rect, b: doc.Rect) {
  return a.x < b.x + b.w && a.x + a.w > b.x && a.y < b.y + b.h && a.y + a.h > b.y;
}

/** A bus, a source and a single-phase load wired B–N. */
function service(): doc.WorkspaceDoc {
  let d = doc.addItem(empty, item('bus'), vp);
  d = doc.addItem(d, item('source'), vp);
  d = doc.addItem(d, item('singleLoad'), vp);
  d = doc.connect(d, { elementId: 'SRC1', port: 'bus', busNodeId: 'bus:B1', handle: 'all' });
  d = doc.connect(d, { elementId: 'LOAD1', port: 't1', busNodeId: 'bus:B1', handle: 'b' });
  d = doc.connect(d, { elementId: 'LOAD1', port: 't2', busNodeId: 'bus:B1', handle: 'n' });
  return d;
}

describe('workspace document commands', () => {
  it('add: new nodes land in the visible area, apart, never under the minimap', () => {
    let d = empty;
    for (let i = 0; i < 12; i++) d = doc.addItem(d, item(i % 3 === 0 ? 'bus' : 'singleLoad'), vp);
    const boxes = d.nodes.map(doc.footprint);
    for (const b of boxes) {
      expect(b.x).toBeGreaterThanOrEqual(vp.view.x);
      expect(b.y).toBeGreaterThanOrEqual(vp.view.y);
      expect(b.x + b.w).toBeLessThanOrEqual(vp.view.x + vp.view.w);
      expect(b.y + b.h).toBeLessThanOrEqual(vp.view.y + vp.view.h);
      expect(overlap(b, vp.covered[0])).toBe(false);
    }
    for (let i = 0; i < boxes.length; i++) for (let j = i + 1; j < boxes.length; j++) expect(overlap(boxes[i], boxes[j])).toBe(false);
    expect(d.nodes.filter((n) => n.selected).map((n) => n.id)).toEqual([d.nodes[d.nodes.length - 1].id]);
  });

  it('add: with the view full, new nodes still land apart, next to the view (the page pans to them)', () => {
    const small: doc.Viewport = { view: { x: 500, y: 300, w: 300, h: 150 }, covered: [] };
    let d = empty;
    for (let i = 0; i < 5; i++) d = doc.addItem(d, item('capacitorBank'), small);
    const boxes = d.nodes.map(doc.footprint);
    for (let i = 0; i < boxes.length; i++) for (let j = i + 1; j < boxes.length; j++) expect(overlap(boxes[i], boxes[j])).toBe(false);
    for (const b of boxes) expect(Math.hypot(b.x - 650, b.y - 375)).toBeLessThan(1000);
  });

  it('connect: wires a port to a bus; a connection drawn from the bus end resolves the same', () => {
    const d = service();
    expect(d.edges.map((e) => [e.source, e.sourceHandle, e.target, e.targetHandle])).toEqual([
      ['SRC1', 'bus', 'bus:B1', 'all'],
      ['LOAD1', 't1', 'bus:B1', 'b'],
      ['LOAD1', 't2', 'bus:B1', 'n'],
    ]);
    expect(doc.resolveConnection(d, { source: 'bus:B1', sourceHandle: 'c', target: 'LOAD1', targetHandle: 't1' })).toEqual({ elementId: 'LOAD1', port: 't1', busNodeId: 'bus:B1', handle: 'c' });
    // A bundled port cannot land on one conductor.
    expect(doc.resolveConnection(d, { source: 'SRC1', sourceHandle: 'bus', target: 'bus:B1', targetHandle: 'a' })).toBeNull();
  });

  it('labels are derived from the wiring: a new single-phase load wired B–N reads B–N, and C–N after rewiring', () => {
    let d = service();
    const label = (x: doc.WorkspaceDoc, id: string) => {
      const wired = convert(x).wiredOf[id];
      const node = x.nodes.find((n) => n.id === id)!;
      return elementSummary(wired ?? (isElementNode(node) ? node.data.element : (undefined as never)), wired !== undefined);
    };
    expect(label(d, 'LOAD1')).toBe('B–N 1 kW');
    d = doc.connect(d, { elementId: 'LOAD1', port: 't1', busNodeId: 'bus:B1', handle: 'c' });
    expect(label(d, 'LOAD1')).toBe('C–N 1 kW');
    // The stored node data still holds the palette's placeholder: the label never reads it.
    const stored = d.nodes.find((n) => n.id === 'LOAD1')!;
    expect(isElementNode(stored) && stored.data.element.type === 'load' && stored.data.element.between).toEqual(['a', 'n']);
    // Pasted and not yet wired: no phases claimed.
    d = { ...d, nodes: d.nodes.map((n) => ({ ...n, selected: n.id === 'LOAD1' })) };
    d = doc.paste(d, doc.copySelection(d), vp);
    expect(label(d, 'LOAD2')).toBe('single-phase 1 kW');
  });

  it('update: a load turned three-phase loses the wires of its two terminals', () => {
    const d = service();
    const load = d.nodes.find((n) => n.id === 'LOAD1')! as Extract<WorkspaceNode, { type: 'element' }>;
    const next = doc.updateElement(d, 'LOAD1', { ...load.data.element, connection: 'wye', between: undefined } as never);
    expect(next.edges.filter((e) => e.source === 'LOAD1')).toEqual([]);
    expect(next.edges).toHaveLength(1);
  });

  it('open/close a conductor: toggles the neutral of one wire and back, and the circuit gets an open switch', () => {
    const d = doc.toggleOpen(service(), 'SRC1:bus', 'n');
    expect(d.edges.find((e) => e.id === 'SRC1:bus')!.data!.open).toEqual(['n']);
    expect(convert(d).circuit.elements.find((e) => e.type === 'switch3')).toMatchObject({ open: ['n'] });
    expect(doc.toggleOpen(d, 'SRC1:bus', 'n').edges.find((e) => e.id === 'SRC1:bus')!.data!.open).toEqual([]);
  });

  it('delete: removes the selected nodes with their wires', () => {
    const d = service();
    const sel = { ...d, nodes: d.nodes.map((n) => ({ ...n, selected: n.id === 'LOAD1' })) };
    const next = doc.deleteSelection(sel);
    expect(next.nodes.map((n) => n.id)).toEqual(['bus:B1', 'SRC1']);
    expect(next.edges.map((e) => e.id)).toEqual(['SRC1:bus']);
    expect(doc.deleteSelection(next)).toBe(next);
  });

  it('paste: repeated pastes never stack on one spot and stay in view', () => {
    let d = doc.addItem(empty, item('bus'), vp);
    d = doc.addItem(d, item('capacitorBank'), vp);
    const clip = doc.copySelection(d);
    for (let i = 0; i < 6; i++) d = doc.paste(d, clip, vp);
    const caps = d.nodes.filter((n) => n.id.startsWith('CAP'));
    expect(caps.map((n) => n.id)).toEqual(['CAP1', 'CAP2', 'CAP3', 'CAP4', 'CAP5', 'CAP6', 'CAP7']);
    const boxes = caps.map(doc.footprint);
    for (let i = 0; i < boxes.length; i++) for (let j = i + 1; j < boxes.length; j++) expect(overlap(boxes[i], boxes[j])).toBe(false);
    for (const b of boxes) expect(b.x + b.w <= vp.view.w && b.y + b.h <= vp.view.h).toBe(true);
    expect(d.nodes.filter((n) => n.selected).map((n) => n.id)).toEqual(['CAP7']);
  });

  it('paste: a bus and its element keep their wire under fresh names', () => {
    let d = service();
    d = { ...d, nodes: d.nodes.map((n) => ({ ...n, selected: n.id === 'bus:B1' || n.id === 'SRC1' })) };
    d = doc.paste(d, doc.copySelection(d), vp);
    expect(d.edges.find((e) => e.source === 'SRC2')).toMatchObject({ target: 'bus:B2', targetHandle: 'all' });
  });

  it('settings: apply study settings and bus voltages', () => {
    const d = doc.applySettings(service(), { ...defaultSettings(), frequencyHz: 50 }, { 'bus:B1': 0.4 });
    expect(d.settings.frequencyHz).toBe(50);
    expect(d.nodes.find((n) => n.id === 'bus:B1')!.data).toMatchObject({ kvLL: 0.4 });
    expect(convert(d).circuit.frequencyHz).toBe(50);
  });
});
