import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { SecurityStatus } from '@shared/schemas/second-factor';
import { installFakeFetch, json } from '@/testing/fake-fetch';
import { meFor, renderRoutes, testQueryClient } from '@/testing/render';
import { AccountSecurityRoute, accountSecurityLoader } from './account-security';

let fake: ReturnType<typeof installFakeFetch> | null = null;
afterEach(() => fake?.restore());

function status(over: Partial<SecurityStatus> = {}): SecurityStatus {
  return {
    totp: false,
    passkeys: [],
    recoveryCodesLeft: 0,
    required: false,
    organisation: { requireSecondFactor: false, canChange: false },
    ...over,
  };
}

/** A small in-memory stand-in for /api/account/security, changing as the real one does. */
function fakeSecurityApi(initial: SecurityStatus) {
  let s = initial;
  return installFakeFetch((c) => {
    const p = c.url.pathname;
    if (p === '/api/account/security' && c.method === 'GET') return json(s);
    if (p === '/api/account/security/totp' && c.method === 'POST') return json({ secret: 'JBSWY3DPEHPK3PXPJBSWY3DP', otpauthUri: 'otpauth://totp/x', qrDataUrl: 'data:image/svg+xml;base64,PHN2Zy8+' });
    if (p === '/api/account/security/totp/confirm') {
      if ((c.body as { code: string }).code !== '123456') return json({ error: { code: 'invalid_second_factor', message: 'That code is not right.' } }, { status: 401 });
      s = { ...s, totp: true, recoveryCodesLeft: 2 };
      return json({ recoveryCodes: ['AAAAA11111', 'BBBBB22222'] });
    }
    if (p.startsWith('/api/account/security/passkeys/') && c.method === 'DELETE') {
      const id = decodeURIComponent(p.split('/').at(-1)!);
      s = { ...s, passkeys: s.passkeys.filter((k) => k.id !== id) };
      return new Response(null, { status: 204 });
    }
    if (p === '/api/account/security/recovery-codes') return json({ recoveryCodes: ['CCCCC33333'] });
    if (p === '/api/account/security/organisation') {
      const body = c.body as { requireSecondFactor: boolean };
      s = { ...s, organisation: { ...s.organisation, requireSecondFactor: body.requireSecondFactor } };
      return json(body);
    }
    return undefined;
  });
}

function renderPage(role: Parameters<typeof meFor>[0] = 'technician') {
  const queryClient = testQueryClient();
  return renderRoutes([{ path: '/account/security', loader: accountSecurityLoader(queryClient), Component: AccountSecurityRoute, HydrateFallback: () => null }], {
    path: '/account/security',
    me: meFor(role),
    queryClient,
  });
}

describe('account security page', () => {
  it('sets up an authenticator app: QR and key, a wrong code is refused, the right one shows the recovery codes once', async () => {
    fake = fakeSecurityApi(status());
    const user = userEvent.setup();
    renderPage();
    expect(await screen.findByText('No authenticator app is set up.')).toBeInTheDocument();
    // Nothing is started on the server until the user asks for it.
    expect(fake.calls.some((c) => c.url.pathname === '/api/account/security/totp')).toBe(false);

    await user.click(screen.getByRole('button', { name: 'Set up an authenticator app' }));
    const form = await screen.findByRole('form', { name: 'Set up an authenticator app' });
    expect(within(form).getByRole('img', { name: 'QR code for your authenticator app' })).toBeInTheDocument();
    expect(within(form).getByLabelText('Authenticator key')).toHaveTextContent('JBSW Y3DP EHPK 3PXP JBSW Y3DP');

    await user.type(within(form).getByLabelText('Authenticator code'), '000000');
    await user.click(within(form).getByRole('button', { name: 'Confirm' }));
    expect(await within(form).findByRole('alert')).toHaveTextContent('That code is not right.');

    await user.clear(within(form).getByLabelText('Authenticator code'));
    await user.type(within(form).getByLabelText('Authenticator code'), '123456');
    await user.click(within(form).getByRole('button', { name: 'Confirm' }));
    const codes = await screen.findByRole('list', { name: 'Your recovery codes' });
    expect(within(codes).getAllByRole('listitem').map((li) => li.textContent)).toEqual(['AAAAA11111', 'BBBBB22222']);
    expect(await screen.findByText('An authenticator app is set up.')).toBeInTheDocument();
    expect(screen.getByText('2 unused recovery codes left.')).toBeInTheDocument();

    // Shown once: after "kept them", they are gone from the page.
    const done = screen.getByRole('button', { name: 'Continue' });
    expect(done).toBeDisabled();
    await user.click(screen.getByLabelText('I have kept these codes somewhere safe'));
    await user.click(done);
    expect(screen.queryByRole('list', { name: 'Your recovery codes' })).not.toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Remove the authenticator app' })).toBeInTheDocument();
  });

  it('lists the passkeys and removes the one asked for', async () => {
    fake = fakeSecurityApi(
      status({
        totp: true,
        recoveryCodesLeft: 8,
        passkeys: [
          { id: 'pk-1', name: 'Work laptop', createdAt: '2026-03-01T10:00:00.000Z', lastUsedAt: null },
          { id: 'pk/2', name: 'Phone', createdAt: '2026-03-02T10:00:00.000Z', lastUsedAt: '2026-03-05T10:00:00.000Z' },
        ],
      }),
    );
    const user = userEvent.setup();
    renderPage();
    const list = await screen.findByRole('list', { name: 'Your passkeys' });
    expect(within(list).getAllByRole('listitem')).toHaveLength(2);
    expect(within(list).getByText('Work laptop')).toBeInTheDocument();

    await user.click(within(list).getByRole('button', { name: 'Remove passkey Phone' }));
    await waitFor(() => expect(screen.queryByText('Phone')).not.toBeInTheDocument());
    const del = fake.calls.find((c) => c.method === 'DELETE');
    expect(del?.url.pathname).toBe('/api/account/security/passkeys/pk%2F2');
    expect(screen.getByText('Work laptop')).toBeInTheDocument();
  });

  it('makes new recovery codes and shows them', async () => {
    fake = fakeSecurityApi(status({ totp: true, recoveryCodesLeft: 1 }));
    const user = userEvent.setup();
    renderPage();
    expect(await screen.findByText('1 unused recovery code left.')).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Make new recovery codes' }));
    const codes = await screen.findByRole('list', { name: 'Your recovery codes' });
    expect(within(codes).getByText('CCCCC33333')).toBeInTheDocument();
  });

  it('offers the organisation toggle to an admin only, and sends the change', async () => {
    fake = fakeSecurityApi(status({ organisation: { requireSecondFactor: false, canChange: true } }));
    const user = userEvent.setup();
    const view = renderPage('agency_admin');
    const toggle = await screen.findByRole('checkbox', { name: 'Require a second factor for all users' });
    expect(toggle).not.toBeChecked();
    await user.click(toggle);
    await waitFor(() => expect(toggle).toBeChecked());
    expect(fake.calls.find((c) => c.method === 'PUT')?.body).toEqual({ requireSecondFactor: true });
    view.unmount();
    fake.restore();

    fake = fakeSecurityApi(status());
    renderPage('technician');
    expect(await screen.findByText('No authenticator app is set up.')).toBeInTheDocument();
    expect(screen.queryByRole('checkbox', { name: 'Require a second factor for all users' })).not.toBeInTheDocument();
  });

  it('asks for a second factor when the account needs one and has none', async () => {
    fake = fakeSecurityApi(status({ required: true }));
    renderPage('accountant');
    expect(await screen.findByText(/Your account needs a second factor/)).toBeInTheDocument();
  });
});
