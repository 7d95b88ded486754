import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { SecurityStatus } from '@shared/schemas/second-factor';
import { installFakeFetch, json } from '@/testing/fake-fetch';
import { meFor, renderWithRouter } from '@/testing/render';
import { AccountSecurity } from './account-security';
import { StepUpDialog } from './step-up-dialog';

let fake: ReturnType<typeof installFakeFetch> | null = null;
afterEach(() => fake?.restore());

const stepUpRequired = () =>
  json({ error: { code: 'step_up_required', message: 'Confirm it is you: enter your password or a code from your authenticator, then try again.' } }, { status: 401 });

/** The server side as the step-up rule has it: the removal is refused until the password was given again. */
function fakeServer() {
  let recent = false;
  let passkeys: SecurityStatus['passkeys'] = [{ id: 'pk-1', name: 'Work laptop', createdAt: '2026-03-01T10:00:00.000Z', lastUsedAt: null }];
  return installFakeFetch((c) => {
    const p = c.url.pathname;
    if (p === '/api/account/security' && c.method === 'GET') {
      return json({ totp: true, passkeys, recoveryCodesLeft: 8, required: false, organisation: { requireSecondFactor: false, canChange: false } } satisfies SecurityStatus);
    }
    if (p === '/api/auth/step-up') {
      if ((c.body as { password?: string }).password !== 'right-password') return json({ error: { code: 'invalid_second_factor', message: 'That password is not right.' } }, { status: 401 });
      recent = true;
      return new Response(null, { status: 204 });
    }
    if (p === '/api/account/security/passkeys/pk-1' && c.method === 'DELETE') {
      if (!recent) return stepUpRequired();
      passkeys = [];
      return new Response(null, { status: 204 });
    }
    return undefined;
  });
}

function renderPage() {
  return renderWithRouter(
    <>
      <StepUpDialog />
      <AccountSecurity />
    </>,
    { me: meFor('technician') },
  );
}

describe('step-up dialog', () => {
  it('asks for the password when a change needs a recent sign-in, refuses a wrong one, and sends the change again after the right one', async () => {
    fake = fakeServer();
    const user = userEvent.setup();
    renderPage();
    await user.click(await screen.findByRole('button', { name: 'Remove passkey Work laptop' }));

    const form = await screen.findByRole('form', { name: 'Confirm it is you' });
    await user.type(within(form).getByLabelText('Your password'), 'wrong-password');
    await user.click(within(form).getByRole('button', { name: 'Confirm' }));
    expect(await within(form).findByRole('alert')).toHaveTextContent('That password is not right.');
    // still only the one refused removal
    expect(fake.calls.filter((c) => c.method === 'DELETE')).toHaveLength(1);

    await user.clear(within(form).getByLabelText('Your password'));
    await user.type(within(form).getByLabelText('Your password'), 'right-password');
    await user.click(within(form).getByRole('button', { name: 'Confirm' }));

    expect(await screen.findByText('No passkeys yet.')).toBeInTheDocument();
    expect(fake.calls.filter((c) => c.method === 'DELETE')).toHaveLength(2);
    expect(fake.calls.find((c) => c.url.pathname === '/api/auth/step-up' && (c.body as { password: string }).password === 'right-password')).toBeDefined();
    await waitFor(() => expect(screen.queryByRole('form', { name: 'Confirm it is you' })).not.toBeInTheDocument());
  });

  it('on cancel leaves the change undone and shows why it was refused', async () => {
    fake = fakeServer();
    const user = userEvent.setup();
    renderPage();
    await user.click(await screen.findByRole('button', { name: 'Remove passkey Work laptop' }));
    const form = await screen.findByRole('form', { name: 'Confirm it is you' });
    await user.click(within(form).getByRole('button', { name: 'Cancel' }));

    expect(await screen.findByText(/Confirm it is you: enter your password/)).toBeInTheDocument();
    expect(screen.getByText('Work laptop')).toBeInTheDocument();
    expect(fake.calls.filter((c) => c.method === 'DELETE')).toHaveLength(1);
    expect(fake.calls.some((c) => c.url.pathname === '/api/auth/step-up')).toBe(false);
  });
});
