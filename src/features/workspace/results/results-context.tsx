/**
 * `WorkspaceResultsContext` (contract 4): the live-solve state and its overlays, for the canvas
 * nodes and edges (neutral-shift badges, currents on connections, flag markers, the engine error
 * beside the element it names) and for the results panel.
 */
import { createContext, useContext, useMemo, type ReactNode } from 'react';
import type { LiveSolveError } from '../solve/solve-protocol.ts';
import type { LiveSolveState } from '../solve/use-live-solve.ts';
import { diagramOverlays, type BusOverlay, type DiagramOverlays, type ElementOverlay } from './overlays.ts';
import type { WiringStandard } from './phase-style.ts';

export interface WorkspaceResults extends LiveSolveState {
  /** Overlays of `result` (null before the first good solve). */
  overlays: DiagramOverlays | null;
  /** Wiring-colour standard of the study, for phase colours. */
  standard: WiringStandard;
}

const EMPTY: WorkspaceResults = { status: 'idle', overlays: null, standard: 'iec-60445' };

export const WorkspaceResultsContext = createContext<WorkspaceResults>(EMPTY);

/** Provides the live-solve state (from `useLiveSolve`) and its overlays to the workspace. */
export function WorkspaceResultsProvider({ solve, standard, children }: { solve: LiveSolveState; standard: WiringStandard; children: ReactNode }) {
  const overlays = useMemo(() => (solve.result ? diagramOverlays(solve.result) : null), [solve.result]);
  const value = useMemo<WorkspaceResults>(() => ({ ...solve, overlays, standard }), [solve, overlays, standard]);
  return <WorkspaceResultsContext.Provider value={value}>{children}</WorkspaceResultsContext.Provider>;
}

/** The whole results state. */
export function useWorkspaceResults(): WorkspaceResults {
  return useContext(WorkspaceResultsContext);
}

/** Overlay of one bus, if solved. */
export function useBusOverlay(bus: string | undefined): BusOverlay | undefined {
  const { overlays } = useWorkspaceResults();
  return bus ? overlays?.buses[bus] : undefined;
}

/** Overlay of one element (canvas node id = engine element id), if solved. */
export function useElementOverlay(id: string | undefined): ElementOverlay | undefined {
  const { overlays } = useWorkspaceResults();
  return id ? overlays?.elements[id] : undefined;
}

/** The current engine error when it names this element (or one of these bus names among its nodes), else undefined. */
export function errorFor(error: LiveSolveError | undefined, id: string): LiveSolveError | undefined {
  if (!error) return undefined;
  if (error.elementIds.includes(id)) return error;
  // Node names are "<bus>.<conductor>": a bus is concerned when one of its nodes is named.
  if (error.nodes.some((n) => n === id || n.startsWith(`${id}.`))) return error;
  return undefined;
}

/** The engine error to show beside an element or bus, if it names it. */
export function useElementError(id: string | undefined): LiveSolveError | undefined {
  const { error, status } = useWorkspaceResults();
  return id && status === 'error' ? errorFor(error, id) : undefined;
}
