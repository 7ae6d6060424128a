import type { ReactNode } from 'react';

type Tone = 'info' | 'error' | 'caution' | 'ok';

const TONE: Record<Tone, { box: string; sign: string; label: string }> = {
  info: { box: 'border-accent/40 bg-accent-soft text-ink', sign: 'i', label: 'Note' },
  error: { box: 'border-danger/50 bg-danger-soft text-ink', sign: '✕', label: 'Error' },
  caution: { box: 'border-caution/50 bg-caution-soft text-ink', sign: '!', label: 'Caution' },
  ok: { box: 'border-ok/40 bg-ok-soft text-ink', sign: '✓', label: 'Done' },
};

/**
 * A boxed message with a sign and a word for its kind, so colour is never the only cue. `kind`
 * replaces that word where the tone's own one would misname the message (a revision's violations
 * are shown in the error colours but are a warning about the study, not an error of the page).
 */
export function Notice({ tone = 'info', kind, title, children, role }: { tone?: Tone; kind?: string; title?: ReactNode; children?: ReactNode; role?: 'alert' | 'status' }) {
  const t = { ...TONE[tone], ...(kind ? { label: kind } : {}) };
  return (
    <div role={role ?? (tone === 'error' ? 'alert' : undefined)} className={`flex gap-2 rounded-[3px] border px-3 py-2 text-sm ${t.box}`}>
      <span aria-hidden="true" className="num mt-px inline-flex h-4 w-4 shrink-0 items-center justify-center rounded-full border border-current text-[10px] leading-none">
        {t.sign}
      </span>
      <div className="min-w-0">
        {/* The kind in words for screen readers, unless the title already is that word. */}
        {title === t.label ? null : <span className="sr-only">{t.label}: </span>}
        {title ? <p className="font-semibold">{title}</p> : null}
        {children ? <div className={title ? 'mt-0.5' : ''}>{children}</div> : null}
      </div>
    </div>
  );
}
