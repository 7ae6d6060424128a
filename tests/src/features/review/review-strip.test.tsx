/** The review summary above the workspace follows a save: a save that returns a study to draft never leaves CHANGES REQUESTED on screen. */
import { act, screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { ReviewState } from '../../../../shared/api/review.ts';
import { ReviewStrip } from '../../../../src/features/review/components/review-strip.tsx';
import { stubApi } from '../../helpers/fake-api.ts';
import { studyDetail } from '../../helpers/fixtures.ts';
import { renderReview } from './render-review.tsx';
import { ENGINEER, REVIEWER, reviewState, STUDY_ID } from './review-fixtures.ts';

describe('review strip', () => {
  it('shows Draft as soon as the saved study says so, and refetches the review behind it', async () => {
    let state: ReviewState = reviewState({
      status: 'changes-requested',
      review: { requestedBy: ENGINEER, reviewers: [REVIEWER], revision: 2 },
      events: [{ id: 'e1', at: '2026-11-02T11:00:00.000Z', actor: REVIEWER, action: 'request-changes', fromStatus: 'in-review', toStatus: 'changes-requested', revision: 2, reviewers: [], message: 'Add the rod', acknowledgedViolations: null }],
    });
    const before = studyDetail({ id: STUDY_ID, status: 'changes-requested', version: 4, revision: 2 });
    const api = stubApi({
      'GET /api/studies/:id': () => ({ body: before }),
      'GET /api/studies/:id/review': () => ({ body: state }),
      'GET /api/studies/:id/comments': () => ({ body: { items: [] } }),
    });
    const { queryClient } = renderReview(<ReviewStrip studyId={STUDY_ID} />, `/studies/${STUDY_ID}`);
    const strip = await screen.findByRole('group', { name: 'Review summary' });
    await waitFor(() => expect(strip).toHaveTextContent(/changes requested/i));
    const reviewCalls = () => api.calls.filter((c) => c.url.pathname.endsWith('/review')).length;
    const first = reviewCalls();

    // The workspace saves: the server answers with the study back in draft (revision 3) and a reset event.
    state = { ...state, status: 'draft', events: [...state.events, { ...state.events[0], id: 'e2', action: 'reset', fromStatus: 'changes-requested', toStatus: 'draft' }] };
    act(() => queryClient.setQueryData(['studies', 'detail', STUDY_ID], { ...before, status: 'draft', version: 5, revision: 3 }));
    await waitFor(() => expect(within(strip).queryByText(/changes requested/i)).not.toBeInTheDocument());
    expect(strip).toHaveTextContent(/draft/i);
    await waitFor(() => expect(reviewCalls()).toBeGreaterThan(first));
  });
});
