import { test, expect } from './fixtures';
import { signIn } from './fixtures';

/** The technician's home: a "New claim" action, and drafts that say how long is left to file. */
test('the technician starts a claim from home and sees each draft’s filing window', async ({ page }) => {
  await signIn(page, 'tech@harborview.test');
  const drafts = page.getByRole('region', { name: 'Your drafts' });
  await expect(drafts).toBeVisible();
  const links = drafts.getByRole('listitem');
  const n = await links.count();
  expect(n).toBeGreaterThan(0);
  for (let i = 0; i < n; i++) {
    await expect(links.nth(i)).toContainText(/\d+ days? left to file|Last day to file|Filing window passed on \d{4}-\d{2}-\d{2}|days? old|today/);
  }
  await expect(drafts.getByText(/left to file|Last day to file|Filing window passed/).first()).toBeVisible();
  await page.getByRole('main').getByRole('link', { name: 'New claim' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'New claim' })).toBeVisible();
});
