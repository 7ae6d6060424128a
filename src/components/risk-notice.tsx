import type { RevisionRisk } from '../../shared/review/risk.ts';
import { riskSentence, SAFETY_CAUTION } from '../../shared/review/risk.ts';
import { Notice } from './notice.tsx';

function Caution() {
  return (
    <p className="rounded-[3px] border border-caution/40 bg-caution-soft px-3 py-1.5 text-[12px] text-ink">
      <span className="font-semibold text-caution">
        <span aria-hidden="true">⚠ </span>Caution:
      </span>{' '}
      {SAFETY_CAUTION}
    </p>
  );
}

/**
 * What a sign-off must state: the revision's violations (how many, and the worst one in the words
 * of the diagram), or that it does not solve, with the safety caution beside it.
 */
export function RiskNotice({ risk, compact = false }: { risk: RevisionRisk; compact?: boolean }) {
  const danger = !risk.solved || risk.violationCount > 0;
  return (
    <div className="flex flex-col gap-1.5" data-testid="revision-risk">
      {danger ? (
        <Notice tone="error" kind="Warning" role="status" title={!risk.solved ? `Revision ${risk.revision} does not solve.` : `Revision ${risk.revision} has ${risk.violationCount} violation${risk.violationCount === 1 ? '' : 's'}.`}>
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
      {compact && !danger ? null : <Caution />}
    </div>
  );
}
