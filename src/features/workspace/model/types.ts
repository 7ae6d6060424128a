/**
 * The canvas's typed node and edge kinds. Node data holds only serialisable parameters (xyflow
 * practice): a bus node holds its name and nominal voltage, an element node holds the engine
 * element it stands for (its bus fields are filled from the wiring by `canvasToCircuit`).
 */
import type { Edge, Node } from '@xyflow/react';
import type { CircuitElementInput } from '../../../../shared/engine/index.ts';

/** A conductor letter: three-phase a, b, c, neutral n; split-phase legs 1, 2. */
export type Conductor = 'a' | 'b' | 'c' | 'n' | '1' | '2';

/** The building blocks the palette offers (engine block types). */
export type BlockType =
  | 'source'
  | 'splitPhaseSource'
  | 'line'
  | 'transformer'
  | 'splitPhaseTransformer'
  | 'load'
  | 'capacitorBank'
  | 'switch3'
  | 'earthing'
  | 'fault';

export const BLOCK_TYPES: readonly BlockType[] = ['source', 'splitPhaseSource', 'line', 'transformer', 'splitPhaseTransformer', 'load', 'capacitorBank', 'switch3', 'earthing', 'fault'];

/** A bus on the canvas. */
export type BusNodeData = {
  kind: 'bus';
  /** Bus name in the circuit (no dots or spaces). */
  name: string;
  /** Nominal line-to-line voltage, kV (split-phase: leg to leg); optional. */
  kvLL?: number;
  /** Split-phase 120/240 V bus with legs 1, 2 and neutral n instead of a, b, c, n. */
  splitPhase: boolean;
  /** Free text shown under the name. */
  label?: string;
};

/** An engine element on the canvas (its id equals the node id). */
export type ElementNodeData = {
  kind: 'element';
  /** The element as the engine reads it; bus fields are rewritten from the wiring. */
  element: CircuitElementInput;
};

export type BusNode = Node<BusNodeData, 'bus'>;
export type ElementNode = Node<ElementNodeData, 'element'>;
export type WorkspaceNode = BusNode | ElementNode;

/** A connection from an element port (source side) to a bus handle (target side). */
export type WireData = {
  /** Conductors opened on this connection alone (e.g. ["n"] for an open neutral). */
  open: Conductor[];
};
export type WorkspaceEdge = Edge<WireData, 'wire'>;

/** True for a bus node. */
export function isBusNode(n: WorkspaceNode): n is BusNode {
  return n.data.kind === 'bus';
}

/** True for an element node. */
export function isElementNode(n: WorkspaceNode): n is ElementNode {
  return n.data.kind === 'element';
}

/** The conductors of a bus. */
export function busConductors(splitPhase: boolean): Conductor[] {
  return splitPhase ? ['1', '2', 'n'] : ['a', 'b', 'c', 'n'];
}
