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

/** Fits the view to every node together with the labels drawn beside it, clear of the minimap. */
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
  // The minimap covers the bottom-right corner. The diagram is fitted to the whole pane when it then
  // stays clear of the minimap, else to the larger of the areas above it and left of it.
  const mm = container?.querySelector('.react-flow__minimap')?.getBoundingClientRect();
  const k = 1.12;
  const zoomFor = (aw: number, ah: number) => Math.max(0.2, Math.min(MAX_FIT_ZOOM, aw / (w * k), ah / (h * k)));
  // An area of the pane (pane-relative), its zoom, and where the diagram's centre goes in it.
  type Area = { x: number; y: number; w: number; h: number };
  let area: Area = { x: 0, y: 0, w: pane.width, h: pane.height };
  if (mm && mm.height > 0 && mm.width > 0) {
    const gap = 8;
    const mmLeft = mm.left - pane.left - gap;
    const mmTop = mm.top - pane.top - gap;
    const z = zoomFor(pane.width, pane.height);
    const clear = pane.width / 2 + (w * k * z) / 2 <= mmLeft || pane.height / 2 + (h * k * z) / 2 <= mmTop;
    if (!clear) {
      const above: Area = { x: 0, y: 0, w: pane.width, h: Math.max(1, mmTop) };
      const left: Area = { x: 0, y: 0, w: Math.max(1, mmLeft), h: pane.height };
      area = zoomFor(left.w, left.h) > zoomFor(above.w, above.h) ? left : above;
    }
  }
  const zoom = zoomFor(area.w, area.h);
  // setCenter puts a flow point at the pane's centre: the one that puts the diagram's centre at the area's.
  const dx = (pane.width / 2 - (area.x + area.w / 2)) / zoom;
  const dy = (pane.height / 2 - (area.y + area.h / 2)) / zoom;
  void rf.setCenter(minX + w / 2 + dx, minY + h / 2 + dy, { zoom, duration });
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
