import type { Role } from '../../shared/api/common.ts';
import type { StudyStatus } from '../../shared/api/studies.ts';
import { ROLE_LABEL } from '../lib/authorization.ts';

const BASE = 'inline-flex items-center gap-1 rounded-[2px] border px-1.5 py-px text-[11px] font-semibold uppercase tracking-wide whitespace-nowrap';

const STATUS: Record<StudyStatus, { label: string; sign: string; cls: string }> = {
  draft: { label: 'Draft', sign: '○', cls: 'border-rule-strong bg-sunken text-ink-muted' },
  'in-review': { label: 'In review', sign: '◐', cls: 'border-review/50 bg-review-soft text-review' },
  'changes-requested': { label: 'Changes requested', sign: '△', cls: 'border-caution/50 bg-caution-soft text-caution' },
  approved: { label: 'Approved', sign: '●', cls: 'border-ok/50 bg-ok-soft text-ok' },
};

/** Study review state: a word and a sign, tinted. */
export function StatusBadge({ status }: { status: StudyStatus }) {
  const s = STATUS[status];
  return (
    <span className={`${BASE} ${s.cls}`}>
      <span aria-hidden="true">{s.sign}</span>
      {s.label}
    </span>
  );
}

/** Marks a study that others start new studies from. */
export function TemplateBadge() {
  return (
    <span className={`${BASE} border-accent/50 bg-accent-soft text-accent`}>
      <span aria-hidden="true">◇</span>
      Template
    </span>
  );
}

/** A team role. */
export function RoleBadge({ role, tone = 'light' }: { role: Role; tone?: 'light' | 'dark' }) {
  const cls = tone === 'dark' ? 'border-console-muted/60 text-console-ink' : 'border-rule-strong bg-sunken text-ink';
  return <span className={`${BASE} ${cls}`}>{ROLE_LABEL[role]}</span>;
}
