/**
 * What canvas nodes and edges read besides their own data: read-only mode, the wiring-colour
 * standard, the overlays of the latest solve and the problems to show beside elements. A context,
 * so node data stays plain parameters and custom nodes stay memoised.
 */
import { createContext, useContext } from 'react';
import type { CircuitElementInput } from '../../../../shared/engine/index.ts';
import type { DiagramOverlays } from '../results/overlays.ts';
import type { WiringStandard } from '../model/layout.ts';
import type { Conductor } from '../model/types.ts';

export interface CanvasView {
  readOnly: boolean;
  wiringStandard: WiringStandard;
  overlays: DiagramOverlays | null;
  /** True when the overlays belong to an earlier edit (the latest cannot be solved): drawn marked as stale, never as current. */
  stale: boolean;
  /** Canvas node id → messages to show beside it (unwired ports, engine errors naming it). */
  problems: Record<string, string[]>;
  /** Transformer id → the shift its convention states and the measured angle of LV V_AN minus HV V_AN, degrees. */
  shifts: Record<string, { lvLagsHvDeg?: number; convention?: 'iec' | 'northAmerican'; vectorGroup?: string; measuredDeg: number }>;
  /** Element id → number of comments pinned to it. */
  pins: Record<string, number>;
  /** Canvas node id → bus names whose results belong to it (its own and private terminal buses). */
  busNamesOf: (nodeId: string) => string[];
  /** Element node id → its element (wires read their element's ports here rather than subscribing to the flow store per edge). */
  elementOf: Record<string, CircuitElementInput>;
  /** Element id → the element as wired into the circuit (absent while a port is unwired): labels read the phases and buses here, never from stored node data. */
  wiredOf: Record<string, CircuitElementInput>;
  /** Opens or closes one conductor of a wire (null when read-only): the control drawn on the wire calls it. */
  toggleOpen: ((edgeId: string, conductor: Conductor) => void) | null;
}

export const CanvasViewContext = createContext<CanvasView>({
  readOnly: true,
  wiringStandard: 'north-american',
  overlays: null,
  stale: false,
  problems: {},
  shifts: {},
  pins: {},
  busNamesOf: () => [],
  elementOf: {},
  wiredOf: {},
  toggleOpen: null,
});

export function useCanvasView(): CanvasView {
  return useContext(CanvasViewContext);
}
