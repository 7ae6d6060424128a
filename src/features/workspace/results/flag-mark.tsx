/** A compact flag marker: a sign, a word and a count, tinted; the messages in its title. */
import type { Flag } from '../../../../shared/engine/index.ts';
import { worstFlag } from './overlays.ts';

export const SEVERITY: Record<Flag['severity'], { sign: string; word: string; cls: string }> = {
  violation: { sign: '✕', word: 'Violation', cls: 'border-danger/50 bg-danger-soft text-danger' },
  warning: { sign: '!', word: 'Warning', cls: 'border-caution/50 bg-caution-soft text-caution' },
  info: { sign: 'i', word: 'Note', cls: 'border-accent/40 bg-accent-soft text-accent' },
};

export function FlagMark({ flags }: { flags: Flag[] }) {
  const worst = worstFlag(flags);
  if (!worst) return <span className="text-ink-faint">none</span>;
  const s = SEVERITY[worst.severity];
  return (
    <span title={flags.map((f) => f.message).join('\n')} className={`inline-flex items-center gap-1 rounded-[2px] border px-1 text-[11px] font-semibold ${s.cls}`}>
      <span aria-hidden="true">{s.sign}</span>
      {s.word}
      {flags.length > 1 ? <span className="num">×{flags.length}</span> : null}
    </span>
  );
}
