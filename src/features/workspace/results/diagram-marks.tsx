/**
 * What the diagram writes beside buses and loads after a solve: every phase voltage of a bus with
 * its own high or low mark (both the high and the low phases, not only the worst), a load's own
 * terminal voltage in V and per unit of its rating with its verdict ("167.3 V = 1.39 pu ✖"), and
 * flags in words rather than codes.
 */
import type { Flag } from '../../../../shared/engine/index.ts';
import { branchLabel, formatPu, STATUS_TEXT } from './load-table.tsx';
import type { BusOverlay, ElementOverlay } from './overlays.ts';
import { phaseStyle, type WiringStandard } from './phase-style.ts';

const FLAG_WORDS: Record<Flag['code'], string> = {
  'voltage-high': 'high voltage',
  'voltage-low': 'low voltage',
  unbalance: 'unbalance',
  'neutral-shift': 'neutral shift',
  overload: 'overload',
  floating: 'no path to earth',
  'load-low-voltage': 'draws less than rated',
  'load-voltage-high': 'over voltage',
  'load-voltage-low': 'under voltage',
};

/** A flag in a few words, by its cause where it has one ("neutral lost", "neutral floating"). */
export function flagWords(flag: Flag): string {
  if (flag.code === 'neutral-shift' && flag.cause === 'open-neutral') return 'neutral lost';
  if (flag.code === 'neutral-shift' && flag.cause === 'floating-neutral') return 'neutral floating';
  if (flag.code === 'neutral-shift' && flag.cause === 'fault') return 'neutral shift (fault)';
  return FLAG_WORDS[flag.code] ?? 'flag';
}

/** Sign of a flag severity as the diagram draws it. */
export const severitySign = (s: Flag['severity']): string => (s === 'violation' ? '✖' : s === 'warning' ? '▲' : 'ⓘ');
const severityClass = (s: Flag['severity']): string => (s === 'violation' ? 'text-danger' : s === 'warning' ? 'text-caution' : 'text-ink-muted');

function fmt(v: number): string {
  return v >= 100 ? v.toFixed(1) : v >= 10 ? v.toFixed(2) : v.toFixed(3);
}

/** Phase voltages of a bus, each marked high (▲) or low (▼) when it is outside the limit set. */
export function BusPhaseVoltages({ overlay, standard }: { overlay: BusOverlay; standard: WiringStandard }) {
  return (
    <>
      {Object.entries(overlay.vln).map(([ph, v]) => {
        const flag = overlay.flags.find((f) => (f.code === 'voltage-high' || f.code === 'voltage-low') && f.conductor === ph);
        const high = flag?.code === 'voltage-high';
        return (
          <span key={ph} data-phase-mark={flag ? (high ? 'high' : 'low') : 'ok'} className={flag ? `font-semibold ${severityClass(flag.severity)}` : undefined} title={flag?.message}>
            {phaseStyle(ph, standard).label} {fmt(v)} V
            {flag ? (
              <>
                <span aria-hidden="true">{high ? ' ▲' : ' ▼'}</span>
                <span className="sr-only">{high ? ' high' : ' low'}</span>
              </>
            ) : null}
          </span>
        );
      })}
    </>
  );
}

/** What `BusPhaseVoltages` draws of an overlay, as text: overlays with the same text are drawn alike. */
export function busPhaseVoltagesShown(overlay: BusOverlay): string {
  let s = '';
  for (const [ph, v] of Object.entries(overlay.vln)) {
    const flag = overlay.flags.find((f) => (f.code === 'voltage-high' || f.code === 'voltage-low') && f.conductor === ph);
    s += `${ph} ${fmt(v)}|${flag ? `${flag.code}|${flag.severity}|${flag.message}` : ''};`;
  }
  return s;
}

/** What a flag mark draws of a flag (sign, words, the message as its title), as text. */
export function flagShown(flag: Flag | undefined): string {
  return flag ? `${flag.severity}|${flagWords(flag)}|${flag.message}` : '';
}

/** A load's own terminal voltage per branch: "167.3 V = 1.39 pu ✖". */
export function LoadVoltageNote({ overlay, standard }: { overlay: ElementOverlay | undefined; standard: WiringStandard }) {
  const branches = overlay?.loadBranches;
  if (!branches || branches.length === 0) return null;
  return (
    <div className="num" data-testid={`load-voltage-${overlay.id}`}>
      {branches.map((b) => {
        const s = STATUS_TEXT[b.status];
        const bad = b.status !== 'ok' && b.status !== 'unrated';
        return (
          // Wraps after "V =" so the note stays clear of the next element on the diagram.
          <div key={b.branch} className={`max-w-[78px] ${bad ? s.cls : 'text-ink'}`} title={`${branchLabel(b, standard)}: ${s.words}`}>
            {branches.length > 1 ? `${branchLabel(b, standard)} ` : ''}
            {fmt(b.voltage.mag)} V{b.pu !== undefined ? ` = ${formatPu(b.pu)} pu` : ''}
            {bad ? (
              <>
                <span aria-hidden="true"> {s.sign}</span>
                <span className="sr-only"> {s.words}</span>
              </>
            ) : null}
          </div>
        );
      })}
    </div>
  );
}

/** What `LoadVoltageNote` draws of an overlay, as text: overlays with the same text are drawn alike. */
export function loadVoltageNoteShown(overlay: ElementOverlay | undefined, standard: WiringStandard): string {
  const branches = overlay?.loadBranches;
  if (!branches || branches.length === 0) return '';
  let s = `${overlay.id}:${branches.length}:`;
  for (const b of branches) s += `${b.branch}|${branchLabel(b, standard)}|${b.status}|${fmt(b.voltage.mag)}|${b.pu !== undefined ? formatPu(b.pu) : '-'};`;
  return s;
}
