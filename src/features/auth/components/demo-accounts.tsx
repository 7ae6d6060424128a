import { ROLE_HINT } from '../../../lib/authorization.ts';
import { RoleBadge } from '../../../components/badges.tsx';
import { Button } from '../../../components/button.tsx';
import { useDemoAccounts } from '../api/get-demo-accounts.ts';

/** Lists the demo accounts (demo mode only) with a one-click fill of the sign-in form. */
export function DemoAccounts({ onUse }: { onUse: (email: string, password: string) => void }) {
  const demo = useDemoAccounts();
  if (!demo.data?.demo || demo.data.accounts.length === 0) return null;
  const password = demo.data.accounts[0].password;
  const samePassword = demo.data.accounts.every((a) => a.password === password);
  return (
    <section aria-labelledby="demo-title" className="rounded-[4px] border border-rule bg-panel p-5">
      <h2 id="demo-title" className="text-base">
        Demo accounts
      </h2>
      <p className="mt-1 text-[13px] text-ink-muted">
        This server runs in demo mode with an invented team and studies.
        {samePassword ? (
          <>
            {' '}Every account uses the password <code className="num rounded-[2px] bg-sunken px-1 whitespace-nowrap">{password}</code>.
          </>
        ) : null}
      </p>
      <ul className="mt-3 divide-y divide-rule border-y border-rule">
        {demo.data.accounts.map((a) => (
          <li key={a.email} className="flex items-center gap-3 py-2">
            <div className="min-w-0 flex-1">
              <p className="num text-[13px] break-all">{a.email}</p>
              <p className="mt-0.5 flex items-start gap-2 text-[12px] text-ink-muted">
                <RoleBadge role={a.role} />
                <span>{ROLE_HINT[a.role]}</span>
              </p>
            </div>
            <Button size="sm" variant="ghost" aria-label={`Use this account: ${a.email} (${a.role})`} onClick={() => onUse(a.email, a.password)}>
              Use this account
            </Button>
          </li>
        ))}
      </ul>
    </section>
  );
}
