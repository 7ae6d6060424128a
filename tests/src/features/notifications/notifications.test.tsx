import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import type { Notification } from '../../../../shared/api/notifications.ts';
import { stubApi } from '../../helpers/fake-api.ts';
import { me } from '../../helpers/fixtures.ts';
import { renderApp } from '../../helpers/render-app.tsx';

const items: Notification[] = [
  { id: 'n1', kind: 'review-requested', study: { id: 's1', name: 'Tallow Lane drop' }, actor: { id: 'u2', name: 'Oskar Penhale' }, text: 'Oskar Penhale asked you to review Tallow Lane drop', createdAt: '2026-11-02T11:00:00.000Z', read: false },
  { id: 'n2', kind: 'mention', study: { id: 's1', name: 'Tallow Lane drop' }, actor: { id: 'u3', name: 'Dilys Arkwright' }, text: 'Dilys Arkwright mentioned you', createdAt: '2026-11-01T11:00:00.000Z', read: true },
];

describe('notifications', () => {
  it('the header bell names the unread count; the list marks one or all read', async () => {
    const posted: unknown[] = [];
    let unread = 1;
    stubApi({
      'GET /api/auth/me': () => ({ body: me('reviewer') }),
      'GET /api/notifications': () => ({ body: { items: items.map((n) => ({ ...n, read: unread === 0 ? true : n.read })), unread } }),
      'POST /api/notifications/read': (req) => {
        posted.push(req.body);
        unread = 0;
        return { body: { unread } };
      },
    });
    const user = userEvent.setup();
    renderApp('/notifications');
    const header = await screen.findByRole('banner');
    expect(await within(header).findByRole('link', { name: 'Notifications, 1 unread' })).toHaveAttribute('href', '/notifications');
    const list = await screen.findByRole('list', { name: 'Notifications' });
    const rows = within(list).getAllByRole('listitem');
    expect(rows[0]).toHaveTextContent('Unread ·Review requested');
    expect(within(rows[0]).getByRole('link', { name: 'Tallow Lane drop' })).toHaveAttribute('href', '/studies/s1');
    expect(within(rows[1]).queryByRole('button')).toBeNull();
    await user.click(within(rows[0]).getByRole('button', { name: /^Mark read/ }));
    await waitFor(() => expect(posted).toEqual([{ ids: ['n1'] }]));
    expect(await within(header).findByRole('link', { name: 'Notifications, none unread' })).toBeInTheDocument();
  });
});
