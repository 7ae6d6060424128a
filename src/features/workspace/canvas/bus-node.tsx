/**
 * A bus: a heavy bar with a bundled handle on top and bottom (all conductors in one wire) and one
 * handle per conductor underneath, each coloured by the wiring standard and labelled, so colour is
 * never the only cue. After a solve it shows line-to-neutral voltages and the neutral shift.
 */
import { Handle, Position, type NodeProps } from '@xyflow/react';
import { memo } from 'react';
import { phaseStyle } from '../results/phase-style.ts';
import { busConductors, type BusNode } from '../model/types.ts';
import { useCanvasValue, useCanvasView } from './canvas-context.tsx';
import { BusPhaseVoltages, busPhaseVoltagesShown, flagShown, flagWords, severitySign } from '../results/diagram-marks.tsx';
import type { BusOverlay } from '../results/overlays.ts';

export const BUS_WIDTH = 260;
const HANDLE = 'h-3! w-3! rounded-full! border-2! border-panel!';

function fmt(v: number): string {
  return v >= 100 ? v.toFixed(1) : v >= 10 ? v.toFixed(2) : v.toFixed(3);
}

/** What the node draws of its overlay, as text (every value as formatted below). */
function busShown(ov: BusOverlay): string {
  return `${busPhaseVoltagesShown(ov)}|${ov.neutralShiftV !== undefined ? fmt(ov.neutralShiftV) : '-'}|${ov.neutralShiftPercent !== undefined && ov.neutralShiftPercent > 10}|${ov.floating}|${flagShown(ov.worstFlag)}`;
}

/** Two overlays the node draws alike: a solve that changes this bus's values only below the digits shown does not re-render it. */
export const sameBusShown = (a: BusOverlay | undefined, b: BusOverlay | undefined): boolean => a === b || (a !== undefined && b !== undefined && busShown(a) === busShown(b));

export const BusNodeView = memo(function BusNodeView({ data, selected }: NodeProps<BusNode>) {
  const view = useCanvasView();
  // Only this bus's overlay: a solve that leaves what it shows unchanged does not re-render the node.
  const ov = useCanvasValue((v) => v.overlays?.buses[data.name], sameBusShown);
  const stale = useCanvasValue((v) => v.stale);
  const conds = busConductors(data.splitPhase);
  const flag = ov?.worstFlag;
  return (
    <div className="relative" style={{ width: BUS_WIDTH }} aria-label={`Bus ${data.name}`}>
      <div className="mb-1 flex w-max items-baseline gap-2 text-[12px]">
        <span className="num font-semibold text-ink">{data.name}</span>
        <span className="num text-ink-muted">{data.kvLL !== undefined ? `${data.kvLL} kV` : data.splitPhase ? '120/240 V' : ''}</span>
        {ov ? (
          <div className={`num flex w-max gap-x-2 text-[10.5px] leading-tight text-ink-muted ${stale ? 'line-through opacity-60' : ''}`} data-stale={stale || undefined} title={stale ? 'Stale: from before the last edit, which cannot be solved' : undefined}>
            {stale ? <span className="font-semibold text-caution no-underline">stale</span> : null}
            <BusPhaseVoltages overlay={ov} standard={view.wiringStandard} />
            {ov.neutralShiftV !== undefined ? (
              <span className={`rounded-[2px] px-1 font-semibold ${ov.neutralShiftPercent !== undefined && ov.neutralShiftPercent > 10 ? 'bg-danger-soft text-danger' : 'bg-sunken text-ink'}`} title="Neutral-to-earth voltage (neutral shift)">
                N–E {fmt(ov.neutralShiftV)} V
              </span>
            ) : null}
            {ov.floating ? <span className="font-semibold text-caution">floating</span> : null}
          </div>
        ) : null}
        {flag ? (
          <span className={`ml-auto rounded-[2px] px-1 text-[11px] font-semibold ${flag.severity === 'violation' ? 'bg-danger-soft text-danger' : flag.severity === 'warning' ? 'bg-caution-soft text-caution' : 'bg-sunken text-ink-muted'}`} title={flag.message}>
            {severitySign(flag.severity)} {flagWords(flag)}
          </span>
        ) : null}
      </div>
      <div className={`h-2.5 rounded-[1px] ${selected ? 'bg-accent' : 'bg-ink'}`} />
      <Handle id="all" type="source" position={Position.Top} style={{ left: 24, top: 20 }} className="h-3! w-5! rounded-[2px]! border-2! border-panel! bg-ink!" aria-label={`${data.name}: all conductors (top)`} title="All conductors" />
      <Handle id="allb" type="source" position={Position.Bottom} style={{ left: 24, top: 31 }} className="h-3! w-5! rounded-[2px]! border-2! border-panel! bg-ink!" aria-label={`${data.name}: all conductors (bottom)`} title="All conductors" />
      {conds.map((c, i) => {
        const st = phaseStyle(c, view.wiringStandard);
        const left = 80 + i * 48;
        return (
          <div key={c}>
            <Handle id={c} type="source" position={Position.Bottom} style={{ left, top: 31, background: st.color }} className={HANDLE} aria-label={`${data.name}: conductor ${st.label}`} title={`${st.label} (${st.colorName})`} />
            <span className="num pointer-events-none absolute text-[10px] font-semibold" style={{ left: left + 8, top: 32, color: st.color }}>
              {st.label}
            </span>
          </div>
        );
      })}
      <div className="h-5" />
    </div>
  );
});
