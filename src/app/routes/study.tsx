import { useParams } from 'react-router';
import { StudyReview } from '../../features/review/components/study-review.tsx';
import { StudyPage } from '../../features/studies/components/study-page.tsx';
import { useMe } from '../../lib/auth.ts';

/** Loaded lazily: the list stays light. The study record, then its review side (status, actions, comments, files). */
export function Component() {
  const { id = '' } = useParams();
  const me = useMe();
  if (!me.data) return null;
  return (
    <div className="flex flex-col gap-4">
      <StudyPage key={id} id={id} role={me.data.role} />
      <StudyReview key={`review-${id}`} studyId={id} role={me.data.role} userId={me.data.user.id} />
    </div>
  );
}
