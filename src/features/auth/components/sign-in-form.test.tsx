import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { installFakeFetch, json } from '@/testing/fake-fetch';
import { meFor, renderWithRouter } from '@/testing/render';
import { SignInForm } from './sign-in-form';

let fake: ReturnType<typeof installFakeFetch> | null = null;
afterEach(() => fake?.restore());

async function fillAndSubmit(email: string, password: string) {
  const user = userEvent.setup();
  await user.type(screen.getByLabelText('E-mail'), email);
  await user.type(screen.getByLabelText('Password'), password);
  await user.click(screen.getByRole('button', { name: 'Sign in' }));
}

describe('SignInForm', () => {
  it('shows the server’s field errors on the fields they belong to', async () => {
    fake = installFakeFetch(() =>
      json({ error: { code: 'validation_failed', message: 'Some fields need attention.', fields: { password: 'That password is too long.' } } }, { status: 400 }),
    );
    renderWithRouter(<SignInForm onSuccess={() => {}} />);
    await fillAndSubmit('someone@example.test', 'a password');
    const password = screen.getByLabelText('Password');
    await waitFor(() => expect(password).toHaveAttribute('aria-invalid', 'true'));
    expect(password).toHaveAccessibleDescription('That password is too long.');
    expect(screen.queryByRole('alert')).not.toBeInTheDocument();
  });

  it('announces the 401 message and stays on the form', async () => {
    const onSuccess = vi.fn();
    fake = installFakeFetch(() => json({ error: { code: 'invalid_credentials', message: 'That e-mail and password do not match an account.' } }, { status: 401 }));
    renderWithRouter(<SignInForm onSuccess={onSuccess} />);
    await fillAndSubmit('someone@example.test', 'wrong password');
    expect(await screen.findByRole('alert')).toHaveTextContent('That e-mail and password do not match an account.');
    expect(onSuccess).not.toHaveBeenCalled();
  });

  it('checks the fields before asking the server', async () => {
    fake = installFakeFetch();
    renderWithRouter(<SignInForm onSuccess={() => {}} />);
    await userEvent.setup().click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByText('Enter your password.')).toBeInTheDocument();
    expect(fake.calls).toHaveLength(0);
  });

  it('posts the trimmed e-mail and hands the session over on success', async () => {
    const me = meFor('technician');
    const onSuccess = vi.fn();
    fake = installFakeFetch((c) => (c.url.pathname === '/api/auth/sign-in' ? json(me) : undefined));
    renderWithRouter(<SignInForm onSuccess={onSuccess} />);
    await fillAndSubmit('  Someone@Example.test ', 'a long enough password');
    await waitFor(() => expect(onSuccess).toHaveBeenCalledWith(me));
    expect(fake.calls[0].body).toEqual({ email: 'someone@example.test', password: 'a long enough password' });
  });

  it('asks for the authenticator code when the password alone is not enough, and hands the session over only after it', async () => {
    const me = meFor('accountant');
    const onSuccess = vi.fn();
    fake = installFakeFetch((c) => {
      if (c.url.pathname === '/api/auth/sign-in') return json({ secondFactor: { purpose: 'verify', methods: ['totp', 'recovery'] } });
      if (c.url.pathname === '/api/auth/second-factor/totp') return json(me);
      return undefined;
    });
    renderWithRouter(<SignInForm onSuccess={onSuccess} />);
    await fillAndSubmit('accounts@example.test', 'a long enough password');
    const step = await screen.findByRole('form', { name: 'Second factor' });
    expect(onSuccess).not.toHaveBeenCalled();
    const user = userEvent.setup();
    await user.type(within(step).getByLabelText('Authenticator code'), '123 456');
    await user.click(within(step).getByRole('button', { name: 'Verify' }));
    await waitFor(() => expect(onSuccess).toHaveBeenCalledWith(me));
    expect(fake.calls.at(-1)!.body).toEqual({ code: '123 456' });
  });

  it('offers a recovery code instead of the authenticator code', async () => {
    fake = installFakeFetch((c) =>
      c.url.pathname === '/api/auth/sign-in'
        ? json({ secondFactor: { purpose: 'verify', methods: ['totp', 'recovery'] } })
        : json({ error: { code: 'invalid_second_factor', message: 'That recovery code is not valid or was already used.' } }, { status: 400 }),
    );
    renderWithRouter(<SignInForm onSuccess={() => {}} />);
    await fillAndSubmit('accounts@example.test', 'a long enough password');
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Use a recovery code instead' }));
    await user.type(screen.getByLabelText('Recovery code'), 'ABCDE-12345');
    await user.click(screen.getByRole('button', { name: 'Verify' }));
    expect(await screen.findByRole('alert')).toHaveTextContent('That recovery code is not valid or was already used.');
    expect(fake.calls.at(-1)!.url.pathname).toBe('/api/auth/second-factor/recovery');
  });
});
