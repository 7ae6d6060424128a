/**
 * The lost-neutral alert drawn on the diagram (role "alert"): for each bus whose neutral-to-earth
 * voltage passes its limit while its neutral is open upstream or floating, it says so, names the
 * loads over and under voltage with their own terminal voltages, and carries the caution.
 * A fault study's shift or an intact neutral under unbalance does not raise it (their flags word
 * those causes).
 */
import { useMemo } from 'react';
import type { CircuitResult, LoadBranchResult } from '../../../../shared/engine/index.ts';
import { formatMagnitude } from './format.ts';
import { formatPu } from './load-table.tsx';
import { generatedNameWords, hidePrivate } from './private-names.ts';

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
  bus: string;
  cause: 'open-neutral' | 'floating-neutral';
  /** Where the neutral is open, in words (lines and switches the user drew; a connection). */
  openAt: string[];
  neutralVolts: number;
  neutralPercent?: number;
  over: HazardLoad[];
  under: HazardLoad[];
}

const isOver = (s: LoadBranchResult['status']) => s === 'violation-high' || s === 'warning-high';
const isUnder = (s: LoadBranchResult['status']) => s === 'violation-low' || s === 'warning-low';

/** Buses (as the user drew them) whose neutral shift is over the limit with an open or floating neutral. */
export function neutralHazards(full: CircuitResult, privateMarker: string | undefined): NeutralHazard[] {
  const result = hidePrivate(full, privateMarker);
  const out: NeutralHazard[] = [];
  for (const b of result.buses) {
    if (b.floating || !b.neutralToEarth || (b.neutralCause !== 'open-neutral' && b.neutralCause !== 'floating-neutral')) continue;
    if (b.neutralShiftPercent === undefined || !(b.neutralShiftPercent > result.limits.neutralShiftPercent)) continue;
    const over: HazardLoad[] = [];
    const under: HazardLoad[] = [];
    for (const l of result.loads ?? []) {
      if (l.bus !== b.bus) continue;
      // Worst first: the highest branch among the high ones, the lowest among the low ones.
      for (const br of l.branches) {
        const item = { id: l.id, ...(l.branches.length > 1 ? { branch: br.branch } : {}), volts: br.voltage.mag, ...(br.pu !== undefined ? { pu: br.pu } : {}) };
        if (isOver(br.status)) over.push(item);
        else if (isUnder(br.status)) under.push(item);
      }
    }
    over.sort((x, y) => (y.pu ?? 0) - (x.pu ?? 0));
    under.sort((x, y) => (x.pu ?? 0) - (y.pu ?? 0));
    out.push({
      bus: b.bus,
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
  return h.cause === 'open-neutral' ? `Neutral lost at bus ${h.bus}: the neutral is open ${whereOpen(h.openAt)}.` : `Floating neutral at bus ${h.bus}: its neutral is not joined to any source neutral.`;
}

/** The alert over the diagram; nothing when no bus has a lost or floating neutral over its limit. */
export function NeutralHazardAlert({ result, privateMarker }: { result: CircuitResult | undefined; privateMarker?: string }) {
  const hazards = useMemo(() => (result ? neutralHazards(result, privateMarker) : []), [result, privateMarker]);
  if (hazards.length === 0) return null;
  return (
    <div role="alert" aria-label="Neutral lost" className="pointer-events-none absolute left-2 top-2 z-10 max-w-[460px] rounded-[3px] border-2 border-danger bg-danger-soft px-2 py-1.5 text-[12px] leading-snug text-ink shadow-sm">
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
