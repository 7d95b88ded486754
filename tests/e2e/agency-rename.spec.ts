import { test, expect } from './fixtures';
import { signIn } from './fixtures';

/**
 * An agency admin renames the agency in its profile: the header shows the new name at once,
 * without a reload. The journey puts the seeded name back, so the journeys after it see the
 * demo scenario as seeded.
 */
test('the agency admin renames the agency and the header shows the new name at once', async ({ page }) => {
  await signIn(page, 'admin@harborview.test');
  await page.goto('/users?tab=profile');
  const form = page.getByRole('form', { name: 'Agency profile' });
  await expect(form).toBeVisible();
  const seeded = await form.getByLabel('Agency name').inputValue();
  expect(seeded).toBe('Harborview Appliance Service');

  await form.getByLabel('Agency name').fill('Harborview Kitchen Service Renamed');
  await form.getByRole('button', { name: 'Save the profile' }).click();
  await expect(form.getByText('The agency profile is saved.')).toBeVisible();
  await expect(page.getByRole('banner')).toContainText('Harborview Kitchen Service Renamed');

  await form.getByLabel('Agency name').fill(seeded);
  await form.getByRole('button', { name: 'Save the profile' }).click();
  await expect(form.getByText('The agency profile is saved.')).toBeVisible();
  await expect(page.getByRole('banner')).toContainText(seeded);
  await expect(page.getByRole('banner')).not.toContainText('Renamed');
});
