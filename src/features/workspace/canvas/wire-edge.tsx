/**
 * A connection between an element port and a bus. A bundled wire is drawn heavy in ink; a
 * single-conductor wire in its phase colour and dash with its label. Opened conductors are written
 * on the wire ("N open") and the wire is drawn broken; after a solve the currents of that port sit
 * beside it.
 */
import { BaseEdge, EdgeLabelRenderer, getSmoothStepPath, type EdgeProps } from '@xyflow/react';
import { memo } from 'react';
import type { ElementOverlay } from '../results/overlays.ts';
import { phaseStyle } from '../results/phase-style.ts';
import { elementPorts, isBundleHandle } from '../model/ports.ts';
import type { Conductor, WorkspaceEdge } from '../model/types.ts';
import { useCanvasValue, useCanvasView } from './canvas-context.tsx';

function amps(a: number): string {
  return a >= 100 ? a.toFixed(0) : a >= 10 ? a.toFixed(1) : a.toFixed(2);
}

/** What a wire draws of its element's overlay, as text: every current (port, conductor, amps as formatted below). */
function wireShown(ov: ElementOverlay): string {
  let s = '';
  for (const c of ov.currents) s += `${c.port}|${c.conductor}|${amps(c.mag)};`;
  return s;
}

/** Two overlays a wire draws alike: a solve that changes its currents only below the digits shown does not re-render it. */
export const sameWireShown = (a: ElementOverlay | undefined, b: ElementOverlay | undefined): boolean => a === b || (a !== undefined && b !== undefined && wireShown(a) === wireShown(b));

export const WireEdgeView = memo(function WireEdgeView(props: EdgeProps<WorkspaceEdge>) {
  const { id, source, sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition, targetHandleId, sourceHandleId, data, selected } = props;
  const view = useCanvasView();
  // Only the entries of this wire's element and bus: a solve that leaves what it shows of them unchanged does not re-render the wire.
  const ov = useCanvasValue((v) => v.overlays?.elements[source], sameWireShown);
  const element = useCanvasValue((v) => v.elementOf[source]);
  const busName = useCanvasValue((v) => v.busNameOf[props.target]) ?? '';
  const stale = useCanvasValue((v) => v.stale);
  const [path, lx, ly] = getSmoothStepPath({ sourceX, sourceY, targetX, targetY, sourcePosition, targetPosition, borderRadius: 6 });
  const open = data?.open ?? [];
  const single = !isBundleHandle(targetHandleId);
  const st = single ? phaseStyle(targetHandleId ?? '', view.wiringStandard) : null;
  const stroke = selected ? 'var(--color-accent)' : st ? st.color : 'var(--color-ink)';

  // Currents of this port (engine port index = order of distinct element fields).
  let currents: { conductor: string; mag: number }[] = [];
  if (ov && element) {
    const ports = elementPorts(element);
    const fields = [...new Set(ports.map((p) => p.field))];
    const port = ports.find((p) => p.id === sourceHandleId);
    const idx = port ? fields.indexOf(port.field) : -1;
    // A two-terminal element carries the same current in and out: label its first terminal only.
    currents = port?.terminal === 1 ? [] : ov.currents.filter((c) => c.port === idx && (!single || c.conductor === targetHandleId));
  }

  // One click on the wire opens (or closes) its neutral, or the conductor of a single-conductor wire.
  const toggled: Conductor | null = single ? ((targetHandleId ?? null) as Conductor | null) : 'n';
  const wireName = `connection ${source} to bus ${busName}`;
  const isOpen = toggled !== null && open.includes(toggled);
  const words = toggled === null ? '' : toggled === 'n' ? 'neutral' : toggled === '1' || toggled === '2' ? `leg ${toggled}` : `phase ${phaseStyle(toggled, view.wiringStandard).label}`;

  const control =
    view.toggleOpen && toggled ? (
      <button
        type="button"
        className={`nodrag nopan num mr-1 rounded-full border px-1 text-[9px] font-semibold leading-[13px] ${isOpen ? 'border-danger bg-danger-soft text-danger' : 'border-rule-strong bg-panel text-ink-muted hover:text-ink'}`}
        style={{ pointerEvents: 'all' }}
        aria-label={`${isOpen ? 'Close' : 'Open'} ${words} of ${wireName}`}
        title={`${isOpen ? 'Close' : 'Open'} the ${words} of this connection`}
        onClick={(e) => {
          e.stopPropagation();
          view.toggleOpen?.(id, toggled);
        }}
      >
        {phaseStyle(toggled, view.wiringStandard).label}
        <span aria-hidden="true">{isOpen ? ' ⊘' : ' ✂'}</span>
      </button>
    ) : null;

  const loneControl = open.length === 0 && currents.length === 0 && control !== null;

  return (
    <>
      <BaseEdge id={id} path={path} style={{ stroke, strokeWidth: single ? 2 : 3.2, strokeDasharray: open.length > 0 ? '2 5' : st?.dash || undefined }} interactionWidth={16} />
      <EdgeLabelRenderer>
        {open.length > 0 || currents.length > 0 || control ? (
          // One box per wire: the one-click open control, what is open, the currents. A box with values
          // sits on the wire's element-side leg; a lone control (the second terminal of a single-phase
          // load, which carries no currents of its own) sits just above the middle of the wire, so it
          // does not land on the values of the wire beside it (the load's first terminal).
          <div
            className="nodrag nopan num pointer-events-none absolute rounded-[2px] border border-rule bg-panel/95 px-1 text-[10px] leading-tight"
            style={{ transform: loneControl ? `translate(-50%, -100%) translate(${lx}px, ${ly - 1}px)` : `translate(-50%, -50%) translate(${lx}px, ${(ly + sourceY) / 2}px)` }}
          >
            {open.length > 0 ? (
              <div className="font-semibold text-danger">
                {control}
                {open.map((c) => phaseStyle(c, view.wiringStandard).label).join(', ')} open
              </div>
            ) : (
              control
            )}
            {currents.map((c) => (
              <span key={c.conductor} className={`mr-1 whitespace-nowrap ${stale ? 'line-through opacity-60' : ''}`} style={{ color: phaseStyle(c.conductor, view.wiringStandard).color }}>
                {phaseStyle(c.conductor, view.wiringStandard).label} {amps(c.mag)} A
              </span>
            ))}
          </div>
        ) : null}
      </EdgeLabelRenderer>
    </>
  );
});
