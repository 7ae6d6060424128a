/**
 * What canvas nodes and edges read besides their own data, in two parts:
 * - `CanvasViewContext`: what changes rarely (read-only mode, the wiring-colour standard, comment
 *   pins, the open/close control); every node reads it;
 * - `CanvasValuesContext`: a small store of what changes with every edit or solve (the overlays of
 *   the latest solve, the problems to show beside elements, the wired elements, transformer
 *   shifts). Each node subscribes to its own entries (`useCanvasValue`), so a solve re-renders only
 *   the nodes whose values changed, not the whole diagram.
 * Node data stays plain parameters and custom nodes stay memoised.
 */
import { createContext, useContext, useRef, useSyncExternalStore } from 'react';
import type { CircuitElementInput } from '../../../../shared/engine/index.ts';
import type { DiagramOverlays } from '../results/overlays.ts';
import type { WiringStandard } from '../model/layout.ts';
import type { Conductor } from '../model/types.ts';

export interface CanvasView {
  readOnly: boolean;
  wiringStandard: WiringStandard;
  /** Element id → number of comments pinned to it. */
  pins: Record<string, number>;
  /** Opens or closes one conductor of a wire (null when read-only): the control drawn on the wire calls it. */
  toggleOpen: ((edgeId: string, conductor: Conductor) => void) | null;
}

/** A transformer's stated shift (by its convention) and the measured angle of LV V_AN minus HV V_AN, degrees. */
export interface ShiftReading {
  lvLagsHvDeg?: number;
  convention?: 'iec' | 'northAmerican';
  vectorGroup?: string;
  measuredDeg: number;
}

export interface CanvasValues {
  overlays: DiagramOverlays | null;
  /** True when the overlays belong to an earlier edit (the latest cannot be solved): drawn marked as stale, never as current. */
  stale: boolean;
  /** Canvas node id → messages to show beside it (unwired ports, engine errors naming it). */
  problems: Record<string, string[]>;
  /** Transformer id → its shift reading. */
  shifts: Record<string, ShiftReading>;
  /** Canvas bus node id → its bus name. */
  busNameOf: Record<string, string>;
  /** Element node id → its element (wires read their element's ports here rather than subscribing to the flow store per edge). */
  elementOf: Record<string, CircuitElementInput>;
  /** Element id → the element as wired into the circuit (absent while a port is unwired): labels read the phases and buses here, never from stored node data. */
  wiredOf: Record<string, CircuitElementInput>;
}

export const CanvasViewContext = createContext<CanvasView>({ readOnly: true, wiringStandard: 'north-american', pins: {}, toggleOpen: null });

export function useCanvasView(): CanvasView {
  return useContext(CanvasViewContext);
}

/** A store of canvas values: `set` notifies subscribers, who re-render only when what they select changed. */
export interface CanvasValuesStore {
  get(): CanvasValues;
  set(next: CanvasValues): void;
  subscribe(listener: () => void): () => void;
}

export const EMPTY_CANVAS_VALUES: CanvasValues = { overlays: null, stale: false, problems: {}, shifts: {}, busNameOf: {}, elementOf: {}, wiredOf: {} };

export function createCanvasValuesStore(initial: CanvasValues = EMPTY_CANVAS_VALUES): CanvasValuesStore {
  let values = initial;
  const listeners = new Set<() => void>();
  return {
    get: () => values,
    set(next) {
      if (next === values) return;
      values = next;
      for (const l of [...listeners]) l();
    },
    subscribe(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  };
}

export const CanvasValuesContext = createContext<CanvasValuesStore>(createCanvasValuesStore());

/**
 * One entry of the canvas values. `select` must return something already held in the values (an
 * overlay, an array, a string), never a new object, so an unchanged entry compares equal.
 * `same` (optional): a new entry that it finds equal to the one last returned is not taken (the
 * last one is returned again, and the node does not re-render) — nodes pass one that compares what
 * they show of an overlay, so a solve that moves a value only below the digits shown redraws nothing.
 */
export function useCanvasValue<T>(select: (v: CanvasValues) => T, same?: (a: T, b: T) => boolean): T {
  const store = useContext(CanvasValuesContext);
  const last = useRef<{ value: T } | null>(null);
  const snapshot = () => {
    const next = select(store.get());
    const prev = last.current;
    if (prev && (prev.value === next || (same !== undefined && same(prev.value, next)))) return prev.value;
    last.current = { value: next };
    return next;
  };
  return useSyncExternalStore(store.subscribe, snapshot);
}
