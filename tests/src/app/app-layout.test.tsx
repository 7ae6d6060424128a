import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { apiError, stubApi } from '../helpers/fake-api.ts';
import { me } from '../helpers/fixtures.ts';
import { renderApp } from '../helpers/render-app.tsx';

describe('signed-in layout', () => {
  it('shows product, team, user and role in the header, and the safety caution on the page', async () => {
    stubApi({
      'GET /api/auth/me': () => ({ body: me('reviewer') }),
      'GET /api/studies': () => ({ body: { items: [], total: 0, page: 1, pageSize: 20 } }),
    });
    renderApp('/');
    const header = await screen.findByRole('banner');
    expect(within(header).getByRole('link', { name: 'Wyeward' })).toBeInTheDocument();
    expect(header).toHaveTextContent('Harrowgate Works');
    expect(header).toHaveTextContent('Ines Marlowe');
    expect(within(header).getByText('Reviewer')).toBeInTheDocument();
    const caution = screen.getByRole('complementary', { name: 'Safety caution' });
    expect(caution).toHaveTextContent('engineering aid');
    expect(caution).toHaveTextContent('licensed practice');
    expect(caution).toHaveTextContent('lost neutral');
  });

  it('signs out through the API and lands on the sign-in page', async () => {
    let signedIn = true;
    const api = stubApi({
      'GET /api/auth/me': () => (signedIn ? { body: me('engineer') } : apiError(401, 'unauthenticated', 'Sign in first.')),
      'GET /api/studies': () => ({ body: { items: [], total: 0, page: 1, pageSize: 20 } }),
      'POST /api/auth/sign-out': () => {
        signedIn = false;
        return { status: 204 };
      },
      'GET /api/auth/demo': () => ({ body: { demo: false, accounts: [] } }),
    });
    const user = userEvent.setup();
    const { router } = renderApp('/');
    await user.click(await screen.findByRole('button', { name: 'Sign out' }));
    expect(await screen.findByRole('heading', { name: 'Sign in to Wyeward' })).toBeInTheDocument();
    await waitFor(() => expect(router.state.location.pathname).toBe('/sign-in'));
    expect(api.calls.some((c) => c.method === 'POST' && c.url.pathname === '/api/auth/sign-out')).toBe(true);
  });

  it('sends someone known to be signed in from the sign-in page back to the studies', async () => {
    const api = stubApi({
      'GET /api/auth/me': () => ({ body: me('engineer') }),
      'GET /api/studies': () => ({ body: { items: [], total: 0, page: 1, pageSize: 20 } }),
    });
    const { router } = renderApp('/');
    expect(await screen.findByRole('heading', { name: 'Studies' })).toBeInTheDocument();
    const meCalls = api.calls.filter((c) => c.url.pathname === '/api/auth/me').length;
    await router.navigate('/sign-in');
    await waitFor(() => expect(router.state.location.pathname).toBe('/'));
    expect(await screen.findByRole('heading', { name: 'Studies' })).toBeInTheDocument();
    expect(screen.queryByRole('heading', { name: 'Sign in to Wyeward' })).not.toBeInTheDocument();
    // Decided from the cache, without asking the server again.
    expect(api.calls.filter((c) => c.url.pathname === '/api/auth/me').length).toBe(meCalls);
  });

  it('does not ask the server who is signed in on the sign-in page (no 401 in the console)', async () => {
    const api = stubApi({ 'GET /api/auth/demo': () => ({ body: { demo: false, accounts: [] } }) });
    renderApp('/sign-in');
    expect(await screen.findByRole('heading', { name: 'Sign in to Wyeward' })).toBeInTheDocument();
    expect(api.calls.map((c) => c.url.pathname)).toEqual(['/api/auth/demo']);
  });

  it('shows a not-found page for an unknown address inside the app', async () => {
    stubApi({ 'GET /api/auth/me': () => ({ body: me('viewer') }) });
    renderApp('/no/such/page');
    expect(await screen.findByRole('heading', { name: 'No page at this address' })).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Go to studies' })).toHaveAttribute('href', '/');
  });
});
