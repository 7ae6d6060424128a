/**
 * The study workspace: palette, canvas, properties, live results. The canvas document (nodes, edges,
 * settings) lives in an undo/redo history; every change converts to the engine's circuit format and
 * re-solves in a Web Worker (W2's `useLiveSolve`), whose overlays the nodes draw. Engineers and
 * owners edit and save; reviewers and viewers get the same view read-only.
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
  useReactFlow,
  type Connection,
  type EdgeChange,
  type NodeChange,
  type NodeTypes,
  type EdgeTypes,
} from '@xyflow/react';
import { useCallback, useEffect, useMemo, useReducer, useRef, useState } from 'react';
import { Link, useBlocker } from 'react-router';
import type { StudyDetail } from '../../../shared/api/studies.ts';
import type { Role } from '../../../shared/api/common.ts';
import { circuitSchema, type CircuitElementInput, type CircuitInput } from '../../../shared/engine/index.ts';
import { StatusBadge } from '../../components/badges.tsx';
import { Button } from '../../components/button.tsx';
import { can } from '../../lib/authorization.ts';
import { BusNodeView } from './canvas/bus-node.tsx';
import { CanvasViewContext, type CanvasView } from './canvas/canvas-context.tsx';
import { ElementNodeView } from './canvas/element-node.tsx';
import { Palette } from './canvas/palette.tsx';
import { WireEdgeView } from './canvas/wire-edge.tsx';
import { ConflictDialog, LeaveDialog, SaveDialog, ShortcutsDialog, type ConflictSummary } from './editing/dialogs.tsx';
import { historyReducer, initHistory } from './editing/history.ts';
import { shortcutOf } from './editing/shortcuts.ts';
import { PRIVATE_SEP, canvasToCircuit } from './model/canvas-to-circuit.ts';
import { CasesCompare } from './results/cases-compare.tsx';
import { busNodeId, canvasLayout, circuitToCanvas, wireId, wireLabel } from './model/circuit-to-canvas.ts';
import { freshId, newElement, type PaletteItem } from './model/defaults.ts';
import { readLayout, type StudySettings } from './model/layout.ts';
import { elementPorts, isBundleHandle } from './model/ports.ts';
import { isBusNode, isElementNode, type BusNodeData, type Conductor, type WorkspaceEdge, type WorkspaceNode } from './model/types.ts';
import { PropertyPanel, type Selection } from './properties/property-panel.tsx';
import { SettingsDialog } from './properties/settings-dialog.tsx';
import { diagramOverlays } from './results/overlays.ts';
import { ResultsPanel } from './results/results-panel.tsx';
import { conflictOf, useSaveStudy } from './save-study.ts';
import { useLiveSolve } from './solve/use-live-solve.ts';

const nodeTypes: NodeTypes = { bus: BusNodeView, element: ElementNodeView };
const edgeTypes: EdgeTypes = { wire: WireEdgeView };
// Props of <ReactFlow> and <MiniMap> kept at module level: a new object or function on every render
// would be copied into xyflow's store (or break MiniMap's memo and redraw all ~450 minimap nodes) on
// every frame of a drag.
const SNAP_GRID: [number, number] = [10, 10];
const FIT_VIEW_OPTIONS = { padding: 0.15 };
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

interface Doc {
  nodes: WorkspaceNode[];
  edges: WorkspaceEdge[];
  settings: StudySettings;
}

function docOf(study: StudyDetail): Doc {
  const { nodes, edges, settings } = circuitToCanvas(study.content.circuit as unknown as CircuitInput, readLayout(study.content.layout));
  return { nodes, edges, settings };
}

/** Differences of element sets between two circuits (for the conflict dialog), compared with the engine's defaults applied. */
function compareCircuits(mine: CircuitInput, theirs: CircuitInput): ConflictSummary {
  const canon = (c: CircuitInput) => {
    const parsed = circuitSchema.safeParse(c);
    const elements = (parsed.success ? parsed.data.elements : c.elements) as { id: string }[];
    const out = new Map<string, string>();
    for (const e of elements) {
      // An opened connection is a generated switch: name it after its element.
      const owner = e.id.includes(PRIVATE_SEP) ? `${e.id.split(PRIVATE_SEP)[0]} (opened conductors)` : e.id;
      out.set(owner, (out.get(owner) ?? '') + JSON.stringify(e));
    }
    return out;
  };
  const a = canon(mine);
  const b = canon(theirs);
  return {
    added: [...b.keys()].filter((k) => !a.has(k)),
    removed: [...a.keys()].filter((k) => !b.has(k)),
    changed: [...b.keys()].filter((k) => a.has(k) && a.get(k) !== b.get(k)),
  };
}

/**
 * canvasToCircuit depends on node data and edges, not on positions: while a node is dragged its data
 * object is kept, so the last conversion is reused (a drag then costs no conversion per frame).
 */
type Conversion = ReturnType<typeof canvasToCircuit> & {
  ids: string[];
  /** Canvas element node id → its element (for wires that label port currents without a store subscription per edge). */
  elementOf: Record<string, CircuitElementInput>;
  /** Element id → the element as wired into the circuit (phases a load sits on, buses): what labels show. */
  wiredOf: Record<string, CircuitElementInput>;
};
const conversionCache = new WeakMap<WorkspaceEdge[], { data: unknown[]; settings: StudySettings; result: Conversion }>();
const jsonCache = new WeakMap<object, string>();
/** JSON of an object that is never mutated, computed once. */
function json(o: object): string {
  let j = jsonCache.get(o);
  if (j === undefined) jsonCache.set(o, (j = JSON.stringify(o)));
  return j;
}
function convert(d: Doc): Conversion {
  const data = d.nodes.map((n) => n.data);
  const hit = conversionCache.get(d.edges);
  if (hit && hit.settings === d.settings && hit.data.length === data.length && hit.data.every((x, i) => x === data[i]) && d.nodes.every((n, i) => n.id === hit.result.ids[i])) return hit.result;
  const elementOf: Record<string, CircuitElementInput> = {};
  for (const n of d.nodes) if (isElementNode(n)) elementOf[n.id] = n.data.element;
  const converted = canvasToCircuit(d.nodes, d.edges, d.settings);
  const wiredOf: Record<string, CircuitElementInput> = {};
  for (const e of converted.circuit.elements) if (e.id in elementOf) wiredOf[e.id] = e;
  const result: Conversion = { ...converted, ids: d.nodes.map((n) => n.id), elementOf, wiredOf };
  conversionCache.set(d.edges, { data, settings: d.settings, result });
  return result;
}

/** What saving would store, as a string (node positions rounded as the layout stores them). */
function docKey(d: Doc): string {
  return json(convert(d).circuit) + JSON.stringify(canvasLayout(d.nodes, d.edges, d.settings));
}

function inField(target: EventTarget | null): boolean {
  const el = target as HTMLElement | null;
  return !!el && (el.tagName === 'INPUT' || el.tagName === 'TEXTAREA' || el.tagName === 'SELECT' || el.isContentEditable);
}

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
  const [hist, dispatch] = useReducer(historyReducer<Doc>, study, (s) => initHistory(docOf(s)));
  const doc = hist.present;
  const [savedKey, setSavedKey] = useState(() => docKey(hist.present));
  const [baseVersion, setBaseVersion] = useState(study.version);
  // True while a node is dragged: the dirty key (JSON of the circuit and of every position) is then
  // not recomputed per frame but once on drag stop.
  const [dragging, setDragging] = useState(false);
  const lastDirty = useRef(false);
  // Dirty means the saved content would differ: selection and measuring do not count, positions do.
  const dirty = useMemo(() => {
    if (dragging) return lastDirty.current;
    return (lastDirty.current = !readOnly && docKey(doc) !== savedKey);
  }, [dragging, readOnly, doc, savedKey]);
  const [snap, setSnap] = useState(true);
  const [dialog, setDialog] = useState<null | 'save' | 'settings' | 'help'>(null);
  const [theirs, setTheirs] = useState<StudyDetail | null>(null);
  const [pendingMessage, setPendingMessage] = useState<string | undefined>(undefined);
  const save = useSaveStudy(study.id);
  const clipboard = useRef<{ nodes: WorkspaceNode[]; edges: WorkspaceEdge[] } | null>(null);
  const dragStart = useRef<Doc | null>(null);
  const docRef = useRef(doc);
  docRef.current = doc;

  const commit = useCallback((next: Doc) => dispatch({ type: 'commit', next }), []);

  const toggleOpen = useCallback(
    (edgeId: string, c: Conductor) => {
      const cur = docRef.current;
      commit({
        ...cur,
        edges: cur.edges.map((e) => {
          if (e.id !== edgeId) return e;
          const open = e.data?.open ?? [];
          return { ...e, data: { open: open.includes(c) ? open.filter((x) => x !== c) : [...open, c] } };
        }),
      });
    },
    [commit],
  );


  // ---- circuit and live solve ----
  const conversion = convert(doc);
  const circuitKey = json(conversion.circuit);
  // eslint-disable-next-line react-hooks/exhaustive-deps -- the key stands for the circuit's content
  const circuit = useMemo(() => conversion.circuit, [circuitKey]);
  const live = useLiveSolve(circuit.elements.length > 0 ? circuit : null);
  const overlays = useMemo(() => (live.result ? diagramOverlays(live.result) : null), [live.result]);

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
    const out: CanvasView['shifts'] = {};
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

  const view = useMemo<CanvasView>(
    () => ({
      readOnly,
      shifts,
      pins: Object.fromEntries((pins ?? []).map((p) => [p.elementId, p.count])),
      wiringStandard: doc.settings.wiringStandard,
      overlays,
      problems,
      busNamesOf: (nodeId) => Object.entries(conversion.map.busToNode).filter(([, n]) => n === nodeId).map(([b]) => b),
      elementOf: conversion.elementOf,
      wiredOf: conversion.wiredOf,
      toggleOpen: readOnly ? null : toggleOpen,
    }),
    [toggleOpen, readOnly, shifts, pins, doc.settings.wiringStandard, overlays, problems, conversion.map, conversion.elementOf, conversion.wiredOf],
  );

  // Wire names come from the current element and bus names at render time (never stored on the edge).
  const edges = useMemo(
    () =>
      doc.edges.map((e) => {
        const label = wireLabel(e.source, conversion.map.nodeToBus[e.target] ?? '');
        return e.ariaLabel === label ? e : { ...e, ariaLabel: label };
      }),
    [doc.edges, conversion.map],
  );

  // ---- canvas changes ----
  const onNodesChange = useCallback(
    (changes: NodeChange<WorkspaceNode>[]) => {
      const editable = changes.filter((c) => c.type !== 'remove' && (!readOnly || c.type === 'select' || c.type === 'dimensions'));
      if (editable.length === 0) return;
      dispatch({ type: 'update', fn: (cur) => ({ ...cur, nodes: applyNodeChanges(editable, cur.nodes) }) });
    },
    [readOnly],
  );
  const onEdgesChange = useCallback((changes: EdgeChange<WorkspaceEdge>[]) => {
    const selects = changes.filter((c) => c.type === 'select');
    if (selects.length === 0) return;
    dispatch({ type: 'update', fn: (cur) => ({ ...cur, edges: applyEdgeChanges(selects, cur.edges) }) });
  }, []);

  /** Element end, port and bus end of a proposed connection, or a reason it cannot be made. */
  const resolveConnection = useCallback((c: Connection | WorkspaceEdge) => {
    const nodes = docRef.current.nodes;
    const s = nodes.find((n) => n.id === c.source);
    const t = nodes.find((n) => n.id === c.target);
    if (!s || !t) return null;
    const [el, port, bus, handle] = isElementNode(s) && isBusNode(t) ? [s, c.sourceHandle, t, c.targetHandle] : isBusNode(s) && isElementNode(t) ? [t, c.targetHandle, s, c.sourceHandle] : [null, null, null, null];
    if (!el || !bus || !port) return null;
    const spec = elementPorts(el.data.element).find((p) => p.id === port);
    if (!spec) return null;
    const bundle = isBundleHandle(handle);
    if (spec.mode === 'bundle' && !bundle) return null;
    if (spec.mode === 'conductor' && bundle && spec.field !== 'node') return null;
    return { element: el, port, bus, handle: handle ?? 'all' };
  }, []);

  const onConnect = useCallback(
    (c: Connection) => {
      if (readOnly) return;
      const r = resolveConnection(c);
      if (!r) return;
      const cur = docRef.current;
      const id = wireId(r.element.id, r.port);
      // A split-phase source or a centre-tapped secondary makes its bus a 120/240 V bus (legs 1, 2, N).
      const el = r.element.data.element;
      const makesSplit = el.type === 'splitPhaseSource' || (el.type === 'splitPhaseTransformer' && r.port === 'to');
      const nodes = makesSplit && !r.bus.data.splitPhase ? cur.nodes.map((n) => (n.id === r.bus.id && isBusNode(n) ? { ...n, data: { ...n.data, splitPhase: true } } : n)) : cur.nodes;
      const edge: WorkspaceEdge = { id, type: 'wire', source: r.element.id, sourceHandle: r.port, target: r.bus.id, targetHandle: r.handle, data: { open: [] } };
      commit({ ...cur, nodes, edges: [...cur.edges.filter((e) => e.id !== id), edge] });
    },
    [readOnly, resolveConnection, commit],
  );

  // ---- editing actions ----
  const taken = useCallback((d: Doc) => new Set(d.nodes.flatMap((n) => (isBusNode(n) ? [n.data.name, n.id] : [n.id]))), []);

  const freeSpot = useCallback(
    (d: Doc, w: number, h: number, near?: 'above' | 'below') => {
      const el = document.querySelector('.react-flow');
      const rect = el?.getBoundingClientRect();
      const centre = rect ? rf.screenToFlowPosition({ x: rect.left + rect.width * 0.35, y: rect.top + rect.height * 0.3 }) : { x: 0, y: 0 };
      const boxes = d.nodes.map((n) => ({ x: n.position.x, y: n.position.y, w: isBusNode(n) ? 270 : 170, h: isBusNode(n) ? 70 : 100 }));
      const free = (x: number, y: number) => !boxes.some((b) => x < b.x + b.w && x + w > b.x && y < b.y + b.h && y + h > b.y);
      // Single-line habit: sources above the bus in use (the selected one, else the newest), loads and feeders below it.
      const buses = d.nodes.filter(isBusNode);
      const anchor = buses.find((b) => b.selected) ?? buses[buses.length - 1];
      if (near && anchor) {
        const y = anchor.position.y + (near === 'above' ? -120 : 105);
        for (let k = 0; k < 12; k++) {
          const x = anchor.position.x + 20 + k * 130;
          if (free(x, y)) return { x, y };
        }
      }
      for (let ring = 0; ring < 40; ring++) {
        for (let col = 0; col <= ring; col++) {
          const x = Math.round((centre.x + col * 180) / 10) * 10;
          const y = Math.round((centre.y + (ring - col) * 110) / 10) * 10;
          if (!boxes.some((b) => x < b.x + b.w && x + w > b.x && y < b.y + b.h && y + h > b.y)) return { x, y };
        }
      }
      return centre;
    },
    [rf],
  );

  const addItem = useCallback(
    (item: PaletteItem) => {
      const cur = docRef.current;
      const ids = taken(cur);
      const deselected = cur.nodes.map((n) => (n.selected ? { ...n, selected: false } : n));
      if (item.kind === 'bus') {
        const name = freshId('B', ids);
        const node: WorkspaceNode = { id: busNodeId(name), type: 'bus', position: freeSpot(cur, 270, 70), selected: true, data: { kind: 'bus', name, splitPhase: false } };
        commit({ ...cur, nodes: [...deselected, node] });
        return;
      }
      const id = freshId(item.prefix, ids);
      const element = newElement(item, id, cur.settings.shiftConvention);
      const ports = elementPorts(element);
      const near = ports.length === 0 ? undefined : ports.every((p) => p.side === 'bottom') ? 'above' : 'below';
      const node: WorkspaceNode = { id, type: 'element', position: freeSpot(cur, 120, 100, near), selected: true, data: { kind: 'element', element } };
      commit({ ...cur, nodes: [...deselected, node], edges: cur.edges.map((e) => (e.selected ? { ...e, selected: false } : e)) });
    },
    [commit, freeSpot, taken],
  );

  const updateElement = useCallback(
    (id: string, next: CircuitElementInput) => {
      const cur = docRef.current;
      const ports = new Set(elementPorts(next).map((p) => p.id));
      commit({
        ...cur,
        nodes: cur.nodes.map((n) => (n.id === id && isElementNode(n) ? { ...n, data: { ...n.data, element: next } } : n)),
        // A load turned single-phase (or back) has other ports: drop wires to ports that went away.
        edges: cur.edges.filter((e) => e.source !== id || ports.has(e.sourceHandle ?? '')),
      });
    },
    [commit],
  );

  const updateBus = useCallback(
    (id: string, next: BusNodeData) => {
      const cur = docRef.current;
      const conds = new Set(next.splitPhase ? ['1', '2', 'n', 'all', 'allb'] : ['a', 'b', 'c', 'n', 'all', 'allb']);
      commit({
        ...cur,
        nodes: cur.nodes.map((n) => (n.id === id && isBusNode(n) ? { ...n, data: next } : n)),
        edges: cur.edges.filter((e) => e.target !== id || conds.has(e.targetHandle ?? 'all')),
      });
    },
    [commit],
  );

  const deleteSelection = useCallback(() => {
    const cur = docRef.current;
    const gone = new Set(cur.nodes.filter((n) => n.selected).map((n) => n.id));
    const edges = cur.edges.filter((e) => !e.selected && !gone.has(e.source) && !gone.has(e.target));
    if (gone.size === 0 && edges.length === cur.edges.length) return;
    commit({ ...cur, nodes: cur.nodes.filter((n) => !gone.has(n.id)), edges });
  }, [commit]);

  const copySelection = useCallback(() => {
    const cur = docRef.current;
    const nodes = cur.nodes.filter((n) => n.selected);
    const ids = new Set(nodes.map((n) => n.id));
    clipboard.current = { nodes, edges: cur.edges.filter((e) => ids.has(e.source) && ids.has(e.target)) };
  }, []);

  const paste = useCallback(() => {
    const clip = clipboard.current;
    if (!clip || clip.nodes.length === 0) return;
    const cur = docRef.current;
    const ids = taken(cur);
    const rename = new Map<string, string>();
    const pasted: WorkspaceNode[] = clip.nodes.map((n) => {
      const position = { x: n.position.x + 40, y: n.position.y + 40 };
      if (isBusNode(n)) {
        const name = freshId(`${n.data.name.replace(/\d+$/, '')}`, ids);
        ids.add(name);
        const id = busNodeId(name);
        ids.add(id);
        rename.set(n.id, id);
        return { ...n, id, position, selected: true, data: { ...n.data, name } };
      }
      const id = freshId(n.id.replace(/\d+$/, ''), ids);
      ids.add(id);
      rename.set(n.id, id);
      return { ...n, id, position, selected: true, data: { ...n.data, element: { ...n.data.element, id } } };
    });
    const edges = clip.edges.map((e) => {
      const source = rename.get(e.source)!;
      return { ...e, id: wireId(source, e.sourceHandle ?? ''), source, target: rename.get(e.target)!, selected: false };
    });
    commit({ ...cur, nodes: [...cur.nodes.map((n) => (n.selected ? { ...n, selected: false } : n)), ...pasted], edges: [...cur.edges, ...edges] });
  }, [commit, taken]);

  const deselect = useCallback(() => {
    const cur = docRef.current;
    dispatch({ type: 'replace', next: { ...cur, nodes: cur.nodes.map((n) => (n.selected ? { ...n, selected: false } : n)), edges: cur.edges.map((e) => (e.selected ? { ...e, selected: false } : e)) } });
  }, []);

  // ---- save ----
  const content = useCallback(
    (d: Doc) => ({ circuit: canvasToCircuit(d.nodes, d.edges, d.settings).circuit as unknown as StudyDetail['content']['circuit'], layout: canvasLayout(d.nodes, d.edges, d.settings, rf.getViewport()) }),
    [rf],
  );
  const doSave = useCallback(
    (message: string | undefined, version: number) => {
      const snapshot = docRef.current;
      save.mutate(
        { version, content: content(snapshot), ...(message ? { message } : {}) },
        {
          onSuccess: (saved) => {
            setSavedKey(docKey(snapshot));
            setBaseVersion(saved.version);
            setDialog(null);
            setTheirs(null);
          },
          onError: (e) => {
            const current = conflictOf(e);
            if (current) {
              setDialog(null);
              setTheirs(current);
            }
          },
        },
      );
    },
    [save, content],
  );
  const openSave = useCallback(() => {
    if (readOnly) return;
    save.reset();
    setDialog('save');
  }, [readOnly, save]);

  const loadTheirs = useCallback(() => {
    if (!theirs) return;
    const next = docOf(theirs);
    dispatch({ type: 'reset', next });
    setSavedKey(docKey(next));
    setBaseVersion(theirs.version);
    setTheirs(null);
  }, [theirs]);

  // ---- keyboard ----
  useEffect(() => {
    function onKey(e: KeyboardEvent) {
      if (document.querySelector('[role="dialog"]')) return;
      const action = shortcutOf(e, inField(e.target));
      if (!action) return;
      if (readOnly && ['undo', 'redo', 'paste', 'delete', 'save'].includes(action)) return;
      e.preventDefault();
      switch (action) {
        case 'undo':
          return dispatch({ type: 'undo' });
        case 'redo':
          return dispatch({ type: 'redo' });
        case 'copy':
          return copySelection();
        case 'paste':
          return paste();
        case 'delete':
          return deleteSelection();
        case 'save':
          return openSave();
        case 'fit':
          return void rf.fitView({ padding: 0.15, duration: 200 });
        case 'grid':
          return setSnap((s) => !s);
        case 'deselect':
          return deselect();
        case 'help':
          return setDialog('help');
      }
    }
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [readOnly, copySelection, paste, deleteSelection, openSave, rf, deselect]);

  // ---- unsaved-changes guard ----
  const blocker = useBlocker(({ currentLocation, nextLocation }) => dirty && currentLocation.pathname !== nextLocation.pathname);
  useEffect(() => {
    if (!dirty) return;
    const onUnload = (e: BeforeUnloadEvent) => {
      e.preventDefault();
      e.returnValue = '';
    };
    window.addEventListener('beforeunload', onUnload);
    return () => window.removeEventListener('beforeunload', onUnload);
  }, [dirty]);

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
  const selectedName = selection?.kind === 'bus' ? selection.data.name : selection?.kind === 'element' ? selection.id : selection?.kind === 'edge' ? selection.elementId : null;

  useEffect(() => onSelectionChange?.(selection?.kind === 'element' ? selection.id : selection?.kind === 'bus' ? selection.data.name : null), [selection, onSelectionChange]);

  /** Selects the canvas node of a bus name or element id (from the results panel). */
  const selectById = useCallback(
    (id: string) => {
      const nodeId = conversion.map.busToNode[id] ?? conversion.map.elementToNode[id] ?? id;
      dispatch({
        type: 'update',
        fn: (cur) => ({
          ...cur,
          nodes: cur.nodes.map((n) => (n.id === nodeId ? (n.selected ? n : { ...n, selected: true }) : n.selected ? { ...n, selected: false } : n)),
          edges: cur.edges.map((e) => (e.selected ? { ...e, selected: false } : e)),
        }),
      });
    },
    [conversion.map],
  );

  // The conversion is reused while node data and ids stay the same (a drag), so it keys the bus list.
  // eslint-disable-next-line react-hooks/exhaustive-deps -- conversion stands for the nodes' ids and data
  const busList = useMemo(() => doc.nodes.filter(isBusNode).map((b) => ({ id: b.id, name: b.data.name, kvLL: b.data.kvLL })), [conversion]);
  const busNames = useMemo(() => busList.map((b) => b.name), [busList]);
  const isValidConnection = useCallback((c: Connection | WorkspaceEdge) => resolveConnection(c) !== null, [resolveConnection]);
  const onNodeDragStart = useCallback(() => {
    dragStart.current = docRef.current;
    setDragging(true);
  }, []);
  const onNodeDragStop = useCallback(() => {
    if (dragStart.current) dispatch({ type: 'mark', before: dragStart.current });
    dragStart.current = null;
    setDragging(false);
  }, []);
  const applySettings = useCallback(
    (s: StudySettings, kv: Record<string, number | undefined>) => {
      const cur = docRef.current;
      commit({
        ...cur,
        settings: s,
        nodes: cur.nodes.map((n) => {
          if (!isBusNode(n) || !(n.id in kv) || kv[n.id] === n.data.kvLL) return n;
          const data = { ...n.data };
          if (kv[n.id] === undefined) delete data.kvLL;
          else data.kvLL = kv[n.id];
          return { ...n, data };
        }),
      });
      setDialog(null);
    },
    [commit],
  );

  const layout = useMemo(() => readLayout(study.content.layout), [study.content.layout]);
  const statusText =
    live.status === 'solving' ? 'Solving…' : live.status === 'ok' ? `Solved in ${live.ms?.toFixed(1) ?? '–'} ms` : live.status === 'error' ? 'The circuit cannot be solved (see the note by the element)' : circuit.elements.length === 0 ? 'Add a source, a bus and loads to begin' : '';

  return (
    <CanvasViewContext.Provider value={view}>
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
          {readOnly ? <span className="rounded-[2px] bg-sunken px-1.5 text-[12px] font-semibold text-ink-muted">Read-only ({role})</span> : null}
          {dirty ? <span className="text-[12px] font-semibold text-caution">● Unsaved changes</span> : null}
        </div>

        <div role="toolbar" aria-label="Workspace tools" className="flex flex-wrap items-center gap-1.5 rounded-[3px] border border-rule bg-panel px-2 py-1">
          {readOnly ? null : (
            <>
              <Button size="sm" variant="primary" onClick={openSave} aria-label="Save study" disabled={conversion.problems.length > 0} title={conversion.problems.length > 0 ? 'Wire or delete unconnected elements first' : 'Save study (Ctrl+S)'}>
                Save study
              </Button>
              <Button size="sm" onClick={() => dispatch({ type: 'undo' })} disabled={hist.past.length === 0} aria-label="Undo" title="Undo (Ctrl+Z)">
                ↶ Undo
              </Button>
              <Button size="sm" onClick={() => dispatch({ type: 'redo' })} disabled={hist.future.length === 0} aria-label="Redo" title="Redo (Ctrl+Shift+Z)">
                ↷ Redo
              </Button>
              <span className="mx-1 h-5 w-px bg-rule" aria-hidden="true" />
            </>
          )}
          <Button size="sm" onClick={() => void rf.fitView({ padding: 0.15, duration: 200 })} aria-label="Fit view" title="Fit view (F)">
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
        {save.isError && !conflictOf(save.error) && dialog !== 'save' ? <p role="alert" className="text-[13px] text-danger">✕ The study was not saved: {save.error.message}</p> : null}

        <div className="flex h-[68vh] min-h-[460px] overflow-hidden rounded-[3px] border border-rule bg-paper">
          {readOnly ? null : <Palette onAdd={addItem} />}
          {/* A dragged node gets its own compositor layer, so moving it does not repaint the nodes around it (\_ keeps Tailwind from reading _ as a space). */}
          <div className="relative min-w-0 flex-1 [&_.react-flow\_\_node.dragging]:will-change-transform" aria-label="Diagram">
            <ReactFlow<WorkspaceNode, WorkspaceEdge>
              nodes={doc.nodes}
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
              onlyRenderVisibleElements={doc.nodes.length >= CULL_FROM_NODES}
              nodesDraggable={!readOnly}
              nodesConnectable={!readOnly}
              elementsSelectable
              deleteKeyCode={null}
              snapToGrid={snap}
              snapGrid={SNAP_GRID}
              defaultViewport={layout?.viewport}
              fitView={!layout?.viewport}
              fitViewOptions={FIT_VIEW_OPTIONS}
              minZoom={0.2}
              maxZoom={3}
              proOptions={PRO_OPTIONS}
              ariaLabelConfig={ARIA_LABEL_CONFIG}
            >
              <Background gap={20} size={1} color="#d3d0c6" />
              <MiniMap pannable zoomable ariaLabel="Minimap of the diagram" style={MINIMAP_STYLE} nodeColor={minimapColor} />
            </ReactFlow>
            {doc.nodes.length === 0 ? (
              <p className="pointer-events-none absolute inset-x-0 top-1/3 text-center text-sm text-ink-muted">
                {readOnly ? 'This study has no diagram yet.' : 'Add a source, a bus and loads from the palette, then drag from a port to a bus to wire them.'}
              </p>
            ) : null}
          </div>
          <PropertyPanel
            selection={selection}
            readOnly={readOnly}
            wiringStandard={doc.settings.wiringStandard}
            busNames={busNames}
            onElement={updateElement}
            onBus={updateBus}
            onToggleOpen={toggleOpen}
          />
        </div>

        <div className="overflow-auto">
          <ResultsPanel status={live.status} result={live.result} error={live.error} stale={live.stale} ms={live.ms} selection={selectedName} onSelect={selectById} standard={doc.settings.wiringStandard} privateMarker={PRIVATE_SEP} />
          <CasesCompare circuit={circuit} privateMarker={PRIVATE_SEP} />
        </div>
      </div>

      <SaveDialog open={dialog === 'save'} busy={save.isPending} error={save.isError && !conflictOf(save.error) ? save.error.message : undefined} onCancel={() => setDialog(null)} onSave={(m) => { setPendingMessage(m || undefined); doSave(m || undefined, baseVersion); }} />
      <ConflictDialog
        theirs={theirs}
        diff={theirs ? compareCircuits(circuit, theirs.content.circuit as unknown as CircuitInput) : { added: [], removed: [], changed: [] }}
        busy={save.isPending}
        onCancel={() => setTheirs(null)}
        onLoadTheirs={loadTheirs}
        onOverwrite={() => theirs && doSave(pendingMessage, theirs.version)}
      />
      <SettingsDialog open={dialog === 'settings'} settings={doc.settings} buses={busList} readOnly={readOnly} onClose={() => setDialog(null)} onApply={applySettings} />
      <ShortcutsDialog open={dialog === 'help'} onClose={() => setDialog(null)} />
      <LeaveDialog open={blocker.state === 'blocked'} onStay={() => blocker.reset?.()} onLeave={() => blocker.proceed?.()} />
    </CanvasViewContext.Provider>
  );
}
