import { useParams } from 'react-router';
import { DiffPage } from '../../features/review/components/diff-page.tsx';

/** Loaded lazily: compare two revisions of a study. */
export function Component() {
  const { id = '' } = useParams();
  return <DiffPage key={id} studyId={id} />;
}
