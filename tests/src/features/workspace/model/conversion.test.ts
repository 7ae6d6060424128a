import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit, type CircuitInput } from '../../../../../shared/engine/index.ts';
import { canvasToCircuit } from '../../../../../src/features/workspace/model/canvas-to-circuit.ts';
import { busNodeId, canvasLayout, circuitToCanvas, wireId } from '../../../../../src/features/workspace/model/circuit-to-canvas.ts';
import { defaultSettings } from '../../../../../src/features/workspace/model/layout.ts';
import type { WorkspaceEdge, WorkspaceNode } from '../../../../../src/features/workspace/model/types.ts';

const settings = defaultSettings();

function bus(name: string, x = 0, y = 0): WorkspaceNode {
  return { id: busNodeId(name), type: 'bus', position: { x, y }, data: { kind: 'bus', name, splitPhase: false } };
}
function element(el: Record<string, unknown>): WorkspaceNode {
  return { id: el.id as string, type: 'element', position: { x: 0, y: 0 }, data: { kind: 'element', element: el as never } };
}
function wire(el: string, port: string, busName: string, handle = 'all', open: string[] = []): WorkspaceEdge {
  return { id: wireId(el, port), type: 'wire', source: el, sourceHandle: port, target: busNodeId(busName), targetHandle: handle, data: { open: open as never } };
}

describe('circuitToCanvas → canvasToCircuit', () => {
  for (const demo of demoCircuits) {
    it(`gives back the same elements for the demo "${demo.key}" and places every node`, () => {
      const canvas = circuitToCanvas(demo.circuit);
      const back = canvasToCircuit(canvas.nodes, canvas.edges, canvas.settings);
      expect(back.problems).toEqual([]);
      expect(back.circuit.elements).toEqual(demo.circuit.elements);
      expect(back.circuit.frequencyHz).toBe(demo.circuit.frequencyHz);
      // auto layout: no two nodes on the same spot
      const spots = new Set(canvas.nodes.map((n) => `${n.position.x},${n.position.y}`));
      expect(spots.size).toBe(canvas.nodes.length);
    });
  }

  it('carries the study cases through the canvas unchanged (a save from the workspace keeps them)', () => {
    const demo = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
    const cases = [{ id: 'repaired', name: 'Neutral repaired', changes: [{ element: 'DROP', set: { open: [] } }] }];
    const canvas = circuitToCanvas({ ...demo, cases } as CircuitInput);
    expect(canvasToCircuit(canvas.nodes, canvas.edges, canvas.settings).circuit.cases).toEqual(cases);
    const none = circuitToCanvas(demo);
    expect(canvasToCircuit(none.nodes, none.edges, none.settings).circuit).not.toHaveProperty('cases');
  });

  it('keeps element ids as canvas node ids and maps bus names to bus nodes', () => {
    const canvas = circuitToCanvas(demoCircuits[0].circuit);
    const ids = canvas.nodes.map((n) => n.id);
    for (const el of demoCircuits[0].circuit.elements) expect(ids).toContain(el.id);
    const { map } = canvasToCircuit(canvas.nodes, canvas.edges, canvas.settings);
    expect(map.busToNode.HOUSE).toBe('bus:HOUSE');
    expect(map.elementToNode.KITCHEN).toBe('KITCHEN');
  });

  it('puts a line’s open conductors on its sending-end wire', () => {
    const canvas = circuitToCanvas(demoCircuits[0].circuit); // DROP has open: ["n"]
    expect(canvas.edges.find((e) => e.id === 'DROP:from')?.data?.open).toEqual(['n']);
    expect(canvas.edges.find((e) => e.id === 'DROP:to')?.data?.open).toEqual([]);
  });

  it('marks split-phase buses from the elements on them and across lines', () => {
    const canvas = circuitToCanvas(demoCircuits[1].circuit);
    const split = Object.fromEntries(canvas.nodes.filter((n) => n.data.kind === 'bus').map((n) => [n.data.kind === 'bus' ? n.data.name : '', n.data.kind === 'bus' && n.data.splitPhase]));
    expect(split).toEqual({ OXF12: false, POLE7: true, BARN: true });
  });

  it('restores stored positions and the open state from a saved layout', () => {
    const canvas = circuitToCanvas(demoCircuits[2].circuit);
    const moved = canvas.nodes.map((n) => (n.id === 'OFFICES' ? { ...n, position: { x: 999, y: 555 } } : n));
    const layout = canvasLayout(moved, canvas.edges, canvas.settings);
    const again = circuitToCanvas(demoCircuits[2].circuit, layout);
    expect(again.nodes.find((n) => n.id === 'OFFICES')?.position).toEqual({ x: 999, y: 555 });
  });
});

describe('canvasToCircuit', () => {
  const nodes: WorkspaceNode[] = [
    bus('SVC'),
    element({ type: 'source', id: 'SRC', bus: '?', kvLL: 0.208 }),
    element({ type: 'load', id: 'L1', bus: '?', connection: 'single', between: ['a', 'n'], each: { kw: 1.5, kvar: 0.2 } }),
    element({ type: 'load', id: 'L2', bus: '?', connection: 'single', between: ['a', 'n'], each: { kw: 4, kvar: 0 } }),
  ];
  const edges: WorkspaceEdge[] = [wire('SRC', 'bus', 'SVC'), wire('L1', 't1', 'SVC', 'a'), wire('L1', 't2', 'SVC', 'n'), wire('L2', 't1', 'SVC', 'b'), wire('L2', 't2', 'SVC', 'c')];

  it('sets a single-phase load’s two conductors from the bus handles its terminals land on', () => {
    const { circuit, problems } = canvasToCircuit(nodes, edges, settings);
    expect(problems).toEqual([]);
    expect(circuit.elements.find((e) => e.id === 'L1')).toMatchObject({ bus: 'SVC', between: ['a', 'n'] });
    expect(circuit.elements.find((e) => e.id === 'L2')).toMatchObject({ bus: 'SVC', between: ['b', 'c'] });
  });

  it('turns an opened neutral on a wire into a switch3 with open ["n"] to a private terminal bus', () => {
    const opened = edges.map((e) => (e.id === 'SRC:bus' ? { ...e, data: { open: ['n' as const] } } : e));
    const { circuit, map } = canvasToCircuit(nodes, opened, settings);
    expect(circuit.elements.find((e) => e.id === 'SRC')).toMatchObject({ bus: 'SRC~bus' });
    expect(circuit.elements.find((e) => e.id === 'SRC~bus~sw')).toEqual({ type: 'switch3', id: 'SRC~bus~sw', from: 'SVC', to: 'SRC~bus', conductors: ['a', 'b', 'c', 'n'], closed: true, open: ['n'] });
    expect(map.busToNode['SRC~bus']).toBe('SRC');
    expect(map.switchToEdge['SRC~bus~sw']).toBe('SRC:bus');
    // and back: the switch folds into the wire again
    const canvas = circuitToCanvas(circuit);
    expect(canvas.nodes.map((n) => n.id).sort()).toEqual(['L1', 'L2', 'SRC', 'bus:SVC']);
    expect(canvas.edges.find((e) => e.id === 'SRC:bus')).toMatchObject({ target: 'bus:SVC', data: { open: ['n'] } });
  });

  it('opens one conductor of a single-phase load through a switch on that conductor pair', () => {
    const opened = edges.map((e) => (e.id === 'L1:t2' ? { ...e, data: { open: ['n' as const] } } : e));
    const { circuit } = canvasToCircuit(nodes, opened, settings);
    expect(circuit.elements.find((e) => e.id === 'L1~bus~sw')).toMatchObject({ from: 'SVC', to: 'L1~bus', conductors: ['a', 'n'], open: ['n'] });
    expect(circuit.elements.find((e) => e.id === 'L1')).toMatchObject({ bus: 'L1~bus', between: ['a', 'n'] });
  });

  it('opens a conductor of a line through the line’s own open list', () => {
    const n2 = [bus('A'), bus('B'), element({ type: 'line', id: 'LN', from: '?', to: '?', length: 1, impedance: { kind: 'perConductor', ohmsPerLength: { a: 1, b: 1, c: 1, n: 1 } } })];
    const e2 = [wire('LN', 'from', 'A', 'allb'), wire('LN', 'to', 'B', 'all', ['n', 'a'])];
    const { circuit } = canvasToCircuit(n2, e2, settings);
    expect(circuit.elements).toEqual([{ type: 'line', id: 'LN', from: 'A', to: 'B', length: 1, impedance: { kind: 'perConductor', ohmsPerLength: { a: 1, b: 1, c: 1, n: 1 } }, open: ['a', 'n'] }]);
  });

  it('leaves an unwired element out and says which port to wire', () => {
    const { circuit, problems } = canvasToCircuit([...nodes, element({ type: 'capacitorBank', id: 'CAP1', bus: '?', kvar: 30 })], edges, settings);
    expect(circuit.elements.map((e) => e.id)).not.toContain('CAP1');
    expect(problems).toEqual([{ nodeId: 'CAP1', message: 'CAP1 is not connected: wire its port to a bus.' }]);
  });

  it('rejects a single-phase load terminal on the bundled port with a plain message', () => {
    const bad = edges.map((e) => (e.id === 'L2:t2' ? { ...e, targetHandle: 'all' } : e));
    const { problems } = canvasToCircuit(nodes, bad, settings);
    expect(problems[0]).toEqual({ nodeId: 'L2', message: 'L2: wire each terminal to one conductor of the bus (A, B, C or N), not to the bundled port.' });
  });

  it('builds an open-neutral service the engine solves with a shifted neutral', () => {
    const n3: WorkspaceNode[] = [
      bus('SVC'),
      element({ type: 'source', id: 'SRC', bus: '?', kvLL: 0.208 }),
      element({ type: 'load', id: 'LA', bus: '?', connection: 'single', between: ['a', 'n'], each: { kw: 1.5, kvar: 0 } }),
      element({ type: 'load', id: 'LB', bus: '?', connection: 'single', between: ['a', 'n'], each: { kw: 4, kvar: 0 } }),
      element({ type: 'load', id: 'LC', bus: '?', connection: 'single', between: ['a', 'n'], each: { kw: 0.6, kvar: 0 } }),
    ];
    const e3 = [wire('SRC', 'bus', 'SVC', 'all', ['n']), wire('LA', 't1', 'SVC', 'a'), wire('LA', 't2', 'SVC', 'n'), wire('LB', 't1', 'SVC', 'b'), wire('LB', 't2', 'SVC', 'n'), wire('LC', 't1', 'SVC', 'c'), wire('LC', 't2', 'SVC', 'n')];
    const { circuit } = canvasToCircuit(n3, e3, settings);
    const closed = canvasToCircuit(n3, e3.map((e) => ({ ...e, data: { open: [] } })), settings).circuit;
    const shift = (c: CircuitInput) => solveCircuit(c).buses.find((b) => b.bus === 'SVC')!.neutralToEarth!.mag;
    // Intact neutral: the load star sits on the earthed source star (0 V). Open: it floats away.
    expect(shift(closed)).toBeLessThan(1e-9);
    expect(shift(circuit)).toBeGreaterThan(10);
  });
});
