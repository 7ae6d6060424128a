import { ImportStudyButton } from '../../features/review/components/import-study.tsx';
import { StudiesList } from '../../features/studies/components/studies-list.tsx';
import { useMe } from '../../lib/auth.ts';
import { can } from '../../lib/authorization.ts';

export function StudiesRoute() {
  const me = useMe();
  if (!me.data) return null;
  return (
    <div className="flex flex-col gap-2">
      <StudiesList role={me.data.role} />
      {can(me.data.role, 'study:create') ? (
        <div className="mx-auto flex w-full max-w-7xl items-center justify-end gap-2 text-[13px] text-ink-muted">
          <span>Have a .wyeward.json file?</span>
          <ImportStudyButton />
        </div>
      ) : null}
    </div>
  );
}
