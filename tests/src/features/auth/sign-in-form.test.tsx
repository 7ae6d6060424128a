import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { apiError, stubApi } from '../../helpers/fake-api.ts';
import { me } from '../../helpers/fixtures.ts';
import { renderApp } from '../../helpers/render-app.tsx';

const demo = {
  demo: true,
  accounts: [
    { email: 'owner@wyeward.test', role: 'owner', password: 'wyeward-demo' },
    { email: 'engineer@wyeward.test', role: 'engineer', password: 'wyeward-demo' },
  ],
};

describe('sign-in page', () => {
  it('shows field errors in plain words and sends nothing when the form is incomplete', async () => {
    const api = stubApi({ 'GET /api/auth/demo': () => ({ body: demo }) });
    const user = userEvent.setup();
    renderApp('/sign-in');

    await user.type(await screen.findByLabelText('E-mail'), 'not-an-address');
    await user.click(screen.getByRole('button', { name: 'Sign in' }));

    expect(await screen.findByText('Enter a valid e-mail address')).toBeInTheDocument();
    expect(screen.getByText('Password is required')).toBeInTheDocument();
    expect(screen.getByLabelText('E-mail')).toHaveAttribute('aria-invalid', 'true');
    expect(api.calls.filter((c) => c.method === 'POST')).toHaveLength(0);
  });

  it('says the e-mail or password is incorrect on a 401', async () => {
    const api = stubApi({
      'GET /api/auth/demo': () => ({ body: demo }),
      'POST /api/auth/sign-in': () => apiError(401, 'invalid-credentials', 'E-mail or password is incorrect.'),
    });
    const user = userEvent.setup();
    renderApp('/sign-in');

    await user.type(await screen.findByLabelText('E-mail'), 'Engineer@Wyeward.test ');
    await user.type(screen.getByLabelText('Password'), 'wrong-password-1');
    await user.click(screen.getByRole('button', { name: 'Sign in' }));

    expect(await screen.findByText('E-mail or password is incorrect.')).toBeInTheDocument();
    // The shared schema trims and lower-cases the address before it is sent.
    expect(api.calls.find((c) => c.method === 'POST')?.body).toEqual({ email: 'engineer@wyeward.test', password: 'wrong-password-1' });
  });

  it('shows the retry time on a 429', async () => {
    stubApi({
      'GET /api/auth/demo': () => ({ body: demo }),
      'POST /api/auth/sign-in': () => ({
        ...apiError(429, 'rate-limited', 'Too many sign-in attempts.', { retryAfterSeconds: 840 }),
        headers: { 'Retry-After': '840' },
      }),
    });
    const user = userEvent.setup();
    renderApp('/sign-in');

    await user.type(await screen.findByLabelText('E-mail'), 'engineer@wyeward.test');
    await user.type(screen.getByLabelText('Password'), 'guess-number-six');
    await user.click(screen.getByRole('button', { name: 'Sign in' }));

    expect(await screen.findByText('Too many sign-in attempts.')).toBeInTheDocument();
    expect(screen.getByText(/Try again in 14 minutes\./)).toBeInTheDocument();
  });

  it('fills the form from a demo account and signs in to the studies list', async () => {
    let signedIn = false;
    const api = stubApi({
      'GET /api/auth/demo': () => ({ body: demo }),
      'POST /api/auth/sign-in': () => {
        signedIn = true;
        return { body: me('engineer') };
      },
      'GET /api/auth/me': () => (signedIn ? { body: me('engineer') } : apiError(401, 'unauthenticated', 'Sign in first.')),
      'GET /api/studies': () => ({ body: { items: [], total: 0, page: 1, pageSize: 20 } }),
    });
    const user = userEvent.setup();
    renderApp('/sign-in');

    await user.click(await screen.findByRole('button', { name: 'Use this account: engineer@wyeward.test (engineer)' }));
    expect(screen.getByLabelText('E-mail')).toHaveValue('engineer@wyeward.test');
    expect(screen.getByLabelText('Password')).toHaveValue('wyeward-demo');
    await user.click(screen.getByRole('button', { name: 'Sign in' }));

    expect(await screen.findByRole('heading', { name: 'Studies' })).toBeInTheDocument();
    expect(api.calls.find((c) => c.method === 'POST')?.body).toEqual({ email: 'engineer@wyeward.test', password: 'wyeward-demo' });
  });

  it('after signing in goes back to the page the visitor was sent away from', async () => {
    let signedIn = false;
    stubApi({
      'GET /api/auth/demo': () => ({ body: demo }),
      'POST /api/auth/sign-in': () => {
        signedIn = true;
        return { body: me('owner') };
      },
      'GET /api/auth/me': () => (signedIn ? { body: me('owner') } : apiError(401, 'unauthenticated', 'Sign in first.')),
      'GET /api/team': () => ({ body: { team: { id: 't1', name: 'Harrowgate Works' }, members: [], invites: [] } }),
    });
    const user = userEvent.setup();
    const { router } = renderApp('/sign-in?next=%2Fteam');
    await user.click(await screen.findByRole('button', { name: 'Use this account: owner@wyeward.test (owner)' }));
    await user.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByRole('heading', { name: 'Harrowgate Works' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/team');
  });

  it('hides the demo list when demo mode is off', async () => {
    stubApi({ 'GET /api/auth/demo': () => ({ body: { demo: false, accounts: [] } }) });
    const { queryClient } = renderApp('/sign-in');
    expect(await screen.findByRole('heading', { name: 'Sign in to Wyeward' })).toBeInTheDocument();
    await waitFor(() => expect(queryClient.getQueryState(['auth', 'demo'])?.status).toBe('success'));
    expect(screen.queryByRole('heading', { name: 'Demo accounts' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Use this account/ })).not.toBeInTheDocument();
  });
});
