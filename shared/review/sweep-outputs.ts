/**
 * What a sweep records at each point, chosen from the results of the circuit shown: each load's
 * terminal voltage in pu of its rating, each bus phase's voltage, the neutral shift and the IEC
 * unbalance. Each output comes with its unit and the limit band of the limit set in force (values
 * outside `violation` break the limit; outside `warning` deserve a look). Pure; labels name what
 * the user drew (outputs of generated elements or buses are never offered). Used by the browser's
 * sweep panel and the server's sweep jobs.
 */
import { sweepOutputValue, type CircuitResult, type SweepOutputSpec } from '../engine/index.ts';
import { isPrivateName } from './user-names.ts';

export type OutputSpec = SweepOutputSpec;

export interface SweepOutput {
  key: string;
  spec: OutputSpec;
  label: string;
  unit: 'pu' | 'V' | '%';
  /** [low, high] in the output's unit; ±Infinity for a one-sided limit. */
  violation: [number, number];
  warning?: [number, number];
}

export const outputKey = (s: OutputSpec): string => (s.kind === 'load' ? `load:${s.load}:${s.branch}` : s.kind === 'bus' ? `bus:${s.bus}:${s.conductor}` : `${s.kind}:${s.bus}`);

const dash = (s: string) => s.replace('-', '–');

/** The outputs a sweep may record, from a result of the circuit it runs on. */
export function availableOutputs(r: CircuitResult): SweepOutput[] {
  const out: SweepOutput[] = [];
  const L = r.limits;
  for (const l of r.loads) {
    if (isPrivateName(l.id)) continue;
    for (const b of l.branches) {
      if (b.pu === undefined) continue;
      const spec: OutputSpec = { kind: 'load', load: l.id, branch: b.branch };
      out.push({ key: outputKey(spec), spec, label: `${l.id} terminal voltage${l.branches.length > 1 ? ` (${dash(b.branch)})` : ''}`, unit: 'pu', violation: L.voltageViolationPu, warning: L.voltageWarningPu });
    }
  }
  for (const b of r.buses) {
    if (isPrivateName(b.bus)) continue;
    const ref = b.lnReference === 'neutral' ? 'n' : 'earth';
    const nom = b.nominalVLN;
    for (const c of Object.keys(b.lineToNeutral)) {
      const spec: OutputSpec = { kind: 'bus', bus: b.bus, conductor: c };
      const scale = (p: [number, number]): [number, number] => (nom ? [p[0] * nom, p[1] * nom] : [-Infinity, Infinity]);
      out.push({ key: outputKey(spec), spec, label: `${b.bus} ${c}–${ref} voltage`, unit: 'V', violation: scale(L.voltageViolationPu), warning: nom ? scale(L.voltageWarningPu) : undefined });
    }
    if (b.neutralToEarth) {
      const spec: OutputSpec = { kind: 'shift', bus: b.bus };
      out.push({ key: outputKey(spec), spec, label: `${b.bus} neutral shift`, unit: 'V', violation: [-Infinity, nom ? (L.neutralShiftPercent / 100) * nom : Infinity] });
    }
    if (b.iecUnbalancePercent !== undefined) {
      const spec: OutputSpec = { kind: 'unbalance', bus: b.bus };
      out.push({ key: outputKey(spec), spec, label: `${b.bus} unbalance (IEC)`, unit: '%', violation: [-Infinity, L.unbalanceLimits.iec] });
    }
  }
  return out;
}

/** The value of one output in a result, or null when the result has no such quantity. */
export const outputValue = (r: Pick<CircuitResult, 'buses' | 'loads'>, s: OutputSpec): number | null => sweepOutputValue(r, s);

/** True when `v` is outside the output's violation band. */
export const breaksLimit = (o: Pick<SweepOutput, 'violation'>, v: number | null): boolean => v !== null && (v < o.violation[0] || v > o.violation[1]);
