import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '../../helpers/fake-api.ts';
import { me, study } from '../../helpers/fixtures.ts';
import { renderApp } from '../../helpers/render-app.tsx';
import { REVIEWER, team } from '../review/review-fixtures.ts';

describe('audit page', () => {
  it('filters by action family and actor through the query, and shows member ids in details as names', async () => {
    const s = study({ name: 'Tallow Lane drop' });
    const api = stubApi({
      'GET /api/auth/me': () => ({ body: me('owner') }),
      'GET /api/team': () => ({ body: team() }),
      'GET /api/studies': () => ({ body: { items: [s], total: 1, page: 1, pageSize: 100 } }),
      'GET /api/audit': () => ({
        body: { items: [{ id: 'a1', at: '2026-11-02T11:00:00.000Z', actor: REVIEWER, action: 'review.request', studyId: s.id, detail: { revision: 2, reviewers: [REVIEWER.id] } }], total: 1 },
      }),
    });
    const user = userEvent.setup();
    renderApp('/audit');
    const table = await screen.findByRole('table', { name: 'Audit events' });
    const row = within(table).getAllByRole('row')[1];
    expect(row).toHaveTextContent('revision: 2 · reviewers: Dilys Arkwright');
    expect(within(row).getByRole('link', { name: 'Tallow Lane drop' })).toHaveAttribute('href', `/studies/${s.id}`);
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
