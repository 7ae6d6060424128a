/**
 * The study workspace, as layout: palette, canvas, properties, live results. The document (nodes,
 * wires, settings) lives in an undo/redo history and changes only through the pure commands of
 * `model/document.ts`; hooks do the rest — live solve (`useWorkspaceSolve`), save and conflicts
 * (`useStudySave`), shortcuts (`useShortcuts`) and the unsaved-changes guard (`useUnsavedGuard`).
 * Engineers and owners edit and save; reviewers and viewers get the same view read-only.
 */
import '@xyflow/react/dist/style.css';
import {
  Background,
  ConnectionMode,
  MiniMap,
  ReactFlow,
  ReactFlowProvider,
  applyEdgeChanges,
  applyNodeChanges,
  useNodesInitialized,
  useReactFlow,
  type Connection,
  type EdgeChange,
  type NodeChange,
  type NodeTypes,
  type EdgeTypes,
} from '@xyflow/react';
import { useCallback, useEffect, useLayoutEffect, useMemo, useReducer, useRef, useState } from 'react';
import { Link } from 'react-router';
import type { StudyDetail } from '../../../shared/api/studies.ts';
import type { Role } from '../../../shared/api/common.ts';
import { BASE_CASE_ID, type CircuitElementInput, type StudyCase } from '../../../shared/engine/index.ts';
import { StatusBadge } from '../../components/badges.tsx';
import { Button } from '../../components/button.tsx';
import { can } from '../../lib/authorization.ts';
import { BusNodeView } from './canvas/bus-node.tsx';
import { CanvasValuesContext, CanvasViewContext, createCanvasValuesStore, type CanvasView } from './canvas/canvas-context.tsx';
import { ElementNodeView } from './canvas/element-node.tsx';
import { Palette } from './canvas/palette.tsx';
import { MAX_FIT_ZOOM, fitWithLabels, reveal, visibleArea } from './canvas/view-area.ts';
import { WireEdgeView } from './canvas/wire-edge.tsx';
import { CaseEditor } from './cases/case-editor.tsx';
import { casesOf, changedElements, setStudyCases } from './cases/case-model.ts';
import { CaseOverlay } from './cases/case-overlay.tsx';
import { StudyExplorations } from './cases/study-explorations.tsx';
import { ConflictDialog, LeaveDialog, SaveDialog, ShortcutsDialog } from './editing/dialogs.tsx';
import { historyReducer, initHistory, type HistoryAction } from './editing/history.ts';
import { useCommitHeld } from './editing/use-commit-held.ts';
import { useShortcuts } from './editing/use-shortcuts.ts';
import { useUnsavedGuard } from './editing/use-unsaved-guard.ts';
import { PRIVATE_SEP } from './model/canvas-to-circuit.ts';
import { wireLabel } from './model/circuit-to-canvas.ts';
import { compareCircuits, contentOf, convert, docKey, docOf, json } from './model/conversion.ts';
import type { PaletteItem } from './model/defaults.ts';
import * as commands from './model/document.ts';
import type { Clip, WorkspaceDoc } from './model/document.ts';
import { readLayout, type StudySettings } from './model/layout.ts';
import { isBusNode, type BusNodeData, type Conductor, type WorkspaceEdge, type WorkspaceNode } from './model/types.ts';
import { PropertyPanel, type Selection } from './properties/property-panel.tsx';
import { SettingsDialog } from './properties/settings-dialog.tsx';
import { CasesCompare } from './results/cases-compare.tsx';
import { ResultsPanel } from './results/results-panel.tsx';
import { NeutralHazardAlert } from './results/neutral-alert.tsx';
import { conflictOf, useStudySave } from './save-study.ts';
import { useWorkspaceSolve } from './solve/use-workspace-solve.ts';

const nodeTypes: NodeTypes = { bus: BusNodeView, element: ElementNodeView };
const edgeTypes: EdgeTypes = { wire: WireEdgeView };
// Props of <ReactFlow> and <MiniMap> kept at module level: a new object or function on every render
// would be copied into xyflow's store (or break MiniMap's memo and redraw all ~450 minimap nodes) on
// every frame of a drag.
const SNAP_GRID: [number, number] = [10, 10];
const FIT_VIEW_OPTIONS = { padding: 0.15, maxZoom: MAX_FIT_ZOOM };
const PRO_OPTIONS = { hideAttribution: true };
const ARIA_LABEL_CONFIG = { 'node.a11yDescription.default': 'Press Enter or Space to select; arrow keys move a selected node.' };
const MINIMAP_STYLE = { width: 150, height: 96 };
/**
 * From this many canvas nodes, nodes and wires outside the view are not rendered (layout and paint of
 * ~450 nodes made dragging stutter on the 300-element study). Smaller diagrams keep every node in the
 * page, so keyboard and screen-reader users can reach nodes scrolled out of view.
 */
const CULL_FROM_NODES = 150;
const minimapColor = (n: { type?: string }) => (n.type === 'bus' ? '#1c2226' : '#7d858c');

export interface WorkspacePageProps {
  study: StudyDetail;
  role: Role;
  /** Called with the selected canvas node id (= engine element id, or the bus name for a bus), or null. */
  onSelectionChange?: (id: string | null) => void;
  /** Comment counts to pin on element nodes (review side; anchors are element ids). */
  pins?: { elementId: string; count: number }[];
}

export function WorkspacePage(props: WorkspacePageProps) {
  return (
    <ReactFlowProvider>
      <Workspace {...props} />
    </ReactFlowProvider>
  );
}

function Workspace({ study, role, onSelectionChange, pins }: WorkspacePageProps) {
  const readOnly = !can(role, 'study:edit');
  const rf = useReactFlow<WorkspaceNode, WorkspaceEdge>();
  const canvasRef = useRef<HTMLDivElement>(null);
  const [hist, dispatchNow] = useReducer(historyReducer<WorkspaceDoc>, study, (s) => initHistory(docOf(s)));
  const doc = hist.present;
  const docRef = useRef(doc);
  docRef.current = doc;
  // An edit held for its answer (see runAhead below) goes first: every other change commits it before its own.
  const flushAhead = useRef<() => boolean>(() => false);
  const dispatch = useCallback((a: HistoryAction<WorkspaceDoc>) => {
    flushAhead.current();
    dispatchNow(a);
  }, []);
  /** Applies a document command as one undoable edit. */
  const run = useCallback(<A extends unknown[]>(fn: (d: WorkspaceDoc, ...args: A) => WorkspaceDoc, ...args: A) => dispatch({ type: 'apply', fn: (d) => fn(d, ...args) }), [dispatch]);
  const viewport = useCallback(() => visibleArea(rf, canvasRef.current), [rf]);

  // ---- save, dirty mark, conflicts ----
  const content = useCallback((d: WorkspaceDoc) => contentOf(d, rf.getViewport()), [rf]);
  const onLoadTheirs = useCallback((next: WorkspaceDoc) => dispatch({ type: 'reset', next }), [dispatch]);
  const saving = useStudySave(study, content, onLoadTheirs);
  const { save, baseVersion, theirs } = saving;
  // True while a node is dragged: the dirty key (JSON of the circuit and of every position) is then
  // not recomputed per frame but once on drag stop.
  const [dragging, setDragging] = useState(false);
  const lastDirty = useRef(false);
  const dirty = useMemo(() => {
    if (dragging) return lastDirty.current;
    return (lastDirty.current = !readOnly && docKey(doc) !== saving.savedKey);
  }, [dragging, readOnly, doc, saving.savedKey]);
  const [snap, setSnap] = useState(true);
  const [dialog, setDialog] = useState<null | 'save' | 'settings' | 'help'>(null);

  // ---- circuit and live solve ----
  // ---- study cases: the one shown is solved instead of the base, and the canvas is then read-only ----
  const cases = useMemo(() => casesOf(doc.settings.cases), [doc.settings.cases]);
  const [pickedCase, setActiveCase] = useState<string>(BASE_CASE_ID);
  const activeCase = cases.some((c) => c.id === pickedCase) ? pickedCase : BASE_CASE_ID;
  const shownCase = cases.find((c) => c.id === activeCase);
  const setCases = useCallback((next: StudyCase[]) => run(setStudyCases, next), [run]);
  const locked = readOnly || shownCase !== undefined;
  const serverSweeps = useMemo(() => (readOnly ? null : { studyId: study.id, revision: study.revision ?? null, dirty }), [readOnly, study.id, study.revision, dirty]);
  const { conversion, circuit, live, overlays, problems, shifts, stale, shownCircuit, caseError } = useWorkspaceSolve(doc, activeCase);
  flushAhead.current = live.flushAhead;
  const solveAhead = live.solveAhead;
  const shownCircuitRef = useRef(shownCircuit);
  shownCircuitRef.current = shownCircuit;
  const activeCaseRef = useRef(activeCase);
  activeCaseRef.current = activeCase;
  // An edit held for its answer reaches the document before anything the user does next (editing/use-commit-held.ts).
  useCommitHeld(flushAhead);
  /**
   * Runs a value edit (a property, a bus, a conductor opened or closed) like `run`, but sends the
   * circuit it makes to the solver first and draws the edit together with its answer: one render
   * and one frame instead of the edit's and then the answer's (see `solveAhead`). Edits that do not
   * change what is solved (or while a case is shown) are dispatched at once.
   */
  const runAhead = useCallback(
    <A extends unknown[]>(fn: (d: WorkspaceDoc, ...args: A) => WorkspaceDoc, ...args: A) => {
      const base = docRef.current;
      const next = fn(base, ...args);
      const action: HistoryAction<WorkspaceDoc> = { type: 'apply', fn: (d) => (d === base ? next : fn(d, ...args)) };
      const was = shownCircuitRef.current;
      const nextCircuit = next !== base && was && activeCaseRef.current === BASE_CASE_ID ? convert(next).circuit : null;
      if (!nextCircuit || !was || nextCircuit.elements.length === 0 || json(nextCircuit) === json(was)) return dispatch(action);
      solveAhead(nextCircuit, () => dispatchNow(action));
    },
    [dispatch, solveAhead],
  );

  const toggleOpen = useCallback((edgeId: string, c: Conductor) => runAhead(commands.toggleOpen, edgeId, c), [runAhead]);

  const view = useMemo<CanvasView>(
    () => ({ readOnly: locked, pins: Object.fromEntries((pins ?? []).map((p) => [p.elementId, p.count])), wiringStandard: doc.settings.wiringStandard, toggleOpen: locked ? null : toggleOpen }),
    [toggleOpen, locked, pins, doc.settings.wiringStandard],
  );
  // What changes with every edit or solve goes to the nodes through a store: each node re-renders
  // only when its own entries change (set before paint, in the same frame as the edit or answer).
  const [canvasValues] = useState(createCanvasValuesStore);
  useLayoutEffect(() => {
    canvasValues.set({ overlays, stale, problems, shifts, busNameOf: conversion.map.nodeToBus, elementOf: conversion.elementOf, wiredOf: conversion.wiredOf });
  }, [canvasValues, overlays, stale, problems, shifts, conversion.map, conversion.elementOf, conversion.wiredOf]);

  // Wire names come from the current element and bus names at render time (never stored on the edge).
  // The array is kept when no wire changed, so an edit of a value does not hand xyflow new edges to sort through.
  const lastEdges = useRef<WorkspaceEdge[]>([]);
  const [labelled] = useState(() => new WeakMap<WorkspaceEdge, WorkspaceEdge>());
  const edges = useMemo(() => {
    const next = doc.edges.map((e) => {
      const label = wireLabel(e.source, conversion.map.nodeToBus[e.target] ?? '');
      if (e.ariaLabel === label) return e;
      const known = labelled.get(e);
      if (known?.ariaLabel === label) return known;
      const out = { ...e, ariaLabel: label };
      labelled.set(e, out);
      return out;
    });
    const prev = lastEdges.current;
    return (lastEdges.current = prev.length === next.length && next.every((e, i) => e === prev[i]) ? prev : next);
  }, [doc.edges, conversion.map, labelled]);

  // The elements the shown case changes are outlined (read-only overlay; nothing is stored on the nodes).
  const nodes = useMemo(() => {
    const changed = changedElements(shownCase);
    return changed.size === 0 ? doc.nodes : doc.nodes.map((n) => (changed.has(n.id) ? { ...n, className: 'rounded-[3px] outline outline-2 outline-offset-2 outline-accent' } : n));
  }, [doc.nodes, shownCase]);

  // ---- canvas changes ----
  const onNodesChange = useCallback(
    (changes: NodeChange<WorkspaceNode>[]) => {
      const editable = changes.filter((c) => c.type !== 'remove' && (!locked || c.type === 'select' || c.type === 'dimensions'));
      if (editable.length === 0) return;
      dispatch({ type: 'update', fn: (cur) => ({ ...cur, nodes: applyNodeChanges(editable, cur.nodes) }) });
    },
    [locked, dispatch],
  );
  const onEdgesChange = useCallback((changes: EdgeChange<WorkspaceEdge>[]) => {
    const selects = changes.filter((c) => c.type === 'select');
    if (selects.length === 0) return;
    dispatch({ type: 'update', fn: (cur) => ({ ...cur, edges: applyEdgeChanges(selects, cur.edges) }) });
  }, [dispatch]);
  const onConnect = useCallback(
    (c: Connection) => {
      if (locked) return;
      const ends = commands.resolveConnection(docRef.current, c);
      if (ends) run(commands.connect, ends);
    },
    [locked, run],
  );
  const isValidConnection = useCallback((c: Connection | WorkspaceEdge) => commands.resolveConnection(docRef.current, c) !== null, []);

  // ---- editing actions ----
  // After an add or a paste, the new (selected) nodes are brought into view if they landed outside it.
  const revealNext = useRef(false);
  useEffect(() => {
    if (!revealNext.current) return;
    revealNext.current = false;
    reveal(rf, canvasRef.current, doc.nodes.filter((n) => n.selected).map(commands.footprint));
  }, [doc, rf]);
  const addItem = useCallback(
    (item: PaletteItem) => {
      revealNext.current = true;
      run(commands.addItem, item, viewport());
    },
    [run, viewport],
  );
  const updateElement = useCallback((id: string, next: CircuitElementInput) => runAhead(commands.updateElement, id, next), [runAhead]);
  const updateBus = useCallback((id: string, next: BusNodeData) => runAhead(commands.updateBus, id, next), [runAhead]);
  const clipboard = useRef<Clip | null>(null);
  const applySettings = useCallback(
    (s: StudySettings, kv: Record<string, number | undefined>) => {
      run(commands.applySettings, s, kv);
      setDialog(null);
    },
    [run],
  );
  // Whether the view is as a fit left it (no pan or zoom by the user since): such a view is fitted
  // again when the canvas changes size (the alert above it comes or goes).
  const fitted = useRef(false);
  const userMoved = useRef(false);
  const onMoveStart = useCallback((event: MouseEvent | TouchEvent | null) => {
    if (event) userMoved.current = true;
  }, []);
  const fit = useCallback(() => {
    fitted.current = true;
    userMoved.current = false;
    fitWithLabels(rf, canvasRef.current);
  }, [rf]);
  useEffect(() => {
    const el = canvasRef.current;
    if (!el || typeof ResizeObserver === 'undefined') return;
    let last = el.getBoundingClientRect().height;
    const ro = new ResizeObserver(() => {
      const h = el.getBoundingClientRect().height;
      if (h === last) return;
      last = h;
      if (fitted.current && !userMoved.current) fitWithLabels(rf, el, 0);
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, [rf]);
  const openSave = useCallback(() => {
    if (readOnly) return;
    save.reset();
    setDialog('save');
  }, [readOnly, save]);
  const undo = useCallback(() => dispatch({ type: 'undo' }), [dispatch]);
  /** Set by undo and redo for the render they cause (see the results panel's selection below). */
  const historyMove = useRef(false);
  const redo = useCallback(() => dispatch({ type: 'redo' }), [dispatch]);

  useShortcuts(locked, {
    undo: () => ((historyMove.current = true), undo()),
    redo: () => ((historyMove.current = true), redo()),
    copy: () => void (clipboard.current = commands.copySelection(docRef.current)),
    paste: () => {
      if (!clipboard.current) return;
      revealNext.current = true;
      run(commands.paste, clipboard.current, viewport());
    },
    delete: () => run(commands.deleteSelection),
    save: openSave,
    fit,
    grid: () => setSnap((s) => !s),
    deselect: () => dispatch({ type: 'replace', next: commands.deselect(docRef.current) }),
    help: () => setDialog('help'),
  });
  const blocker = useUnsavedGuard(dirty);

  // ---- selection ----
  // Keyed on the selected node's id and data (not the node object, which a drag replaces every frame),
  // so the property panel does not re-render while a node moves.
  const selNode = doc.nodes.find((x) => x.selected);
  const selEdge = selNode ? undefined : doc.edges.find((x) => x.selected);
  const selEdgeBus = selEdge ? doc.nodes.find((x) => x.id === selEdge.target) : undefined;
  const selection = useMemo<Selection>(() => {
    if (selNode) return isBusNode(selNode) ? { kind: 'bus', id: selNode.id, data: selNode.data } : { kind: 'element', id: selNode.id, element: selNode.data.element };
    if (selEdge && selEdgeBus && isBusNode(selEdgeBus)) return { kind: 'edge', edge: selEdge, elementId: selEdge.source, busName: selEdgeBus.data.name, splitPhase: selEdgeBus.data.splitPhase };
    return null;
    // eslint-disable-next-line react-hooks/exhaustive-deps -- id and data stand for the selected node
  }, [selNode?.id, selNode?.data, selEdge, selEdgeBus?.data]);
  const selectedName = selection?.kind === 'bus' ? selection.data.name : selection?.kind === 'element' ? selection.id : null;

  useEffect(() => onSelectionChange?.(selectedName), [selectedName, onSelectionChange]);

  // The results panel follows a bus or element the user selects; an undo, a redo or a wire selected
  // to open a conductor keeps the bus chosen for the phasor diagram.
  const [panelSelection, setPanelSelection] = useState<string | null>(selectedName);
  const [seenSelection, setSeenSelection] = useState<string | null>(selectedName);
  if (selectedName !== seenSelection) {
    setSeenSelection(selectedName);
    if (!historyMove.current && selectedName !== null) setPanelSelection(selectedName);
  }
  useEffect(() => {
    historyMove.current = false;
  });
  const undoKeep = useCallback(() => {
    historyMove.current = true;
    undo();
  }, [undo]);

  /** Selects the canvas node of a bus name or element id (from the results panel). */
  const selectById = useCallback(
    (id: string) => {
      const nodeId = conversion.map.busToNode[id] ?? conversion.map.elementToNode[id] ?? id;
      dispatch({ type: 'update', fn: (cur) => commands.selectOnly(cur, nodeId) });
    },
    [conversion.map, dispatch],
  );

  // The conversion is reused while node data and ids stay the same (a drag), so it keys the bus list.
  // eslint-disable-next-line react-hooks/exhaustive-deps -- conversion stands for the nodes' ids and data
  const busList = useMemo(() => doc.nodes.filter(isBusNode).map((b) => ({ id: b.id, name: b.data.name, kvLL: b.data.kvLL })), [conversion]);
  const busNames = useMemo(() => busList.map((b) => b.name), [busList]);
  const dragStart = useRef<WorkspaceDoc | null>(null);
  const onNodeDragStart = useCallback(() => {
    dragStart.current = docRef.current;
    setDragging(true);
  }, []);
  const onNodeDragStop = useCallback(() => {
    if (dragStart.current) dispatch({ type: 'mark', before: dragStart.current });
    dragStart.current = null;
    setDragging(false);
  }, [dispatch]);

  const layout = useMemo(() => readLayout(study.content.layout), [study.content.layout]);
  // A study opened empty starts at 100 % (a fit would blow its first node up to the fit's maximum zoom).
  const [initiallyDrawn] = useState(() => doc.nodes.length > 0);
  // The first fit (xyflow's, on the nodes' own boxes) is redone once the first solve has written its
  // values beside the nodes: on every label, above the minimap (fitWithLabels), unless the user has
  // moved the view by then.
  const nodesMeasured = useNodesInitialized();
  const refitted = useRef(false);
  const firstAnswer = live.status === 'ok' || live.status === 'error';
  useEffect(() => {
    if (refitted.current || !initiallyDrawn || layout?.viewport || !nodesMeasured || !firstAnswer) return;
    refitted.current = true;
    if (userMoved.current) return;
    fitted.current = true;
    fitWithLabels(rf, canvasRef.current, 0);
  }, [initiallyDrawn, layout?.viewport, nodesMeasured, firstAnswer, rf]);
  const statusText =
    live.status === 'solving' ? 'Solving…' : live.status === 'ok' ? `Solved in ${live.ms?.toFixed(1) ?? '–'} ms` : live.status === 'error' ? 'The circuit cannot be solved (see the note by the element)' : circuit.elements.length === 0 ? 'Add a source, a bus and loads to begin' : '';

  return (
    <CanvasViewContext.Provider value={view}>
      <CanvasValuesContext.Provider value={canvasValues}>
        <div className="flex flex-col gap-2">
          <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
            <nav aria-label="Breadcrumb" className="text-[13px] text-ink-muted">
              <Link to="/" className="text-accent hover:underline">
                Studies
              </Link>{' '}
              <span aria-hidden="true">/</span>{' '}
            </nav>
            <h1 className="text-lg">{study.name}</h1>
            <StatusBadge status={study.status} />
            {/* Users count revisions; the edit version (baseVersion) stays internal. */}
            {study.revision ? <span className="num text-[12px] text-ink-muted">revision {study.revision}</span> : null}
            <Link to={`/studies/${study.id}/details`} className="text-[13px] text-accent hover:underline">
              Details and record
            </Link>
            <Link to={`/studies/${study.id}/balance`} className="text-[13px] text-accent hover:underline">
              Phase balancing
            </Link>
            {readOnly ? <span className="rounded-[2px] bg-sunken px-1.5 text-[12px] font-semibold text-ink-muted">Read-only ({role})</span> : null}
            {dirty ? <span className="text-[12px] font-semibold text-caution">● Unsaved changes</span> : null}
          </div>

          <div role="toolbar" aria-label="Workspace tools" className="flex flex-wrap items-center gap-1.5 rounded-[3px] border border-rule bg-panel px-2 py-1">
            {readOnly ? null : (
              <>
                <Button size="sm" variant="primary" onClick={openSave} aria-label="Save study" disabled={conversion.problems.length > 0} title={conversion.problems.length > 0 ? 'Wire or delete unconnected elements first' : 'Save study (Ctrl+S)'}>
                  Save study
                </Button>
                <Button size="sm" onClick={undoKeep} disabled={hist.past.length === 0} aria-label="Undo" title="Undo (Ctrl+Z)">
                  ↶ Undo
                </Button>
                <Button size="sm" onClick={() => ((historyMove.current = true), redo())} disabled={hist.future.length === 0} aria-label="Redo" title="Redo (Ctrl+Shift+Z)">
                  ↷ Redo
                </Button>
                <span className="mx-1 h-5 w-px bg-rule" aria-hidden="true" />
              </>
            )}
            <Button size="sm" onClick={fit} aria-label="Fit view" title="Fit view (F)">
              Fit view
            </Button>
            <Button size="sm" onClick={() => setSnap((s) => !s)} aria-pressed={snap} title="Snap to grid (G)">
              Snap to grid {snap ? 'on' : 'off'}
            </Button>
            <Button size="sm" onClick={() => setDialog('settings')} aria-label="Study settings">
              Study settings
            </Button>
            <Button size="sm" onClick={() => setDialog('help')} aria-label="Keyboard shortcuts" title="Keyboard shortcuts (?)">
              ? Shortcuts
            </Button>
            <span role="status" className="num ml-auto text-[12px] text-ink-muted">
              {doc.settings.frequencyHz} Hz · {doc.settings.sequence} · {doc.settings.shiftConvention === 'iec' ? 'IEC clock shift' : 'N. American shift (LV lags 30°)'} · {statusText}
            </span>
          </div>
          <CaseEditor cases={cases} circuit={circuit} active={activeCase} onActivate={setActiveCase} onChange={readOnly ? null : setCases} error={caseError} />
          {save.isError && !conflictOf(save.error) && dialog !== 'save' ? <p role="alert" className="text-[13px] text-danger">✕ The study was not saved: {save.error.message}</p> : null}

          {/* The alert, or the note that the values drawn are stale, sits above the diagram, not over it
              (it hides nothing drawn), within the diagram's height (the page does not grow: the canvas
              and its minimap stay in the window). Below md (a phone) the palette runs in a row above
              the diagram and the properties come under it, so the diagram keeps the full width. */}
          <div className="flex h-[68vh] min-h-[460px] flex-col gap-2 max-md:h-auto max-md:min-h-0">
            {stale ? (
              <p role="status" className="rounded-[2px] border border-caution bg-caution-soft px-2 py-1 text-[12px] font-semibold text-caution">
                Stale values: the last edit cannot be solved, so the voltages and currents drawn are from before it, not for the circuit shown.
              </p>
            ) : (
              <NeutralHazardAlert result={live.result} privateMarker={PRIVATE_SEP} />
            )}
            <div className="flex min-h-0 flex-1 overflow-hidden rounded-[3px] border border-rule bg-paper max-md:flex-col">
              {locked ? null : <Palette onAdd={addItem} />}
              {/* A dragged node gets its own compositor layer, so moving it does not repaint the nodes around it (\_ keeps Tailwind from reading _ as a space). */}
              <div ref={canvasRef} className="relative min-w-0 flex-1 max-md:h-[60vh] max-md:min-h-[320px] max-md:flex-none [&_.react-flow\_\_node.dragging]:will-change-transform" aria-label="Diagram">
                <ReactFlow<WorkspaceNode, WorkspaceEdge>
                  nodes={nodes}
                  edges={edges}
                  nodeTypes={nodeTypes}
                  edgeTypes={edgeTypes}
                  onNodesChange={onNodesChange}
                  onEdgesChange={onEdgesChange}
                  onConnect={onConnect}
                  isValidConnection={isValidConnection}
                  connectionMode={ConnectionMode.Loose}
                  onNodeDragStart={onNodeDragStart}
                  onNodeDragStop={onNodeDragStop}
                  onMoveStart={onMoveStart}
                  onlyRenderVisibleElements={doc.nodes.length >= CULL_FROM_NODES}
                  nodesDraggable={!locked}
                  nodesConnectable={!locked}
                  elementsSelectable
                  deleteKeyCode={null}
                  snapToGrid={snap}
                  snapGrid={SNAP_GRID}
                  defaultViewport={layout?.viewport}
                  fitView={!layout?.viewport && initiallyDrawn}
                  fitViewOptions={FIT_VIEW_OPTIONS}
                  minZoom={0.2}
                  maxZoom={3}
                  proOptions={PRO_OPTIONS}
                  ariaLabelConfig={ARIA_LABEL_CONFIG}
                >
                  <Background gap={20} size={1} color="#d3d0c6" />
                  <MiniMap pannable zoomable ariaLabel="Minimap of the diagram" style={MINIMAP_STYLE} nodeColor={minimapColor} />
                </ReactFlow>
                {shownCase ? <CaseOverlay c={shownCase} circuit={circuit} /> : null}
                {doc.nodes.length === 0 ? (
                  <p className="pointer-events-none absolute inset-x-0 top-1/3 text-center text-sm text-ink-muted">
                    {readOnly ? 'This study has no diagram yet.' : 'Add a source, a bus and loads from the palette, then drag from a port to a bus to wire them.'}
                  </p>
                ) : null}
              </div>
              <PropertyPanel
                selection={selection}
                readOnly={locked}
                wiringStandard={doc.settings.wiringStandard}
                perUnit={doc.settings.perUnit}
                busNames={busNames}
                onElement={updateElement}
                onBus={updateBus}
                onToggleOpen={toggleOpen}
              />
            </div>
          </div>

          <div className="overflow-auto">
            {/* a paint layer of their own (isolation clips nothing): a sweep chart redrawn below them does not repaint the tables */}
            <div className="isolate">
              <ResultsPanel status={live.status} result={live.result} error={live.error} stale={live.stale} ms={live.ms} selection={panelSelection} onSelect={selectById} standard={doc.settings.wiringStandard} privateMarker={PRIVATE_SEP} perUnit={doc.settings.perUnit} />
              <CasesCompare circuit={circuit} privateMarker={PRIVATE_SEP} />
            </div>
            <StudyExplorations circuit={shownCircuit} base={circuit} cases={cases} activeCase={activeCase} result={live.result} onCases={readOnly ? null : setCases} onActivate={setActiveCase} server={serverSweeps} />
          </div>
        </div>

        <SaveDialog open={dialog === 'save'} busy={save.isPending} error={save.isError && !conflictOf(save.error) ? save.error.message : undefined} onCancel={() => setDialog(null)} onSave={(m) => saving.doSave(docRef.current, m || undefined, baseVersion, () => setDialog(null))} />
        <ConflictDialog
          theirs={theirs}
          diff={theirs ? compareCircuits(circuit, theirs.content.circuit) : { added: [], removed: [], changed: [] }}
          busy={save.isPending}
          onCancel={saving.dismissConflict}
          onLoadTheirs={saving.loadTheirs}
          onOverwrite={() => theirs && saving.doSave(docRef.current, saving.pendingMessage, theirs.version)}
        />
        <SettingsDialog open={dialog === 'settings'} settings={doc.settings} buses={busList} readOnly={readOnly} onClose={() => setDialog(null)} onApply={applySettings} />
        <ShortcutsDialog open={dialog === 'help'} onClose={() => setDialog(null)} />
        <LeaveDialog open={blocker.state === 'blocked'} onStay={() => blocker.reset?.()} onLeave={() => blocker.proceed?.()} />
      </CanvasValuesContext.Provider>
    </CanvasViewContext.Provider>
  );
}
