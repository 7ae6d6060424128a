/**
 * An element: its symbol, id and a one-line summary, handles for its ports (bundled ports in ink,
 * single-conductor terminals labelled 1/2 or H1/H2), and after a solve its worst flag; problems
 * (unwired ports, engine errors naming it) are written beside it.
 */
import { Handle, Position, type NodeProps } from '@xyflow/react';
import { memo } from 'react';
import type { CircuitElementInput } from '../../../../shared/engine/index.ts';
import { elementPorts, type PortSide } from '../model/ports.ts';
import type { ElementNode } from '../model/types.ts';
import { useCanvasValue, useCanvasView, type ShiftReading } from './canvas-context.tsx';
import { flagShown, flagWords, LoadVoltageNote, loadVoltageNoteShown, severitySign } from '../results/diagram-marks.tsx';
import type { ElementOverlay } from '../results/overlays.ts';
import type { WiringStandard } from '../results/phase-style.ts';
import { ELEMENT_WORDS, ElementSymbol } from './symbols.tsx';

const NO_PROBLEMS: string[] = [];
const POSITION: Record<PortSide, Position> = { top: Position.Top, bottom: Position.Bottom, left: Position.Left, right: Position.Right };

/**
 * A short parameter line under the id, from the element as wired (`wired`), so the phases a load
 * sits on are those of its wires at render time; an unwired element says nothing of its phases.
 */
export function elementSummary(el: CircuitElementInput, wired = true): string {
  switch (el.type) {
    case 'source':
      return `${el.kvLL} kV ${el.connection ?? 'wye'}`;
    case 'splitPhaseSource':
      return `${el.voltsLN ?? 120}/${2 * (el.voltsLN ?? 120)} V`;
    case 'line':
      return `${el.length} ${el.lengthUnit ?? 'km'}`;
    case 'transformer':
      return `${el.kva} kVA ${el.connection ?? el.vectorGroup ?? ''}`;
    case 'splitPhaseTransformer':
      return `${el.kva} kVA${wired ? ` ${el.primary.join('–').toUpperCase()}` : ''}`;
    case 'load': {
      const spec = el.each ?? el.total;
      const kw = spec && 'kw' in spec ? `${spec.kw} kW` : '';
      const conn = el.connection === 'single' ? (wired ? (el.between ?? []).join('–').toUpperCase() : 'single-phase') : el.connection;
      return `${el.generation ? 'generation ' : ''}${conn} ${kw}`.trim();
    }
    case 'capacitorBank':
      return `${el.kvar} kvar`;
    case 'switch3':
      return el.closed === false ? 'open' : 'closed';
    case 'earthing':
      return `${typeof el.ohms === 'number' ? el.ohms : '≠0'} Ω`;
    case 'fault':
      return el.kind;
    default:
      return el.type;
  }
}

/** What the node draws of its overlay, as text (every value as formatted below). */
function elementShown(ov: ElementOverlay, standard: WiringStandard): string {
  return `${loadVoltageNoteShown(ov, standard)}|${ov.loadingPercent !== undefined ? ov.loadingPercent.toFixed(0) : '-'}|${flagShown(ov.worstFlag)}`;
}

/** Two overlays the node draws alike: a solve that changes this element's values only below the digits shown does not re-render it. */
export const sameElementShown = (standard: WiringStandard) => (a: ElementOverlay | undefined, b: ElementOverlay | undefined): boolean =>
  a === b || (a !== undefined && b !== undefined && elementShown(a, standard) === elementShown(b, standard));

export const ElementNodeView = memo(function ElementNodeView({ id, data, selected }: NodeProps<ElementNode>) {
  const view = useCanvasView();
  // Only this element's entries: a solve or an edit elsewhere that leaves what it shows of them unchanged does not re-render the node.
  const ov = useCanvasValue((v) => v.overlays?.elements[id], sameElementShown(view.wiringStandard));
  const stale = useCanvasValue((v) => v.stale);
  const problems = useCanvasValue((v) => v.problems[id]) ?? NO_PROBLEMS;
  const wired = useCanvasValue((v) => v.wiredOf[id]);
  const shift = useCanvasValue((v) => v.shifts[id]);
  const el = data.element;
  const ports = elementPorts(el);
  const flag = ov?.worstFlag;
  const sides = new Map<PortSide, number>();
  for (const p of ports) sides.set(p.side, (sides.get(p.side) ?? 0) + 1);
  const seen = new Map<PortSide, number>();
  return (
    <div className="relative w-[64px]" aria-label={`${ELEMENT_WORDS[el.type] ?? el.type} ${id}`}>
      <svg width={64} height={64} viewBox="0 0 64 64" className={selected ? 'text-accent' : 'text-ink'} aria-hidden="true">
        <ElementSymbol element={el} />
      </svg>
      {ports.map((p) => {
        const count = sides.get(p.side) ?? 1;
        const k = seen.get(p.side) ?? 0;
        seen.set(p.side, k + 1);
        const offset = count === 1 ? 32 : 16 + (32 * k) / (count - 1);
        const horizontal = p.side === 'top' || p.side === 'bottom';
        return (
          <Handle
            key={p.id}
            id={p.id}
            type="source"
            position={POSITION[p.side]}
            style={horizontal ? { left: offset } : { top: offset }}
            className={p.mode === 'bundle' ? 'h-3! w-5! rounded-[2px]! border-2! border-panel! bg-ink!' : 'h-3! w-3! rounded-full! border-2! border-ink! bg-panel!'}
            aria-label={`${id}: ${p.label ? `terminal ${p.label}` : p.field === 'to' ? 'receiving end' : p.field === 'from' ? 'sending end' : 'port'}`}
            title={p.label || p.field}
          >
            {p.label ? <span className="num pointer-events-none absolute -top-3.5 left-3 text-[9px] font-semibold text-ink-muted">{p.label}</span> : null}
          </Handle>
        );
      })}
      <div className="pointer-events-none absolute left-[68px] top-2 w-max max-w-[150px] text-[11px] leading-tight">
        <div className="num font-semibold text-ink">{id}</div>
        <div className="num text-ink-muted" data-testid={`summary-${id}`}>
          {elementSummary(wired ?? el, wired !== undefined)}
        </div>
        {shift !== undefined ? <ShiftNote shift={shift} /> : null}
        <LoadVoltageNote overlay={ov} standard={view.wiringStandard} />
        {ov?.loadingPercent !== undefined ? <div className={`num text-ink-muted ${stale ? 'line-through opacity-60' : ''}`}>{ov.loadingPercent.toFixed(0)} % loaded</div> : null}
        {flag ? (
          <div className={`font-semibold ${stale ? 'line-through opacity-60 ' : ''}${flag.severity === 'violation' ? 'text-danger' : flag.severity === 'warning' ? 'text-caution' : 'text-ink-muted'}`} title={flag.message}>
            {severitySign(flag.severity)} {flagWords(flag)}
          </div>
        ) : null}
      </div>
      {view.pins[id] ? (
        <span className="num absolute -left-2 -top-2 rounded-full border border-review bg-review-soft px-1 text-[10px] font-semibold text-review" title={`${view.pins[id]} comment(s) on ${id}`}>
          <span aria-hidden="true">✎</span> {view.pins[id]}
        </span>
      ) : null}
      {problems.length > 0 ? (
        <div role="note" className="absolute left-0 top-[68px] w-[210px] rounded-[2px] border border-danger bg-danger-soft px-1.5 py-1 text-[11px] leading-snug text-danger">
          {problems.map((m) => (
            <p key={m}>{m}</p>
          ))}
        </div>
      ) : null}
    </div>
  );
});

function ShiftNote({ shift }: { shift: ShiftReading }) {
  const m = shift.measuredDeg;
  return (
    <div className="num text-ink">
      {shift.lvLagsHvDeg !== undefined ? (
        <div title={shift.convention === 'iec' ? `IEC clock number (${shift.vectorGroup})` : 'North American rule (IEEE C57.12.00)'}>
          LV lags HV {shift.lvLagsHvDeg}° ({shift.convention === 'iec' ? shift.vectorGroup : 'N. Am.'})
        </div>
      ) : null}
      <div title="Measured: angle of the LV phase-A line-to-neutral voltage minus that of the HV side, under load">
        V<sub>AN</sub> LV−HV {m > 0 ? '+' : m < 0 ? '−' : ''}
        {Math.abs(m).toFixed(1)}°
      </div>
    </div>
  );
}
