import { test, expect, DEMO_PASSWORD, signIn, signOut } from './fixtures';

// Adds a passkey to a demo account, which from then on asks for a second factor: runs with the
// credential-changing journeys, after the others.
const email = 'admin@harborview.test';

test('an agency admin adds a passkey on the security page and signs in with it after the password', async ({ page }) => {
  // Chromium's virtual authenticator (WebAuthn domain of the DevTools protocol), a platform
  // authenticator that holds discoverable credentials and verifies the user.
  const cdp = await page.context().newCDPSession(page);
  await cdp.send('WebAuthn.enable');
  const { authenticatorId } = await cdp.send('WebAuthn.addVirtualAuthenticator', {
    options: { protocol: 'ctap2', transport: 'internal', hasResidentKey: true, hasUserVerification: true, isUserVerified: true },
  });

  await signIn(page, email);
  await page.getByRole('link', { name: 'Security' }).click();
  await expect(page).toHaveURL(/\/account\/security$/);
  await expect(page.getByRole('heading', { level: 1, name: 'Sign-in and security' })).toBeVisible();
  await expect(page.getByText('No passkeys yet.')).toBeVisible();

  const add = page.getByRole('form', { name: 'Add a passkey' });
  await add.getByLabel('Passkey name').fill('Test laptop');
  await add.getByRole('button', { name: 'Add a passkey' }).click();
  await expect(page.getByText('Passkey added.')).toBeVisible();
  await expect(page.getByRole('list', { name: 'Your passkeys' }).getByText('Test laptop')).toBeVisible();
  const { credentials } = await cdp.send('WebAuthn.getCredentials', { authenticatorId });
  expect(credentials).toHaveLength(1);
  expect(credentials[0]!.rpId).toBe('localhost');
  // the first factor of an account brings its recovery codes, shown once
  await expect(page.getByRole('list', { name: 'Your recovery codes' }).getByRole('listitem')).not.toHaveCount(0);
  await page.getByLabel('I have kept these codes somewhere safe').check();
  await page.getByRole('button', { name: 'Done' }).click();

  await signOut(page);

  // The password alone no longer signs in: the second step offers the passkey.
  await page.goto('/sign-in');
  const form = page.getByRole('form', { name: 'Sign in' });
  await form.getByLabel('E-mail').fill(email);
  await form.getByLabel('Password', { exact: true }).fill(DEMO_PASSWORD);
  await form.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByRole('form', { name: 'Second factor' })).toBeVisible();
  await page.getByRole('button', { name: 'Use a passkey' }).click();
  await expect(page).not.toHaveURL(/\/sign-in/);
  await expect(page.getByRole('button', { name: 'Sign out' }).first()).toBeVisible();

  // The server recorded the use.
  await page.goto('/account/security');
  await expect(page.getByRole('list', { name: 'Your passkeys' })).not.toContainText('not used yet');
  const after = await cdp.send('WebAuthn.getCredentials', { authenticatorId });
  expect(after.credentials[0]!.signCount).toBeGreaterThan(0);
});
