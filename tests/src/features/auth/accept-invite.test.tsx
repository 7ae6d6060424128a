import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { apiError, stubApi } from '../../helpers/fake-api.ts';
import { me } from '../../helpers/fixtures.ts';
import { renderApp } from '../../helpers/render-app.tsx';

describe('invitation page', () => {
  it('shows the team and role, keeps the invited address, and signs up with the token', async () => {
    let joined = false;
    const api = stubApi({
      'GET /api/invites/:token': () => ({ body: { email: 'tamsin@harrowgate.test', role: 'reviewer', teamName: 'Harrowgate Works', expiresAt: '2026-12-08T08:00:00.000Z' } }),
      'POST /api/auth/sign-up': () => {
        joined = true;
        return { status: 201, body: me('reviewer') };
      },
      'GET /api/auth/me': () => (joined ? { body: me('reviewer') } : apiError(401, 'unauthenticated', 'Sign in first.')),
      'GET /api/studies': () => ({ body: { items: [], total: 0, page: 1, pageSize: 20 } }),
    });
    const user = userEvent.setup();
    renderApp('/invite/tok-123');

    expect(await screen.findByText('Harrowgate Works')).toBeInTheDocument();
    expect(screen.getByText('Reviewer')).toBeInTheDocument();
    const email = screen.getByLabelText('E-mail');
    expect(email).toHaveValue('tamsin@harrowgate.test');
    expect(email).toHaveAttribute('readonly');
    expect(screen.queryByLabelText('Team name')).not.toBeInTheDocument();

    await user.type(screen.getByLabelText('Your name'), 'Tamsin Rook');
    await user.type(screen.getByLabelText('Password'), 'short');
    await user.click(screen.getByRole('button', { name: 'Join the team' }));
    expect(await screen.findByText('Password must be at least 10 characters')).toBeInTheDocument();

    await user.type(screen.getByLabelText('Password'), '-and-longer-now');
    await user.click(screen.getByRole('button', { name: 'Join the team' }));
    expect(await screen.findByRole('heading', { name: 'Studies' })).toBeInTheDocument();
    expect(api.calls.find((c) => c.method === 'POST')?.body).toEqual({
      name: 'Tamsin Rook',
      email: 'tamsin@harrowgate.test',
      password: 'short-and-longer-now',
      inviteToken: 'tok-123',
    });
  });

  it('explains an unknown or expired invitation', async () => {
    stubApi({ 'GET /api/invites/:token': () => apiError(404, 'not-found', 'Invite not found') });
    renderApp('/invite/expired-token');
    expect(await screen.findByText('This invitation is not valid any more.')).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Join the team' })).not.toBeInTheDocument();
  });
});

describe('sign-up page', () => {
  it('puts the server’s field message on the e-mail field when the address is taken', async () => {
    stubApi({
      'POST /api/auth/sign-up': () => apiError(409, 'conflict', 'An account with this e-mail already exists'),
    });
    const user = userEvent.setup();
    renderApp('/sign-up');
    await user.type(await screen.findByLabelText('Your name'), 'Oskar Penhale');
    await user.type(screen.getByLabelText('E-mail'), 'oskar@harrowgate.test');
    await user.type(screen.getByLabelText('Password'), 'long enough words');
    await user.type(screen.getByLabelText('Team name'), 'Harrowgate Works');
    await user.click(screen.getByRole('button', { name: 'Create account and team' }));
    expect(await screen.findByText('An account with this e-mail already exists')).toBeInTheDocument();
    expect(screen.getByLabelText('E-mail')).toHaveAttribute('aria-invalid', 'true');
    expect(screen.getByLabelText('E-mail')).toHaveAccessibleDescription('An account with this e-mail already exists');
  });
});
