import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '../../helpers/fake-api.ts';
import { me, study } from '../../helpers/fixtures.ts';
import { renderApp } from '../../helpers/render-app.tsx';
import { REVIEWER, team } from '../review/review-fixtures.ts';

describe('audit page', () => {
  it('filters by action family and actor through the query, and shows each event in words with member and study names', async () => {
    const s = study({ name: 'Tallow Lane drop' });
    const api = stubApi({
      'GET /api/auth/me': () => ({ body: me('owner') }),
      'GET /api/team': () => ({ body: team() }),
      'GET /api/studies': () => ({ body: { items: [s], total: 1, page: 1, pageSize: 100 } }),
      'GET /api/audit': () => ({
        body: {
          items: [
            {
              id: 'a1',
              at: '2026-11-02T11:00:00.000Z',
              actor: REVIEWER,
              action: 'review.request',
              actionLabel: 'review requested',
              studyId: s.id,
              study: { id: s.id, name: 'Tallow Lane drop', deleted: false },
              text: 'asked Dilys Arkwright to review revision 2',
              detail: { revision: 2, reviewers: [REVIEWER.id] },
            },
            {
              id: 'a2',
              at: '2026-11-02T10:00:00.000Z',
              actor: REVIEWER,
              action: 'study.delete',
              actionLabel: 'study deleted',
              studyId: 'f2b7c2f4-5c55-4a3e-9a43-0b9a1f3f9a10',
              study: { id: 'f2b7c2f4-5c55-4a3e-9a43-0b9a1f3f9a10', name: 'Old drop', deleted: true },
              text: 'deleted “Old drop”',
              detail: { name: 'Old drop' },
            },
          ],
          total: 2,
        },
      }),
    });
    const user = userEvent.setup();
    renderApp('/audit');
    const table = await screen.findByRole('table', { name: 'Audit events' });
    const [, row, deleted] = within(table).getAllByRole('row');
    expect(row).toHaveTextContent('review requested');
    expect(row).toHaveTextContent('asked Dilys Arkwright to review revision 2');
    expect(within(row).getByRole('link', { name: 'Tallow Lane drop' })).toHaveAttribute('href', `/studies/${s.id}`);
    // A deleted study keeps its name, without a link to a page that is gone.
    expect(deleted).toHaveTextContent('Old drop (deleted)');
    expect(within(deleted).queryByRole('link')).not.toBeInTheDocument();
    // No raw action names, ids or JSON on the page.
    expect(table.textContent).not.toMatch(/review\.request|[{}]|[0-9a-f]{8}-[0-9a-f]{4}/);
    await user.selectOptions(screen.getByLabelText('Action'), 'review.');
    await user.selectOptions(screen.getByLabelText('Actor'), REVIEWER.id);
    await waitFor(() => {
      const last = api.calls.filter((c) => c.url.pathname === '/api/audit').at(-1)!;
      expect(Object.fromEntries(last.url.searchParams)).toEqual({ action: 'review.', actor: REVIEWER.id, page: '1' });
    });
  });

  it('sends non-owners away', async () => {
    stubApi({
      'GET /api/auth/me': () => ({ body: me('engineer') }),
      'GET /api/studies': () => ({ body: { items: [], total: 0, page: 1, pageSize: 20 } }),
    });
    const { router } = renderApp('/audit');
    await waitFor(() => expect(router.state.location.pathname).toBe('/'));
    expect(screen.queryByRole('heading', { name: 'Audit trail' })).not.toBeInTheDocument();
  });
});
