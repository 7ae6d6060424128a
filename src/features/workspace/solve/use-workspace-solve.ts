/**
 * Live solve of a workspace document: its circuit (converted only when node data or wires change),
 * the Web Worker solve, the diagram overlays, the problems to write beside nodes (unwired ports,
 * engine errors naming an element or bus), and each bank's stated and measured phase shift.
 */
import { useMemo, useRef } from 'react';
import { applyCase, BASE_CASE_ID, type CircuitInput } from '../../../../shared/engine/index.ts';
import type { ShiftReading } from '../canvas/canvas-context.tsx';
import { convert, json } from '../model/conversion.ts';
import type { WorkspaceDoc } from '../model/document.ts';
import { diagramOverlays, shareOverlays, type DiagramOverlays } from '../results/overlays.ts';
import { useLiveSolve } from './use-live-solve.ts';

/** `caseId`: the study case to solve instead of the base (the circuit returned stays the base, with its cases). */
export function useWorkspaceSolve(doc: WorkspaceDoc, caseId: string = BASE_CASE_ID) {
  const conversion = convert(doc);
  const circuitKey = json(conversion.circuit);
  // eslint-disable-next-line react-hooks/exhaustive-deps -- the key stands for the circuit's content
  const circuit = useMemo(() => conversion.circuit, [circuitKey]);
  const shown = useMemo<{ circuit: CircuitInput | null; error?: string }>(() => {
    if (caseId === BASE_CASE_ID) return { circuit };
    try {
      return { circuit: applyCase(circuit, caseId) };
    } catch (e) {
      return { circuit: null, error: (e as Error).message };
    }
  }, [circuit, caseId]);
  const live = useLiveSolve(shown.circuit && shown.circuit.elements.length > 0 ? shown.circuit : null);
  // Overlays equal to the previous solve's stay the same objects, so only the nodes they changed re-render.
  const lastOverlays = useRef<DiagramOverlays | null>(null);
  const overlays = useMemo(() => (lastOverlays.current = live.result ? shareOverlays(lastOverlays.current, diagramOverlays(live.result)) : null), [live.result]);

  const problems = useMemo(() => {
    const out: Record<string, string[]> = {};
    const add = (id: string, m: string) => (out[id] = [...(out[id] ?? []), m]);
    for (const p of conversion.problems) add(p.nodeId, p.message);
    if (live.status === 'error' && live.error) {
      const targets = new Set<string>();
      for (const id of live.error.elementIds ?? []) {
        const node = conversion.map.elementToNode[id] ?? conversion.map.elementToNode[id.split('/')[0]];
        if (node) targets.add(node);
      }
      for (const n of live.error.nodes ?? []) {
        const bus = conversion.map.busToNode[n.split('.')[0]];
        if (bus) targets.add(bus);
      }
      for (const t of targets) add(t, live.error.message);
    }
    return out;
  }, [conversion, live.status, live.error]);

  const shifts = useMemo(() => {
    const out: Record<string, ShiftReading> = {};
    if (!live.result) return out;
    const byBus = new Map(live.result.buses.map((b) => [b.bus, b] as const));
    for (const el of circuit.elements) {
      if (el.type !== 'transformer') continue;
      const hv = byBus.get(el.from)?.lineToNeutral.a;
      const lv = byBus.get(el.to)?.lineToNeutral.a;
      if (!hv || !lv || hv.mag === 0 || lv.mag === 0) continue;
      const stated = live.result.elements[el.id]?.phaseShift;
      out[el.id] = { measuredDeg: ((((lv.angleDeg - hv.angleDeg + 180) % 360) + 360) % 360) - 180, lvLagsHvDeg: stated?.lvLagsHvDeg, convention: stated?.convention, vectorGroup: stated?.vectorGroup };
    }
    return out;
  }, [live.result, circuit]);

  /** True when the diagram's values belong to an earlier edit that could be solved, not to what is drawn. */
  const stale = live.status === 'error' && !!live.stale;
  return { conversion, circuit, live, overlays, problems, shifts, stale, shownCircuit: shown.circuit, caseError: shown.error };
}
