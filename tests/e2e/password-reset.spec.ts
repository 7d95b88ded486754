import { test, expect } from './fixtures';
import { DEMO_PASSWORD, lastMailId, linkIn, signIn, signOut, waitForMail } from './fixtures';

// Runs in the last project (see playwright.config.ts): it leaves this account on a new password.
const email = 'tech@prairieline.test';
const newPassword = 'copper kettle under the north window';

test('a forgotten password is reset through the e-mailed link, and the old one stops working', async ({ page, baseURL }) => {
  const before = await lastMailId(page.request);

  await page.goto('/sign-in');
  await page.getByRole('link', { name: 'Forgot your password?' }).click();
  await expect(page).toHaveURL(/\/forgot-password/);
  const request = page.getByRole('form', { name: 'Request a password reset' });
  await request.getByLabel('E-mail').fill(email);
  await request.getByRole('button', { name: 'Send the link' }).click();
  await expect(page.getByText('Check your e-mail')).toBeVisible();

  const mail = await waitForMail(page.request, email, before);
  const link = linkIn(mail, '/reset-password');
  expect(new URL(link).origin).toBe(new URL(baseURL!).origin);

  await page.goto(link);
  const form = page.getByRole('form', { name: 'Choose a new password' });
  await form.getByLabel('New password', { exact: true }).fill(newPassword);
  await form.getByLabel('New password again').fill(newPassword);
  await form.getByRole('button', { name: 'Save the new password' }).click();
  await expect(page.getByText('Password changed')).toBeVisible();

  // The link works once.
  await page.goto(link);
  const again = page.getByRole('form', { name: 'Choose a new password' });
  await again.getByLabel('New password', { exact: true }).fill('a different long passphrase here');
  await again.getByLabel('New password again').fill('a different long passphrase here');
  await again.getByRole('button', { name: 'Save the new password' }).click();
  await expect(page.getByRole('alert').first()).toBeVisible();
  await expect(page.getByText('Password changed')).toHaveCount(0);

  // The old password is refused, the new one signs in.
  const old = await page.request.post('/api/auth/sign-in', { data: { email, password: DEMO_PASSWORD }, headers: { origin: new URL(baseURL!).origin } });
  expect(old.status()).toBe(401);
  await signIn(page, email, newPassword);
  await expect(page.getByRole('banner')).toContainText('Prairie Line Kitchen Repair');
  await signOut(page);
});
