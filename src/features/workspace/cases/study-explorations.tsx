/**
 * Below the results: sweeps and the lost-neutral envelope of the circuit shown (the base, or the
 * case on the canvas), each in its own panel, with the caution. Renders when there is a circuit.
 */
import { memo } from 'react';
import { BASE_CASE_ID, type CircuitResult, type StudyCase } from '../../../../shared/engine/index.ts';
import { ResultsCaution } from '../results/result-sections.tsx';
import { EnvelopePanel } from './envelope-panel.tsx';
import { SweepPanel } from './sweep-panel.tsx';

export interface StudyExplorationsProps {
  /** The circuit shown (a case applied), or null when it cannot be built. */
  circuit: unknown;
  base: unknown;
  cases: StudyCase[];
  activeCase: string;
  result?: CircuitResult;
  onCases: ((cases: StudyCase[]) => void) | null;
  onActivate: (id: string) => void;
  /** Large sweeps on the server (the saved study); null when the role cannot start them. */
  server?: { studyId: string; revision: number | null; dirty: boolean } | null;
}

export const StudyExplorations = memo(function StudyExplorations({ circuit, base, cases, activeCase, result, onCases, onActivate, server }: StudyExplorationsProps) {
  const els = (circuit as { elements?: unknown[] } | null)?.elements;
  if (!els || els.length === 0) return null;
  return (
    <section aria-label="Sweeps and envelope" className="mt-3 flex flex-col gap-4 border-t border-rule pt-2">
      <SweepPanel circuit={circuit} base={base} cases={cases} onCase={activeCase === BASE_CASE_ID ? null : activeCase} result={result} onCases={onCases} onActivate={onActivate} server={server} />
      <EnvelopePanel circuit={circuit} result={result} />
      <ResultsCaution />
    </section>
  );
});
