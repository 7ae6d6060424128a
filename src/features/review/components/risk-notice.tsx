import type { RevisionRisk } from '../../../../shared/review/risk.ts';
import { riskSentence } from '../../../../shared/review/risk.ts';
import { Notice } from '../../../components/notice.tsx';
import { ResultsCaution } from './results-caution.tsx';

/**
 * What a sign-off must state: the revision's violations (how many, and the worst one in the words
 * of the diagram), or that it does not solve, with the safety caution beside it.
 */
export function RiskNotice({ risk, compact = false }: { risk: RevisionRisk; compact?: boolean }) {
  const danger = !risk.solved || risk.violationCount > 0;
  return (
    <div className="flex flex-col gap-1.5" data-testid="revision-risk">
      {danger ? (
        <Notice tone="error" role="status" title={!risk.solved ? `Revision ${risk.revision} does not solve.` : `Revision ${risk.revision} has ${risk.violationCount} violation${risk.violationCount === 1 ? '' : 's'}.`}>
          {!risk.solved ? risk.error : <>The worst: {risk.worst}</>}
        </Notice>
      ) : (
        <p className="text-[13px]">
          <span aria-hidden="true" className="text-ok">
            ✓{' '}
          </span>
          {riskSentence(risk)}
        </p>
      )}
      {compact && !danger ? null : <ResultsCaution />}
    </div>
  );
}
