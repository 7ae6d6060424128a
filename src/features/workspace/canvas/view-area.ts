/**
 * Where the user looks on the canvas, in flow coordinates: the visible area less the minimap (new
 * and pasted nodes land there), and a fit that keeps every label in view (the text beside a node
 * reaches past the node's own box, which xyflow's fit measures).
 */
import type { ReactFlowInstance } from '@xyflow/react';
import type { Rect, Viewport } from '../model/document.ts';
import type { WorkspaceEdge, WorkspaceNode } from '../model/types.ts';

type Flow = ReactFlowInstance<WorkspaceNode, WorkspaceEdge>;

function toFlowRect(rf: Flow, r: DOMRect): Rect {
  const a = rf.screenToFlowPosition({ x: r.left, y: r.top }, { snapToGrid: false });
  const b = rf.screenToFlowPosition({ x: r.right, y: r.bottom }, { snapToGrid: false });
  return { x: a.x, y: a.y, w: b.x - a.x, h: b.y - a.y };
}

/** The visible canvas of `container` and the minimap over it, in flow coordinates; null before layout. */
export function visibleArea(rf: Flow, container: HTMLElement | null): Viewport | null {
  const pane = container?.querySelector('.react-flow');
  if (!pane) return null;
  const r = pane.getBoundingClientRect();
  if (r.width === 0 || r.height === 0) return null;
  const minimap = container?.querySelector('.react-flow__minimap');
  const covered = minimap ? [toFlowRect(rf, minimap.getBoundingClientRect())] : [];
  // Keep a margin inside the edges (handles and labels of a node at the border stay reachable).
  const inner = new DOMRect(r.left + 16, r.top + 16, r.width - 32, r.height - 32);
  return { view: toFlowRect(rf, inner), covered };
}

/** Fits the view to every node together with the labels drawn beside it. */
export function fitWithLabels(rf: Flow, container: HTMLElement | null, duration = 200): void {
  const nodes = rf.getNodes();
  if (nodes.length === 0) return;
  const b = rf.getNodesBounds(nodes);
  let minX = b.x;
  let minY = b.y;
  let maxX = b.x + b.width;
  let maxY = b.y + b.height;
  // Rendered nodes: the union of their descendants' boxes (labels overflow the node's own box).
  for (const el of container?.querySelectorAll('.react-flow__node, .react-flow__node *, .react-flow__edgelabel-renderer > *') ?? []) {
    const r = el.getBoundingClientRect();
    if (r.width === 0 && r.height === 0) continue;
    const f = toFlowRect(rf, r);
    minX = Math.min(minX, f.x);
    minY = Math.min(minY, f.y);
    maxX = Math.max(maxX, f.x + f.w);
    maxY = Math.max(maxY, f.y + f.h);
  }
  void rf.fitBounds({ x: minX, y: minY, width: maxX - minX, height: maxY - minY }, { padding: 0.06, duration });
}
