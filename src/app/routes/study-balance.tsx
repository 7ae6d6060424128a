import { useQueryClient } from '@tanstack/react-query';
import { useParams } from 'react-router';
import { Loading } from '../../components/loading.tsx';
import { BalancingPage } from '../../features/balancing/components/balancing-page.tsx';
import { useStudy } from '../../features/studies/api/get-study.ts';
import { StudyLoadError } from '../../features/studies/components/study-load-error.tsx';
import { patchStudy, studyPatched, conflictOf } from '../../lib/api/studies.ts';
import { useMe } from '../../lib/auth.ts';
import { can } from '../../lib/authorization.ts';

/** Loaded lazily: phase balancing of a study; "Apply" saves through the study's one PATCH client. */
export function Component() {
  const { id = '' } = useParams();
  const me = useMe();
  const study = useStudy(id);
  const queryClient = useQueryClient();
  if (!me.data) return null;
  if (study.isPending) return <Loading label="Loading the study…" />;
  if (study.isError) return <StudyLoadError error={study.error} />;
  const s = study.data;
  return (
    <BalancingPage
      key={id}
      study={s}
      canApply={can(me.data.role, 'study:edit')}
      onApply={async (content, message) => {
        try {
          const saved = await patchStudy(s.id, { version: s.version, content, message });
          await studyPatched(queryClient, saved);
          return saved.revision;
        } catch (err) {
          const current = conflictOf(err);
          if (current) throw new Error(`${current.updatedBy.name} saved this study since it was opened; reload the page and run the balancing again.`);
          throw err;
        }
      }}
    />
  );
}
