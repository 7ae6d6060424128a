import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { apiError, stubApi } from '../../helpers/fake-api.ts';
import { me } from '../../helpers/fixtures.ts';
import { renderApp } from '../../helpers/render-app.tsx';

describe('sign-up of a new team', () => {
  it('says "check your inbox" (the same whether or not the address has an account) and signs in nobody', async () => {
    const api = stubApi({
      'GET /api/auth/me': () => apiError(401, 'unauthenticated', 'Sign in first.'),
      'GET /api/auth/demo': () => ({ body: { demo: false, accounts: [] } }),
      'POST /api/auth/sign-up': () => ({ status: 202, body: { status: 'check-inbox', email: 'wren@fallow.test' } }),
    });
    const user = userEvent.setup();
    renderApp('/sign-up');
    await user.type(await screen.findByLabelText('Your name'), 'Wren Fallow');
    await user.type(screen.getByLabelText('E-mail'), 'wren@fallow.test');
    await user.type(screen.getByLabelText('Password'), 'copper kettle meadow lantern');
    await user.type(screen.getByLabelText('Team name'), 'Fallow Electrical');
    await user.click(screen.getByRole('button', { name: 'Create account and team' }));
    expect(await screen.findByText('Check your inbox')).toBeInTheDocument();
    expect(screen.getByText(/We sent a message to wren@fallow.test/)).toBeInTheDocument();
    expect(api.calls.filter((c) => c.method === 'POST')).toHaveLength(1);
  });

  it('shows the server reason for a password that is easy to guess at the password field', async () => {
    stubApi({
      'GET /api/auth/me': () => apiError(401, 'unauthenticated', 'Sign in first.'),
      'GET /api/auth/demo': () => ({ body: { demo: false, accounts: [] } }),
      'POST /api/auth/sign-up': () =>
        apiError(400, 'validation', 'password: weak', { fields: { password: 'This is a commonly used password. Use a longer passphrase of several unrelated words.' } }),
    });
    const user = userEvent.setup();
    renderApp('/sign-up');
    await user.type(await screen.findByLabelText('Your name'), 'Wren Fallow');
    await user.type(screen.getByLabelText('E-mail'), 'wren@fallow.test');
    await user.type(screen.getByLabelText('Password'), 'password123456');
    await user.type(screen.getByLabelText('Team name'), 'Fallow Electrical');
    await user.click(screen.getByRole('button', { name: 'Create account and team' }));
    expect(await screen.findByText(/commonly used password/)).toBeInTheDocument();
  });

  it('the mailed link finishes the sign-up with the token from the address fragment and opens the studies', async () => {
    let joined = false;
    const api = stubApi({
      'GET /api/auth/me': () => (joined ? { body: me('owner') } : apiError(401, 'unauthenticated', 'Sign in first.')),
      'POST /api/auth/sign-up/confirm': () => {
        joined = true;
        return { status: 201, body: me('owner') };
      },
      'GET /api/studies': () => ({ body: { items: [], total: 0, page: 1, pageSize: 20 } }),
    });
    renderApp('/sign-up/confirm#tok-abc_123');
    expect(await screen.findByRole('heading', { name: 'Studies' })).toBeInTheDocument();
    expect(api.calls.find((c) => c.method === 'POST')?.body).toEqual({ token: 'tok-abc_123' });
  });

  it('an expired or used link says so', async () => {
    stubApi({
      'GET /api/auth/me': () => apiError(401, 'unauthenticated', 'Sign in first.'),
      'POST /api/auth/sign-up/confirm': () => apiError(404, 'not-found', 'This sign-up link is no longer valid; sign up again to get a new one.'),
    });
    renderApp('/sign-up/confirm#old');
    expect(await screen.findByText('This sign-up link is no longer valid; sign up again to get a new one.')).toBeInTheDocument();
  });
});
