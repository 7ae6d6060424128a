import type { ReactNode } from 'react';

/** The frame around the signed-out pages: product mark and a centred column. */
export function AuthFrame({ children }: { children: ReactNode }) {
  return (
    <div className="min-h-screen bg-paper">
      <header className="border-b border-console bg-console px-6 py-3 text-console-ink">
        <p className="flex items-baseline gap-3">
          <span className="text-base font-semibold tracking-wide">Wyeward</span>
          <span className="text-[12px] text-console-muted">three-phase circuit studies for engineering teams</span>
        </p>
      </header>
      <main className="mx-auto max-w-4xl px-6 py-10">{children}</main>
    </div>
  );
}

/** One titled panel of a signed-out page. */
export function AuthPanel({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section aria-labelledby="auth-panel-title" className="w-full max-w-sm rounded-[4px] border border-rule bg-panel p-5">
      <h1 id="auth-panel-title" className="mb-4 text-lg">
        {title}
      </h1>
      {children}
    </section>
  );
}
