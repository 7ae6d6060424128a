/**
 * The lost-neutral alert shown right above the diagram (role "alert"; above it, not over it, so it
 * hides nothing drawn): for each bus whose neutral-to-earth
 * voltage passes its limit while its neutral is open upstream or floating, it says so, names the
 * loads over and under voltage with their own terminal voltages, and carries the caution.
 * A fault study's shift or an intact neutral under unbalance does not raise it (their flags word
 * those causes).
 */
import { useMemo } from 'react';
import type { CircuitResult, LoadBranchResult } from '../../../../shared/engine/index.ts';
import { formatMagnitude } from './format.ts';
import { formatPu } from './load-table.tsx';
import { generatedNameWords, publicBus } from './private-names.ts';

/** A load branch named in the alert. */
export interface HazardLoad {
  id: string;
  /** Branch label for a multi-branch load ('a', 'ab', …). */
  branch?: string;
  volts: number;
  pu?: number;
}

/** One bus with a lost or floating neutral. */
export interface NeutralHazard {
  cause: 'open-neutral' | 'floating-neutral';
  /** "bus HOUSE", or "the connection of LOAD1 on bus B1" for an element's own opened connection. */
  bus: string;
  /** Where the neutral is open, in words (lines and switches the user drew; a connection). */
  openAt: string[];
  neutralVolts: number;
  neutralPercent?: number;
  over: HazardLoad[];
  under: HazardLoad[];
}

const isOver = (s: LoadBranchResult['status']) => s === 'violation-high' || s === 'warning-high';
const isUnder = (s: LoadBranchResult['status']) => s === 'violation-low' || s === 'warning-low';

/**
 * Buses whose neutral shift is over the limit with an open or floating neutral: the buses the user
 * drew, and the terminal of an element whose own neutral connection was opened on the canvas (a
 * generated bus, named as "the connection of LOAD1" at the bus it was drawn on).
 */
export function neutralHazards(full: CircuitResult, privateMarker: string | undefined): NeutralHazard[] {
  const out: NeutralHazard[] = [];
  const limit = full.limits.neutralShiftPercent;
  for (const b of full.buses) {
    if (b.floating || !b.neutralToEarth || (b.neutralCause !== 'open-neutral' && b.neutralCause !== 'floating-neutral')) continue;
    if (b.neutralShiftPercent === undefined || !(b.neutralShiftPercent > limit)) continue;
    const generated = !!privateMarker && b.bus.includes(privateMarker);
    const drawn = generated ? publicBus(full, b.bus, privateMarker) : b.bus;
    const over: HazardLoad[] = [];
    const under: HazardLoad[] = [];
    for (const l of full.loads ?? []) {
      if (l.bus !== b.bus) continue;
      for (const br of l.branches) {
        const item = { id: l.id, ...(l.branches.length > 1 ? { branch: br.branch } : {}), volts: br.voltage.mag, ...(br.pu !== undefined ? { pu: br.pu } : {}) };
        if (isOver(br.status)) over.push(item);
        else if (isUnder(br.status)) under.push(item);
      }
    }
    // Worst first: the highest among the high ones, the lowest among the low ones.
    over.sort((x, y) => (y.pu ?? 0) - (x.pu ?? 0));
    under.sort((x, y) => (x.pu ?? 0) - (y.pu ?? 0));
    out.push({
      bus: generated ? `${generatedNameWords(b.bus, privateMarker)}${drawn ? ` on bus ${drawn}` : ''}` : `bus ${b.bus}`,
      cause: b.neutralCause,
      openAt: (b.neutralOpenAt ?? []).map((id) => generatedNameWords(id, privateMarker)),
      neutralVolts: b.neutralToEarth.mag,
      ...(b.neutralShiftPercent !== undefined ? { neutralPercent: b.neutralShiftPercent } : {}),
      over,
      under,
    });
  }
  return out;
}

const loadText = (l: HazardLoad) => `${l.id}${l.branch ? ` (${l.branch})` : ''} ${formatMagnitude(l.volts)} V${l.pu !== undefined ? ` = ${formatPu(l.pu)} pu` : ''}`;

/** "on DROP", "at the connection of SRC1", "on DROP and TIE". */
function whereOpen(openAt: string[]): string {
  if (openAt.length === 0) return '';
  const words = openAt.map((w) => (w.startsWith('the connection of') ? `at ${w}` : `on ${w}`));
  return words.length === 1 ? words[0] : `${words.slice(0, -1).join(', ')} and ${words[words.length - 1]}`;
}

/** One sentence per hazard, as the alert reads (also used by tests). */
export function hazardHeadline(h: NeutralHazard): string {
  if (h.cause === 'floating-neutral') return `Floating neutral at ${h.bus}: its neutral is not joined to any source neutral.`;
  // An element's own opened connection: where it is open is where it is.
  if (h.openAt.length === 1 && h.bus.startsWith(h.openAt[0])) return `Neutral lost at ${h.bus}: its neutral is open.`;
  return `Neutral lost at ${h.bus}: the neutral is open ${whereOpen(h.openAt)}.`;
}

/** The alert above the diagram; nothing when no bus has a lost or floating neutral over its limit. */
export function NeutralHazardAlert({ result, privateMarker }: { result: CircuitResult | undefined; privateMarker?: string }) {
  const hazards = useMemo(() => (result ? neutralHazards(result, privateMarker) : []), [result, privateMarker]);
  if (hazards.length === 0) return null;
  return (
    <div role="alert" aria-label="Neutral lost" className="rounded-[3px] border-2 border-danger bg-danger-soft px-2 py-1.5 text-[12px] leading-snug text-ink shadow-sm">
      {hazards.map((h) => (
        <div key={h.bus} className="mb-1">
          <p className="font-semibold text-danger">
            <span aria-hidden="true">⚠ </span>
            {hazardHeadline(h)}
          </p>
          <p>
            Neutral-to-earth <span className="num">{formatMagnitude(h.neutralVolts)} V</span>
            {h.neutralPercent !== undefined ? <span className="num"> ({h.neutralPercent.toFixed(1)} % of nominal)</span> : null}: the loads' star point has moved.
          </p>
          {h.over.length > 0 ? (
            <p>
              <strong>Over voltage:</strong> <span className="num">{h.over.map(loadText).join(', ')}</span>.
            </p>
          ) : null}
          {h.under.length > 0 ? (
            <p>
              <strong>Under voltage:</strong> <span className="num">{h.under.map(loadText).join(', ')}</span>.
            </p>
          ) : null}
        </div>
      ))}
      <p className="text-[11px]">
        <strong>Caution:</strong> a lost neutral puts dangerous voltages on equipment and people. Wyeward is an engineering aid; results are only as good as the model.
        Follow local codes and licensed practice.
      </p>
    </div>
  );
}
