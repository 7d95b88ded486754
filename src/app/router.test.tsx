import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { createMemoryRouter, RouterProvider } from 'react-router';
import type { MeResponse } from '@shared/schemas/user';
import { installFakeFetch, json } from '@/testing/fake-fetch';
import { meFor } from '@/testing/render';
import { createAppQueryClient } from './app';
import { AppProvider } from './provider';
import { appRoutes } from './router';

let fake: ReturnType<typeof installFakeFetch> | null = null;
afterEach(() => fake?.restore());

function fakeServer(initial: MeResponse | null) {
  let session = initial;
  const me = meFor('reviewer');
  return installFakeFetch((c) => {
    const p = c.url.pathname;
    if (p === '/api/auth/me') return session ? json(session) : json({ error: { code: 'unauthenticated', message: 'Please sign in.' } }, { status: 401 });
    if (p === '/api/auth/sign-in') {
      session = me;
      return json(me);
    }
    if (p === '/api/auth/sign-out') {
      session = null;
      return new Response(null, { status: 204 });
    }
    if (!session) return json({ error: { code: 'unauthenticated', message: 'Please sign in.' } }, { status: 401 });
    if (p === '/api/claims') return json({ items: [], nextCursor: null, total: 0 });
    if (p === '/api/home') return json({ role: 'reviewer', cards: [], notices: [] });
    if (p.startsWith('/api/claims/')) return json({ error: { code: 'not_found', message: 'Not found.' } }, { status: 404 });
    return undefined;
  });
}

function renderApp(path: string) {
  const queryClient = createAppQueryClient();
  const router = createMemoryRouter(appRoutes(queryClient), { initialEntries: [path] });
  render(
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>,
  );
  return { router, queryClient };
}

describe('app routes', () => {
  it('sends a signed-out visitor to sign-in and back to the page they asked for', async () => {
    fake = fakeServer(null);
    const { router } = renderApp('/claims?state=submitted');
    expect(await screen.findByRole('heading', { name: 'Sign in' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(router.state.location.search).toBe(`?redirectTo=${encodeURIComponent('/claims?state=submitted')}`);
    expect(screen.getByText('Demo accounts are printed by npm start')).toBeInTheDocument();
    // The data loaders wait for the session check: nothing else is asked for while signed out.
    expect(fake.calls.map((c) => c.url.pathname)).toEqual(['/api/auth/me']);

    const user = userEvent.setup();
    await user.type(screen.getByLabelText('E-mail'), 'someone@example.test');
    await user.type(screen.getByLabelText('Password'), 'a password');
    await user.click(screen.getByRole('button', { name: 'Sign in' }));

    expect(await screen.findByRole('heading', { name: 'Review queue', level: 1 })).toBeInTheDocument();
    expect(router.state.location.pathname + router.state.location.search).toBe('/claims?state=submitted');
    expect(within(screen.getByRole('navigation', { name: 'Main' })).getByRole('link', { name: 'Review queue' })).toBeInTheDocument();
  });

  it('signs out, clears the session and returns to sign-in', async () => {
    fake = fakeServer(meFor('technician'));
    const { router, queryClient } = renderApp('/');
    await screen.findByRole('navigation', { name: 'Main' });
    await userEvent.setup().click(screen.getAllByRole('button', { name: 'Sign out' })[0]);
    expect(await screen.findByRole('heading', { name: 'Sign in' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(fake.calls.some((c) => c.url.pathname === '/api/auth/sign-out' && c.method === 'POST')).toBe(true);
    expect(queryClient.getQueryData(['home'])).toBeUndefined();
  });

  it('goes to sign-in when the session ends while the app is open', async () => {
    const me = meFor('technician');
    fake = installFakeFetch((c) => {
      if (c.url.pathname === '/api/auth/me') return json(me);
      if (c.url.pathname === '/api/home') return json({ error: { code: 'unauthenticated', message: 'Please sign in.' } }, { status: 401 });
      return undefined;
    });
    const { router, queryClient } = renderApp('/');
    expect(await screen.findByRole('heading', { name: 'Sign in' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(queryClient.getQueryData(['auth', 'me'])).toBeNull();
  });

  it('goes to sign-in when a screen’s own query finds the session ended', async () => {
    const me = meFor('reviewer');
    let homeCalls = 0;
    fake = installFakeFetch((c) => {
      if (c.url.pathname === '/api/auth/me') return json(me);
      if (c.url.pathname === '/api/home') {
        homeCalls++;
        return homeCalls === 1 ? json({ role: 'reviewer', cards: [], notices: [] }) : json({ error: { code: 'unauthenticated', message: 'Please sign in.' } }, { status: 401 });
      }
      return undefined;
    });
    const { router, queryClient } = renderApp('/');
    expect(await screen.findByText('Nothing needs you right now')).toBeInTheDocument();
    await queryClient.refetchQueries({ queryKey: ['home'] });
    expect(await screen.findByRole('heading', { name: 'Sign in' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/sign-in');
  });

  it('shows a not-found page for an unknown path, inside the shell', async () => {
    fake = fakeServer(meFor('technician'));
    renderApp('/no/such/page');
    expect(await screen.findByRole('heading', { name: 'Page not found' })).toBeInTheDocument();
    expect(screen.getByRole('navigation', { name: 'Main' })).toBeInTheDocument();
  });

  it('says a claim is not found when the server answers 404', async () => {
    fake = fakeServer(meFor('technician'));
    renderApp('/claims/someone-elses-claim');
    expect(await screen.findByRole('heading', { name: 'Claim not found' })).toBeInTheDocument();
  });

  it('serves the mailbox signed out, with its note', async () => {
    fake = installFakeFetch((c) =>
      c.url.pathname === '/api/dev/mailbox'
        ? json([{ id: 1, receivedAt: '2026-01-01T00:00:00.000Z', from: 'noreply@example.test', to: ['a@example.test'], subject: 'Reset your password', text: 'Open http://localhost/reset-password?token=abc', html: null, attachments: [] }])
        : c.url.pathname === '/api/auth/me'
          ? json({ error: { code: 'unauthenticated', message: 'Please sign in.' } }, { status: 401 })
          : undefined,
    );
    renderApp('/dev/mailbox');
    expect(await screen.findByText('Reset your password')).toBeInTheDocument();
    expect(screen.getByText(/local mail sink: messages are not delivered anywhere/i)).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'http://localhost/reset-password?token=abc' })).toBeInTheDocument();
  });
});
