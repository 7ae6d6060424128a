import { useParams } from 'react-router';
import { Loading } from '../../components/loading.tsx';
import { StudyLoadError } from '../../features/studies/components/study-load-error.tsx';
import { useMe } from '../../lib/auth.ts';
import { useStudy } from '../../features/studies/api/get-study.ts';
import { WorkspacePage } from '../../features/workspace/workspace-page.tsx';
import { useState } from 'react';
import { useCommentPins } from '../../features/review/api/use-comment-pins.ts';
import { ReviewStrip } from '../../features/review/components/review-strip.tsx';
import { StudyReview } from '../../features/review/components/study-review.tsx';

/** The study's workspace (canvas, properties, live results); loaded on demand so the studies list stays light. */
export function Component() {
  const { id = '' } = useParams();
  const me = useMe();
  const study = useStudy(id);
  // The canvas selection feeds "Comment on the selected element"; open threads show as pins on the canvas.
  const [selected, setSelected] = useState<string | null>(null);
  const pins = useCommentPins(id);
  if (!me.data) return null;
  if (study.isPending) return <Loading label="Loading the study…" />;
  if (study.isError) return <StudyLoadError error={study.error} />;
  return (
    <div className="flex flex-col gap-4">
      <ReviewStrip studyId={id} />
      <WorkspacePage key={id} study={study.data} role={me.data.role} onSelectionChange={setSelected} pins={pins} />
      {/* Review and reuse (issue 5): status and actions, comments pinned to elements, files. */}
      <StudyReview key={`review-${id}`} studyId={id} role={me.data.role} userId={me.data.user.id} selectedElementId={selected} />
    </div>
  );
}
