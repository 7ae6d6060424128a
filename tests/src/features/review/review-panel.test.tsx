import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import type { Role } from '../../../../shared/api/common.ts';
import type { ReviewState } from '../../../../shared/api/review.ts';
import type { StudyDetail } from '../../../../shared/api/studies.ts';
import { apiError, stubApi, type Handler } from '../../helpers/fake-api.ts';
import { studyDetail } from '../../helpers/fixtures.ts';
import { StudyReview } from '../../../../src/features/review/components/study-review.tsx';
import { renderReview } from './render-review.tsx';
import { ENGINEER, inReview, revision, REVIEWER, reviewState, SELF, STUDY_ID, team } from './review-fixtures.ts';

function setup(role: Role, state: ReviewState, opts: { revisionAuthor?: { id: string; name: string }; study?: Partial<StudyDetail>; post?: Handler; patch?: Handler } = {}) {
  const study = studyDetail({ id: STUDY_ID, name: 'Tallow Lane drop', status: state.status, revision: 2, ...opts.study });
  const api = stubApi({
    'GET /api/studies/:id': () => ({ body: study }),
    'GET /api/studies/:id/review': () => ({ body: state }),
    'GET /api/studies/:id/revisions': () => ({ body: { items: [revision(2, opts.revisionAuthor ?? ENGINEER), revision(1)] } }),
    'GET /api/studies/:id/comments': () => ({ body: { items: [] } }),
    'GET /api/studies/:id/attachments': () => ({ body: { items: [] } }),
    'GET /api/team': () => ({ body: team() }),
    'GET /api/notifications': () => ({ body: { items: [], unread: 0 } }),
    ...(opts.post ? { 'POST /api/studies/:id/review': opts.post } : {}),
    ...(opts.patch ? { 'PATCH /api/studies/:id': opts.patch } : {}),
  });
  return { api, ...renderReview(<StudyReview studyId={STUDY_ID} role={role} userId={SELF.id} />, `/studies/${STUDY_ID}`) };
}

async function panel() {
  return screen.findByRole('region', { name: /^Review/ });
}

const me_ = { id: SELF.id, name: SELF.name };

describe('review actions by role and state', () => {
  it('an engineer sees "Request review" on a draft, and no approval buttons', async () => {
    setup('engineer', reviewState());
    const p = await panel();
    expect(within(p).getByRole('button', { name: 'Request review' })).toBeInTheDocument();
    expect(within(p).queryByRole('button', { name: 'Approve' })).not.toBeInTheDocument();
    expect(within(p).queryByRole('button', { name: 'Request changes' })).not.toBeInTheDocument();
  });

  it('a reviewer sees no "Request review" on a draft', async () => {
    setup('reviewer', reviewState());
    const p = await panel();
    await within(p).findByText('No review yet.');
    expect(within(p).queryByRole('button', { name: /request review/i })).not.toBeInTheDocument();
  });

  it('a chosen reviewer who is not the author sees Approve, Request changes and a prominent link to the diff', async () => {
    setup('reviewer', inReview(ENGINEER, [me_]));
    const p = await panel();
    expect(await within(p).findByRole('button', { name: 'Approve' })).toBeInTheDocument();
    expect(within(p).getByRole('button', { name: 'Request changes' })).toBeInTheDocument();
    expect(within(p).getByRole('link', { name: 'Read the changes in revision 2' })).toHaveAttribute('href', `/studies/${STUDY_ID}/diff?to=2`);
    expect(within(p).queryByRole('button', { name: /request review/i })).not.toBeInTheDocument();
  });

  it('a reviewer who was not chosen cannot decide', async () => {
    setup('reviewer', inReview(ENGINEER, [REVIEWER]));
    const p = await panel();
    expect(await within(p).findByText('You were not asked to review this revision.')).toBeInTheDocument();
    expect(within(p).queryByRole('button', { name: 'Approve' })).not.toBeInTheDocument();
  });

  it('an owner may decide without being chosen, but never on a revision they wrote', async () => {
    const first = setup('owner', inReview(ENGINEER, [REVIEWER]));
    expect(await within(await panel()).findByRole('button', { name: 'Approve' })).toBeInTheDocument();
    first.unmount();
    setup('owner', inReview(ENGINEER, [REVIEWER]), { revisionAuthor: me_ });
    const p = await panel();
    expect(await within(p).findByText('You cannot approve your own study.')).toBeInTheDocument();
    expect(within(p).queryByRole('button', { name: 'Approve' })).not.toBeInTheDocument();
  });

  it('the member who requested the review cannot approve it even when named', async () => {
    setup('engineer', inReview(me_, [me_, REVIEWER]));
    const p = await panel();
    expect(await within(p).findByText('You cannot approve your own study.')).toBeInTheDocument();
    expect(within(p).queryByRole('button', { name: 'Approve' })).not.toBeInTheDocument();
  });

  it('a viewer gets no review buttons and no comment form', async () => {
    setup('viewer', inReview(ENGINEER, [REVIEWER]));
    const p = await panel();
    await within(p).findByRole('link', { name: 'Read the changes in revision 2' });
    expect(within(p).queryAllByRole('button')).toHaveLength(0);
    expect(screen.queryByRole('form', { name: 'New comment' })).not.toBeInTheDocument();
    expect(screen.getByText(/Viewers read comments/)).toBeInTheDocument();
  });

  it('request changes needs a message, then posts it bound to the revision under review', async () => {
    const posted: unknown[] = [];
    setup('reviewer', inReview(ENGINEER, [me_]), {
      post: (req) => {
        posted.push(req.body);
        return { body: reviewState({ status: 'changes-requested', review: { requestedBy: ENGINEER, reviewers: [me_], revision: 2 } }) };
      },
    });
    const user = userEvent.setup();
    await user.click(await within(await panel()).findByRole('button', { name: 'Request changes' }));
    const dialog = await screen.findByRole('dialog', { name: 'Request changes to revision 2' });
    await user.click(within(dialog).getByRole('button', { name: 'Request changes' }));
    expect(within(dialog).getByRole('alert')).toHaveTextContent('Say what should change');
    expect(posted).toEqual([]);
    await user.type(within(dialog).getByLabelText('What should change'), 'Close the neutral on the drop.');
    await user.click(within(dialog).getByRole('button', { name: 'Request changes' }));
    await waitFor(() => expect(posted).toEqual([{ action: 'request-changes', message: 'Close the neutral on the drop.', revision: 2 }]));
    await waitFor(() => expect(screen.queryByRole('dialog')).not.toBeInTheDocument());
  });

  it('request review offers reviewers, engineers and owners but not yourself or viewers, and posts the choice', async () => {
    const posted: unknown[] = [];
    setup('engineer', reviewState(), {
      post: (req) => {
        posted.push(req.body);
        return { body: inReview(me_, [REVIEWER]) };
      },
    });
    const user = userEvent.setup();
    await user.click(await within(await panel()).findByRole('button', { name: 'Request review' }));
    const dialog = await screen.findByRole('dialog', { name: 'Request review' });
    const boxes = await within(dialog).findAllByRole('checkbox');
    expect(boxes.map((b) => b.closest('label')?.textContent)).toEqual(['Oskar PenhaleEngineer', 'Dilys ArkwrightReviewer']);
    await user.click(within(dialog).getByRole('button', { name: 'Send request' }));
    expect(within(dialog).getByRole('alert')).toHaveTextContent('Choose at least one reviewer');
    await user.click(within(dialog).getByRole('checkbox', { name: /Dilys Arkwright/ }));
    await user.type(within(dialog).getByLabelText('Message to the reviewers (optional)'), 'Ready for a look.');
    await user.click(within(dialog).getByRole('button', { name: 'Send request' }));
    await waitFor(() => expect(posted).toEqual([{ action: 'request', reviewers: [REVIEWER.id], message: 'Ready for a look.' }]));
  });

  it('shows the server 409 message when an illegal transition is refused', async () => {
    setup('reviewer', inReview(ENGINEER, [me_]), { post: () => apiError(409, 'conflict', 'This study is approved; edit it to start a new review.') });
    const user = userEvent.setup();
    await user.click(await within(await panel()).findByRole('button', { name: 'Approve' }));
    const dialog = await screen.findByRole('dialog', { name: 'Approve revision 2?' });
    await user.click(within(dialog).getByRole('button', { name: 'Approve' }));
    expect(await within(dialog).findByText('This study is approved; edit it to start a new review.')).toBeInTheDocument();
  });

  it('an approved study shows its approved revision and offers "Mark as template" to write roles; a 409 is shown', async () => {
    const state = reviewState({
      status: 'approved',
      approvedRevision: 2,
      review: { requestedBy: ENGINEER, reviewers: [REVIEWER], revision: 2 },
      events: [{ id: 'e2', at: '2026-11-03T09:00:00.000Z', actor: REVIEWER, action: 'approve', fromStatus: 'in-review', toStatus: 'approved', revision: 2, reviewers: [], message: '', acknowledgedViolations: null }],
    });
    const patches: unknown[] = [];
    setup('engineer', state, {
      study: { status: 'approved', version: 5 },
      patch: (req) => {
        patches.push(req.body);
        return apiError(409, 'conflict', 'Only an approved study can be a template.');
      },
    });
    const user = userEvent.setup();
    const p = await panel();
    expect(await within(p).findByText(/Approved revision/)).toHaveTextContent('Approved revision 2 by Dilys Arkwright');
    await user.click(within(p).getByRole('button', { name: 'Mark as template' }));
    expect(await within(p).findByText('Only an approved study can be a template.')).toBeInTheDocument();
    expect(patches).toEqual([{ version: 5, isTemplate: true }]);
  });
});

describe('report links', () => {
  it('offer the report of the latest revision in V and pu, its print view and the saved results as CSV', async () => {
    setup('viewer', reviewState());
    const p = await panel();
    expect(await within(p).findByRole('link', { name: 'Report (PDF)' })).toHaveAttribute('href', `/api/studies/${STUDY_ID}/report.pdf?revision=2`);
    expect(within(p).getByRole('link', { name: 'Report in per unit (PDF)' })).toHaveAttribute('href', `/api/studies/${STUDY_ID}/report.pdf?revision=2&units=pu`);
    expect(within(p).getByRole('link', { name: 'Print view' })).toHaveAttribute('href', `/studies/${STUDY_ID}/print/2`);
    expect(within(p).getByRole('link', { name: 'Saved flags results as CSV' })).toHaveAttribute('href', `/api/studies/${STUDY_ID}/results.csv?table=flags&revision=2`);
  });
});
