import type { ReactNode } from 'react';
import { Link } from 'react-router';
import { useStudyRecord } from '../api/get-study-record.ts';

/** Breadcrumb for the review pages: Studies / <study> / <page>. */
export function StudyCrumbs({ studyId, children }: { studyId: string; children: ReactNode }) {
  const study = useStudyRecord(studyId);
  return (
    <nav aria-label="Breadcrumb" className="text-[13px] text-ink-muted">
      <Link to="/" className="text-accent hover:underline">
        Studies
      </Link>{' '}
      <span aria-hidden="true">/</span>{' '}
      <Link to={`/studies/${studyId}`} className="text-accent hover:underline">
        {study.data?.name ?? 'Study'}
      </Link>{' '}
      <span aria-hidden="true">/</span> <span>{children}</span>
    </nav>
  );
}
