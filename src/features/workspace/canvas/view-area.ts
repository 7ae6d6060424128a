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

/** Fits the view to every node together with the labels drawn beside it, above the minimap. */
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
  // A small diagram is not blown up past 1.5× (fitBounds alone would zoom to the flow's maximum).
  const pane = container?.querySelector('.react-flow')?.getBoundingClientRect();
  const w = maxX - minX;
  const h = maxY - minY;
  if (!pane || pane.width === 0) {
    void rf.fitBounds({ x: minX, y: minY, width: w, height: h }, { padding: 0.06, duration });
    return;
  }
  // The minimap covers the bottom-right corner: fit into the height above it.
  const mm = container?.querySelector('.react-flow__minimap')?.getBoundingClientRect();
  const below = mm && mm.height > 0 ? pane.bottom - mm.top + 8 : 0;
  const zoom = Math.max(0.2, Math.min(MAX_FIT_ZOOM, pane.width / (w * 1.12), (pane.height - below) / (h * 1.12)));
  void rf.setCenter(minX + w / 2, minY + h / 2 + below / 2 / zoom, { zoom, duration });
}

/** Largest zoom a fit gives. */
export const MAX_FIT_ZOOM = 1.5;

/** Pans (at the same zoom) so that every box in `boxes` is in view, when one is not. */
export function reveal(rf: Flow, container: HTMLElement | null, boxes: Rect[]): void {
  const vp = visibleArea(rf, container);
  if (!vp || boxes.length === 0) return;
  const minX = Math.min(...boxes.map((b) => b.x));
  const minY = Math.min(...boxes.map((b) => b.y));
  const maxX = Math.max(...boxes.map((b) => b.x + b.w));
  const maxY = Math.max(...boxes.map((b) => b.y + b.h));
  const v = vp.view;
  const blocked = vp.covered.some((c) => boxes.some((b) => b.x < c.x + c.w && b.x + b.w > c.x && b.y < c.y + c.h && b.y + b.h > c.y));
  if (!blocked && minX >= v.x && minY >= v.y && maxX <= v.x + v.w && maxY <= v.y + v.h) return;
  void rf.setCenter((minX + maxX) / 2, (minY + maxY) / 2, { zoom: rf.getZoom(), duration: 200 });
}
