/** Sign-off knows the danger: the approve dialog, the review history and the template gallery state a revision's violations with the caution. */
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import type { RevisionRisk } from '../../../../shared/review/risk.ts';
import { StudyReview } from '../../../../src/features/review/components/study-review.tsx';
import { TemplatesPage } from '../../../../src/features/review/components/templates-page.tsx';
import { apiError, stubApi, type FakeResponse } from '../../helpers/fake-api.ts';
import { study, studyDetail } from '../../helpers/fixtures.ts';
import { renderReview } from './render-review.tsx';
import { ENGINEER, inReview, revision, REVIEWER, reviewState, SELF, STUDY_ID, team } from './review-fixtures.ts';

// Invented figures for the display; the risk itself is computed by shared/review/risk.ts (tested on the server).
const RISK: RevisionRisk = {
  revision: 2,
  solved: true,
  violationCount: 3,
  warningCount: 1,
  worst: 'bus HOUSE c-n: 167.3 V = 1.394 pu is above the violation limit 1.058 pu (127.0 V)',
  error: null,
};

function setupReview(risk: RevisionRisk | null, post: (body: unknown) => FakeResponse) {
  const me_ = { id: SELF.id, name: SELF.name };
  const state = { ...inReview(ENGINEER, [me_]), risk };
  const posted: unknown[] = [];
  stubApi({
    'GET /api/studies/:id': () => ({ body: studyDetail({ id: STUDY_ID, status: 'in-review', revision: 2 }) }),
    'GET /api/studies/:id/review': () => ({ body: state }),
    'GET /api/studies/:id/revisions': () => ({ body: { items: [revision(2, ENGINEER), revision(1)] } }),
    'GET /api/studies/:id/comments': () => ({ body: { items: [] } }),
    'GET /api/studies/:id/attachments': () => ({ body: { items: [] } }),
    'GET /api/team': () => ({ body: team() }),
    'POST /api/studies/:id/review': (req) => {
      posted.push(req.body);
      return post(req.body);
    },
  });
  renderReview(<StudyReview studyId={STUDY_ID} role="reviewer" userId={SELF.id} />, `/studies/${STUDY_ID}`);
  return posted;
}

describe('approve dialog', () => {
  it('states the violations, the worst one and the caution, and needs the acknowledgement before it sends', async () => {
    const posted = setupReview(RISK, () => ({ body: reviewState({ status: 'approved', approvedRevision: 2, risk: RISK }) }));
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Approve' }));
    const dialog = await screen.findByRole('dialog', { name: 'Approve revision 2?' });
    expect(dialog).toHaveTextContent('Revision 2 has 3 violations.');
    expect(dialog).toHaveTextContent('The worst: bus HOUSE c-n: 167.3 V = 1.394 pu');
    expect(dialog).toHaveTextContent('A lost or open neutral puts dangerous voltages on equipment and people.');
    await user.click(within(dialog).getByRole('button', { name: 'Approve' }));
    expect(within(dialog).getByRole('alert')).toHaveTextContent('Acknowledge the violations');
    expect(posted).toEqual([]);
    await user.click(within(dialog).getByRole('checkbox', { name: /I have read the 3 violations of revision 2 and approve it anyway/ }));
    await user.click(within(dialog).getByRole('button', { name: 'Approve' }));
    await waitFor(() => expect(posted).toEqual([{ action: 'approve', revision: 2, acknowledgeViolations: true }]));
  });

  it('shows the server refusal beside the acknowledgement', async () => {
    setupReview({ ...RISK, revision: 1 }, () => apiError(400, 'validation', 'Revision 2 has 3 violations; acknowledge them.', { fields: { acknowledgeViolations: 'Revision 2 has 3 violations; acknowledge them.' } }));
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Approve' }));
    const dialog = await screen.findByRole('dialog', { name: 'Approve revision 2?' });
    // The risk is of another revision than the one under review: nothing to tick, the server decides.
    expect(within(dialog).queryByRole('checkbox')).not.toBeInTheDocument();
    await user.click(within(dialog).getByRole('button', { name: 'Approve' }));
    expect(await within(dialog).findByRole('alert')).toHaveTextContent('Revision 2 has 3 violations; acknowledge them.');
    expect(within(dialog).getByRole('checkbox', { name: /I have read the violations of revision 2/ })).not.toBeChecked();
  });

  it('shows a server refusal as the form\'s error: the message itself, tied to the form, with no "Error:" word before it', async () => {
    const refusal = 'Revision 2 is no longer under review: the study moved on to revision 3.';
    setupReview({ ...RISK, violationCount: 0, worst: null }, () => apiError(409, 'conflict', refusal));
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Approve' }));
    const dialog = await screen.findByRole('dialog', { name: 'Approve revision 2?' });
    await user.click(within(dialog).getByRole('button', { name: 'Approve' }));
    const alert = await within(dialog).findByRole('alert');
    expect(alert.textContent).not.toMatch(/error\s*:/i);
    expect(alert.textContent).toContain(refusal);
    // The form names its error, as a field names its own.
    expect(dialog.querySelector('form')).toHaveAccessibleDescription(expect.stringContaining(refusal));
  });

  it('needs no acknowledgement for a revision without violations', async () => {
    const posted = setupReview({ ...RISK, violationCount: 0, worst: null }, () => ({ body: reviewState({ status: 'approved', approvedRevision: 2 }) }));
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Approve' }));
    const dialog = await screen.findByRole('dialog', { name: 'Approve revision 2?' });
    expect(dialog).toHaveTextContent('Revision 2 has no violations (1 warning).');
    await user.click(within(dialog).getByRole('button', { name: 'Approve' }));
    await waitFor(() => expect(posted).toEqual([{ action: 'approve', revision: 2 }]));
  });

  it('the review history shows an approval that acknowledged violations', async () => {
    const state = reviewState({
      status: 'approved',
      approvedRevision: 2,
      risk: RISK,
      events: [{ id: 'e9', at: '2026-11-03T09:00:00.000Z', actor: REVIEWER, action: 'approve', fromStatus: 'in-review', toStatus: 'approved', revision: 2, reviewers: [], message: '', acknowledgedViolations: 3 }],
    });
    stubApi({
      'GET /api/studies/:id': () => ({ body: studyDetail({ id: STUDY_ID, status: 'approved', revision: 2 }) }),
      'GET /api/studies/:id/review': () => ({ body: state }),
      'GET /api/studies/:id/revisions': () => ({ body: { items: [revision(2)] } }),
      'GET /api/studies/:id/comments': () => ({ body: { items: [] } }),
      'GET /api/studies/:id/attachments': () => ({ body: { items: [] } }),
      'GET /api/team': () => ({ body: team() }),
    });
    renderReview(<StudyReview studyId={STUDY_ID} role="viewer" userId={SELF.id} />, `/studies/${STUDY_ID}`);
    const history = await screen.findByRole('list', { name: 'Review history' });
    expect(history).toHaveTextContent('Approved acknowledging 3 violations of that revision.');
  });
});

describe('template gallery', () => {
  it('states each template’s violations with the caution, and "New from template" asks before copying them', async () => {
    const t = { ...study({ name: 'Brackenfield open neutral', isTemplate: true, status: 'approved' }), risk: RISK };
    const posted: string[] = [];
    stubApi({
      'GET /api/templates': () => ({ body: { items: [t] } }),
      'GET /api/studies/:id/review': () => ({ body: reviewState({ status: 'approved', approvedRevision: 2 }) }),
      'POST /api/studies/:id/clone': (req) => {
        posted.push(req.url.pathname);
        return { status: 201, body: { id: 'new-1', version: 1 } };
      },
    });
    const user = userEvent.setup();
    renderReview(<TemplatesPage role="engineer" />, '/templates');
    const card = await screen.findByRole('article', { name: 'Brackenfield open neutral' });
    expect(card).toHaveTextContent('Revision 2 has 3 violations.');
    expect(card).toHaveTextContent('The worst: bus HOUSE c-n: 167.3 V');
    expect(card).toHaveTextContent('licensed practice');
    await user.click(screen.getByRole('button', { name: 'New study from template Brackenfield open neutral' }));
    const dialog = await screen.findByRole('dialog', { name: 'Start from “Brackenfield open neutral”?' });
    expect(dialog).toHaveTextContent('Revision 2 has 3 violations.');
    expect(posted).toEqual([]);
    await user.click(within(dialog).getByRole('button', { name: 'Start a new study anyway' }));
    await waitFor(() => expect(posted).toHaveLength(1));
  });
});
