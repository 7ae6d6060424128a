import type { StudyDetail } from '../../../../shared/api/studies.ts';
import { Button } from '../../../components/button.tsx';
import { Notice } from '../../../components/notice.tsx';
import { useSetTemplate } from '../api/templates.ts';

/** "Mark as template" on an approved study, "Unmark template" on a template (write roles); the server's 409 is shown as it says. */
export function TemplateToggle({ study }: { study: StudyDetail }) {
  const set = useSetTemplate(study.id);
  if (!study.isTemplate && study.status !== 'approved') {
    return <p className="text-[12px] text-ink-muted">Only an approved study can become a template.</p>;
  }
  return (
    <div className="flex flex-col gap-1.5">
      <Button
        busy={set.isPending}
        busyText="Saving…"
        onClick={() => set.mutate({ version: study.version, isTemplate: !study.isTemplate })}
      >
        {study.isTemplate ? 'Unmark template' : 'Mark as template'}
      </Button>
      {set.isError ? <Notice tone="error">{set.error.message}</Notice> : null}
    </div>
  );
}
