/**
 * What a sign-off must not be silent about: a revision's violations, how many and the worst one,
 * in the words of the diagram. Derived from a revision's results summary and its circuit at the
 * moment it is shown (approve dialog, review and approval e-mails, template gallery, "New from
 * template"); only the count an approver acknowledged is stored.
 * Pure TypeScript, shared by server and client.
 */
import type { FlagSummary, ResultsSummary } from './summary.ts';
import { circuitNames } from './user-names.ts';

/** The danger of one revision, in short. */
export interface RevisionRisk {
  revision: number;
  /** False when the revision does not solve (then `error` says why, in words). */
  solved: boolean;
  violationCount: number;
  warningCount: number;
  /** The worst violation in words ("HOUSE c-n: 167.3 V = 1.394 pu is above …"), or null. */
  worst: string | null;
  error: string | null;
}

/**
 * Which violation is worst: an over-voltage first (it destroys equipment and can start fires),
 * then a shifted neutral, an under-voltage, an overload, unbalance; within a kind, the largest
 * excess over the limit relative to the limit (P).
 */
const RANK: Record<string, number> = { 'voltage-high': 0, 'neutral-shift': 1, 'voltage-low': 2, overload: 3, unbalance: 4 };

function excess(f: FlagSummary): number {
  if (f.limit === undefined || f.limit === 0) return Math.abs(f.value);
  return Math.abs(f.value - f.limit) / Math.abs(f.limit);
}

/** The worst of some flags (see RANK), or undefined. */
export function worstFlag(flags: readonly FlagSummary[]): FlagSummary | undefined {
  return [...flags].sort((a, b) => (RANK[a.code] ?? 9) - (RANK[b.code] ?? 9) || excess(b) - excess(a))[0];
}

/** The risk of a revision from its stored summary and circuit. */
export function revisionRisk(revision: number, summary: ResultsSummary, circuit: unknown): RevisionRisk {
  const names = circuitNames(circuit);
  if (!summary.ok) return { revision, solved: false, violationCount: 0, warningCount: 0, worst: null, error: names.text(summary.error.message) };
  const violations = summary.flags.filter((f) => f.severity === 'violation');
  const worst = worstFlag(violations);
  return {
    revision,
    solved: true,
    violationCount: violations.length,
    warningCount: summary.flags.filter((f) => f.severity === 'warning').length,
    worst: worst ? names.text(worst.message) : null,
    error: null,
  };
}

/** The caution that goes with every statement of results (the project's safety rule). */
export const SAFETY_CAUTION =
  'Wyeward is an engineering aid; results are only as good as the model. Designs must follow local codes and be checked under licensed practice. A lost or open neutral puts dangerous voltages on equipment and people.';

/** One sentence on a revision's danger: "Revision 2 has 3 violations; the worst: …" or that it has none / does not solve. */
export function riskSentence(r: RevisionRisk): string {
  if (!r.solved) return `Revision ${r.revision} does not solve: ${r.error ?? 'the engine could not solve it'}.`;
  if (r.violationCount === 0) return `Revision ${r.revision} has no violations${r.warningCount > 0 ? ` (${r.warningCount} warning${r.warningCount === 1 ? '' : 's'})` : ''}.`;
  return `Revision ${r.revision} has ${r.violationCount} violation${r.violationCount === 1 ? '' : 's'}; the worst: ${r.worst}.`;
}
