/**
 * Wyeward's own diagram symbols, drawn after the shapes of IEC 60617 / IEEE 315: a circle with a
 * sine for a source, interlaced circles for a transformer, a rectangle for an impedance (load,
 * line), plates for a capacitor, a blade for a switch, the earth sign, a lightning arrow for a
 * fault. 64 × 64 user units, stroke in currentColor so a selected node can recolour them.
 */
import { memo } from 'react';
import type { CircuitElementInput } from '../../../../shared/engine/index.ts';

const S = { fill: 'none', stroke: 'currentColor', strokeWidth: 2, strokeLinecap: 'round' as const, strokeLinejoin: 'round' as const };

function Sine({ cx, cy, w = 20, h = 7 }: { cx: number; cy: number; w?: number; h?: number }) {
  const x0 = cx - w / 2;
  return <path {...S} d={`M ${x0} ${cy} C ${x0 + w / 6} ${cy - h * 1.3}, ${x0 + w / 3} ${cy - h * 1.3}, ${cx} ${cy} S ${x0 + (5 * w) / 6} ${cy + h * 1.3}, ${x0 + w} ${cy}`} />;
}

/** Winding mark: Δ or Y (with an earth tick for an earthed star). */
function Winding({ kind, cx, cy }: { kind: 'D' | 'Y' | 'Yn'; cx: number; cy: number }) {
  if (kind === 'D') return <path {...S} strokeWidth={1.5} d={`M ${cx} ${cy - 5} L ${cx + 5} ${cy + 4} L ${cx - 5} ${cy + 4} Z`} />;
  return (
    <g>
      <path {...S} strokeWidth={1.5} d={`M ${cx} ${cy} L ${cx} ${cy + 6} M ${cx} ${cy} L ${cx - 5} ${cy - 4} M ${cx} ${cy} L ${cx + 5} ${cy - 4}`} />
      {kind === 'Yn' ? <path {...S} strokeWidth={1.5} d={`M ${cx - 3} ${cy + 8} L ${cx + 3} ${cy + 8}`} /> : null}
    </g>
  );
}

function windingsOf(el: CircuitElementInput): ['D' | 'Y' | 'Yn', 'D' | 'Y' | 'Yn'] {
  if (el.type !== 'transformer') return ['Y', 'Y'];
  const side = (s: string): 'D' | 'Y' | 'Yn' => (s.startsWith('D') || s.startsWith('d') ? 'D' : /^(YN|yn|Yg)/.test(s) ? 'Yn' : 'Y');
  if (el.connection) {
    const [hv, lv] = el.connection.split('-');
    return [side(hv), side(lv)];
  }
  const m = /^(YN|Y|D)(yn|y|d)/.exec(el.vectorGroup ?? '');
  return m ? [side(m[1]), side(m[2])] : ['Y', 'Y'];
}

/** The symbol of an element kind (by its parameters where they change the drawing). */
export const ElementSymbol = memo(function ElementSymbol({ element }: { element: CircuitElementInput }) {
  switch (element.type) {
    case 'source':
      return (
        <g>
          <circle {...S} cx={32} cy={28} r={17} />
          <Sine cx={32} cy={28} />
          <path {...S} d="M 32 45 L 32 64" />
        </g>
      );
    case 'splitPhaseSource':
      return (
        <g>
          <circle {...S} cx={32} cy={26} r={16} />
          <Sine cx={32} cy={26} w={18} />
          <path {...S} d="M 22 64 L 22 48 M 42 64 L 42 48 M 32 42 L 32 64" strokeWidth={1.5} />
        </g>
      );
    case 'line': {
      // Series impedance with tick marks, one per conductor (the multi-line convention of IEC 60617).
      return (
        <g>
          <path {...S} d="M 32 0 L 32 18 M 32 46 L 32 64" />
          <rect {...S} x={24} y={18} width={16} height={28} rx={1} />
          {[0, 1, 2, 3].map((i) => (
            <path key={i} {...S} strokeWidth={1.4} d={`M 38 ${52 + i * 3} L 48 ${48 + i * 3}`} />
          ))}
        </g>
      );
    }
    case 'transformer': {
      const [hv, lv] = windingsOf(element);
      return (
        <g>
          <path {...S} d="M 32 0 L 32 8 M 32 56 L 32 64" />
          <circle {...S} cx={32} cy={23} r={15} />
          <circle {...S} cx={32} cy={41} r={15} />
          <Winding kind={hv} cx={32} cy={17} />
          <Winding kind={lv} cx={32} cy={46} />
        </g>
      );
    }
    case 'splitPhaseTransformer':
      return (
        <g>
          <path {...S} d="M 24 0 L 24 10 M 40 0 L 40 10 M 32 56 L 32 64" />
          <circle {...S} cx={32} cy={23} r={15} />
          <circle {...S} cx={32} cy={41} r={15} />
          <circle cx={32} cy={52} r={2.2} fill="currentColor" />
        </g>
      );
    case 'load':
      return (
        <g>
          {element.connection === 'single' ? <path {...S} d="M 16 0 L 16 12 L 26 12 M 48 0 L 48 12 L 38 12" /> : <path {...S} d="M 32 0 L 32 12" />}
          <rect {...S} x={20} y={12} width={24} height={36} rx={1} />
          <path {...S} d="M 32 48 L 32 60 M 26 60 L 38 60" />
          <path {...S} strokeWidth={1.4} d="M 26 22 L 38 26 L 26 30 L 38 34 L 26 38" />
        </g>
      );
    case 'capacitorBank':
      return (
        <g>
          <path {...S} d="M 32 0 L 32 26 M 32 38 L 32 60" />
          <path {...S} strokeWidth={3} d="M 18 26 L 46 26 M 18 38 L 46 38" />
        </g>
      );
    case 'switch3': {
      const closed = element.closed !== false && (element.open ?? []).length === 0;
      return (
        <g>
          <path {...S} d="M 32 0 L 32 18 M 32 46 L 32 64" />
          <circle cx={32} cy={46} r={2.5} fill="currentColor" />
          <path {...S} strokeWidth={2.4} d={closed ? 'M 32 46 L 32 18' : 'M 32 46 L 46 22'} />
          <path {...S} d="M 26 18 L 38 18" />
        </g>
      );
    }
    case 'earthing':
      return (
        <g>
          <path {...S} d="M 32 0 L 32 30" />
          <path {...S} d="M 16 30 L 48 30 M 21 38 L 43 38 M 26 46 L 38 46" />
        </g>
      );
    case 'fault':
      return (
        <g>
          <path {...S} d="M 32 0 L 32 10" />
          <path {...S} d="M 36 10 L 24 32 L 38 32 L 28 56" />
          <path {...S} d="M 22 50 L 28 57 L 33 49" />
        </g>
      );
    default:
      return <rect {...S} x={12} y={12} width={40} height={40} strokeDasharray="4 3" />;
  }
});

/** Words for an element kind (palette, node captions, accessible names). */
export const ELEMENT_WORDS: Record<string, string> = {
  source: 'Source',
  splitPhaseSource: 'Split-phase source',
  line: 'Line / cable',
  transformer: 'Transformer bank',
  splitPhaseTransformer: 'Single-phase transformer (centre-tapped)',
  load: 'Load',
  capacitorBank: 'Capacitor bank',
  switch3: 'Switch',
  earthing: 'Earth electrode',
  fault: 'Fault',
};
