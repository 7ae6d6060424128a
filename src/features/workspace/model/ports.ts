/**
 * Ports of each element kind: which element field a port sets, where it sits on the symbol, and
 * whether it is a bundled port (all conductors of a bus in one wire) or one terminal of a
 * two-terminal pair (a single-phase load or a single-phase transformer's primary lands on any two
 * conductors of one bus, each terminal on its own conductor).
 */
import type { CircuitElementInput } from '../../../../shared/engine/index.ts';

export type PortSide = 'top' | 'bottom' | 'left' | 'right';

export interface PortSpec {
  /** Handle id on the element node. */
  id: string;
  /** Element field the port's bus goes into. */
  field: 'bus' | 'from' | 'to' | 'node';
  side: PortSide;
  /** Short label drawn by the handle. */
  label: string;
  /** Bundled (all conductors) or a single conductor of the bus. */
  mode: 'bundle' | 'conductor';
  /** For two-terminal pairs: index in `between` / `primary`. */
  terminal?: 0 | 1;
}

/** The ports of an element, in engine port order. */
export function elementPorts(el: CircuitElementInput): PortSpec[] {
  switch (el.type) {
    case 'source':
    case 'splitPhaseSource':
      return [{ id: 'bus', field: 'bus', side: 'bottom', label: '', mode: 'bundle' }];
    case 'line':
    case 'switch3':
      return [
        { id: 'from', field: 'from', side: 'top', label: '', mode: 'bundle' },
        { id: 'to', field: 'to', side: 'bottom', label: '', mode: 'bundle' },
      ];
    case 'transformer':
      return [
        { id: 'from', field: 'from', side: 'top', label: 'HV', mode: 'bundle' },
        { id: 'to', field: 'to', side: 'bottom', label: 'LV', mode: 'bundle' },
      ];
    case 'splitPhaseTransformer':
      return [
        { id: 'p1', field: 'from', side: 'top', label: 'H1', mode: 'conductor', terminal: 0 },
        { id: 'p2', field: 'from', side: 'top', label: 'H2', mode: 'conductor', terminal: 1 },
        { id: 'to', field: 'to', side: 'bottom', label: 'X', mode: 'bundle' },
      ];
    case 'load':
      if (el.connection === 'single') {
        return [
          { id: 't1', field: 'bus', side: 'top', label: '1', mode: 'conductor', terminal: 0 },
          { id: 't2', field: 'bus', side: 'top', label: '2', mode: 'conductor', terminal: 1 },
        ];
      }
      return [{ id: 'bus', field: 'bus', side: 'top', label: '', mode: 'bundle' }];
    case 'capacitorBank':
    case 'fault':
      return [{ id: 'bus', field: 'bus', side: 'top', label: '', mode: 'bundle' }];
    case 'earthing':
      return [{ id: 'node', field: 'node', side: 'top', label: '', mode: 'conductor' }];
    default:
      // Primitives keep their own node names; the canvas shows them without ports.
      return [];
  }
}

/** Bus handle ids: two bundled handles (top and bottom) and one per conductor. */
export const BUS_BUNDLE_HANDLES = ['all', 'allb'] as const;

/** True when a bus handle id is a bundled handle. */
export function isBundleHandle(handle: string | null | undefined): boolean {
  return handle === 'all' || handle === 'allb' || handle == null;
}
