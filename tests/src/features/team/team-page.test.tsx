import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../../../shared/api/common.ts';
import type { TeamResponse } from '../../../../shared/api/team.ts';
import { apiError, stubApi, type Handler } from '../../helpers/fake-api.ts';
import { me } from '../../helpers/fixtures.ts';
import { renderApp } from '../../helpers/render-app.tsx';

function team(role: Role): TeamResponse {
  return {
    team: { id: 't1', name: 'Harrowgate Works' },
    members: [
      { userId: me(role).user.id, name: 'Ines Marlowe', email: `${role}@wyeward.test`, role, joinedAt: '2026-10-01T08:00:00.000Z' },
      { userId: 'u-eng', name: 'Oskar Penhale', email: 'oskar@harrowgate.test', role: 'engineer', joinedAt: '2026-10-03T08:00:00.000Z' },
    ],
    invites:
      role === 'owner'
        ? [{ id: 'inv1', email: 'newcomer@harrowgate.test', role: 'reviewer', createdAt: '2026-11-30T08:00:00.000Z', expiresAt: '2026-12-07T08:00:00.000Z', invitedBy: { id: 'u1', name: 'Ines Marlowe' } }]
        : [],
  };
}

function setup(role: Role, extra: Record<string, Handler> = {}) {
  const api = stubApi({
    'GET /api/auth/me': () => ({ body: me(role) }),
    'GET /api/team': () => ({ body: team(role) }),
    ...extra,
  });
  return { api, ...renderApp('/team') };
}

// The page is a lazy route: load its module once up front so each test measures behaviour, not the first import.
beforeAll(async () => {
  await import('../../../../src/app/routes/team.tsx');
});

describe('team page', () => {
  it('lets an owner change roles and shows the last-owner refusal in plain words', async () => {
    const { api } = setup('owner', {
      'PATCH /api/team/members/:userId': () => apiError(409, 'conflict', 'The team must keep at least one owner.'),
    });
    const user = userEvent.setup();
    const select = await screen.findByRole('combobox', { name: 'Role of Ines Marlowe' });
    await user.selectOptions(select, 'engineer');

    expect(await screen.findByText('The team must keep at least one owner.')).toBeInTheDocument();
    const patch = api.calls.find((c) => c.method === 'PATCH');
    expect(patch?.url.pathname).toBe(`/api/team/members/${me('owner').user.id}`);
    expect(patch?.body).toEqual({ role: 'engineer' });
    // Owners also see invites and the mail link in the header.
    expect(screen.getByText('newcomer@harrowgate.test')).toBeInTheDocument();
    expect(screen.getByRole('navigation', { name: 'Main' })).toHaveTextContent('Outgoing mail');
  });

  it('sends an invitation with e-mail and role, and validates the address first', async () => {
    const { api } = setup('owner', {
      'POST /api/team/invites': (req) => {
        const b = req.body as { email: string; role: Role };
        return { status: 201, body: { id: 'inv2', ...b, createdAt: '2026-12-01T08:00:00.000Z', expiresAt: '2026-12-08T08:00:00.000Z', invitedBy: { id: 'u1', name: 'Ines Marlowe' } } };
      },
    });
    const user = userEvent.setup();
    const form = (await screen.findByRole('heading', { name: 'Invite someone' })).closest('section')!;
    await user.type(within(form).getByLabelText('E-mail'), 'nobody-at-all');
    await user.click(within(form).getByRole('button', { name: 'Send invitation' }));
    expect(await within(form).findByText('Enter a valid e-mail address')).toBeInTheDocument();
    expect(api.calls.filter((c) => c.method === 'POST')).toHaveLength(0);

    await user.clear(within(form).getByLabelText('E-mail'));
    await user.type(within(form).getByLabelText('E-mail'), 'Tamsin@Harrowgate.test');
    await user.selectOptions(within(form).getByLabelText('Role'), 'viewer');
    await user.click(within(form).getByRole('button', { name: 'Send invitation' }));

    expect(await within(form).findByText('Invitation sent to tamsin@harrowgate.test.')).toBeInTheDocument();
    expect(api.calls.find((c) => c.method === 'POST')?.body).toEqual({ email: 'tamsin@harrowgate.test', role: 'viewer' });
  });

  it('revokes a pending invitation and removes a member after confirmation', async () => {
    let revoked = false;
    let removed = false;
    const { api } = setup('owner', {
      'DELETE /api/team/invites/:id': () => {
        revoked = true;
        return { status: 204 };
      },
      'DELETE /api/team/members/:userId': () => {
        removed = true;
        return { status: 204 };
      },
    });
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Revoke the invitation for newcomer@harrowgate.test' }));
    await waitFor(() => expect(revoked).toBe(true));
    expect(api.calls.find((c) => c.method === 'DELETE')?.url.pathname).toBe('/api/team/invites/inv1');

    await user.click(screen.getByRole('button', { name: 'Remove Oskar Penhale from the team' }));
    const dialog = screen.getByRole('dialog', { name: 'Remove this member?' });
    expect(dialog).toHaveTextContent('oskar@harrowgate.test');
    expect(removed).toBe(false);
    await user.click(within(dialog).getByRole('button', { name: 'Remove member' }));
    await waitFor(() => expect(screen.queryByRole('dialog')).not.toBeInTheDocument());
    expect(removed).toBe(true);
    expect(api.calls.filter((c) => c.method === 'DELETE').map((c) => c.url.pathname)).toEqual(['/api/team/invites/inv1', '/api/team/members/u-eng']);
  });

  it('shows a viewer the members read-only: no role selects, no invites, no mail', async () => {
    setup('viewer');
    expect(await screen.findByText('Oskar Penhale')).toBeInTheDocument();
    expect(screen.queryByRole('combobox')).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Remove/ })).not.toBeInTheDocument();
    expect(screen.queryByRole('heading', { name: 'Invite someone' })).not.toBeInTheDocument();
    expect(screen.queryByRole('heading', { name: /Pending invitations/ })).not.toBeInTheDocument();
    expect(screen.getByRole('navigation', { name: 'Main' })).not.toHaveTextContent('Outgoing mail');
  });

  it('sends a signed-out visitor to sign-in and remembers where they were going', async () => {
    stubApi({
      'GET /api/auth/me': () => apiError(401, 'unauthenticated', 'Sign in first.'),
      'GET /api/auth/demo': () => ({ body: { demo: false, accounts: [] } }),
    });
    const { router } = renderApp('/team');
    expect(await screen.findByRole('heading', { name: 'Sign in to Wyeward' })).toBeInTheDocument();
    await waitFor(() => expect(router.state.location.pathname).toBe('/sign-in'));
    expect(router.state.location.search).toBe('?next=%2Fteam');
  });
});
