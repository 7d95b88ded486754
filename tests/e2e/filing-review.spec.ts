import { test, expect, type Page } from './fixtures';
import { scenePhoto } from '../fixtures/photos';
import { signIn, signOut } from './fixtures';

/**
 * Filing and review end to end in the browser: a technician files a claim from the serial
 * lookup to submit; the reviewer takes it and returns it with a reason; the technician sees
 * the reason beside the fields, fixes and resubmits under the same number; the reviewer
 * adjusts a line with a reason and approves; the technician sees the approved amount and
 * the timeline.
 */

const TECH = 'tech@harborview.test';
const REVIEWER = 'reviewer@larkfield.test';
// GR-160 (stand leveling) needs one photo of the unit and the cooking height before and after.
const REPAIR_CODE = 'GR-160';

const isoDay = (offsetDays: number) => new Date(Date.now() + offsetDays * 86_400_000).toISOString().slice(0, 10);

/** A grill of the technician's own agency that is covered for parts and labor today, found through the API as the technician. */
async function coveredGrillSerial(page: Page): Promise<string> {
  const list = await page.request.get('/api/claims?limit=100');
  expect(list.status()).toBe(200);
  const serials = [...new Set(((await list.json()) as { items: { serial: string | null; modelNumber: string | null }[] }).items.filter((c) => c.modelNumber?.startsWith('LC-G2') && c.serial).map((c) => c.serial!))];
  for (const serial of serials) {
    const res = await page.request.get(`/api/units/${encodeURIComponent(serial)}?on=${isoDay(-2)}`);
    if (res.status() !== 200) continue;
    const u = (await res.json()) as { site: unknown; coverage: { parts: { covered: boolean }; labor: { covered: boolean } } };
    if (u.site && u.coverage.parts.covered && u.coverage.labor.covered) return serial;
  }
  throw new Error('no covered grill among the technician’s units');
}

async function openEditor(page: Page) {
  const form = page.getByRole('form', { name: /^Claim FP-\d{4}-\d{6}$/ });
  await expect(form).toBeVisible();
  return form;
}

async function expectSaved(page: Page) {
  await expect(page.getByRole('status').filter({ hasText: /^Saved ·/ })).toBeVisible({ timeout: 10_000 });
}

test('a claim is filed, returned with a reason, fixed, resubmitted, adjusted and approved', async ({ page }) => {
  test.setTimeout(240_000);

  // ---- the technician files the claim -------------------------------------------------------
  await signIn(page, TECH);
  const serial = await coveredGrillSerial(page);
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Claims', exact: true }).click();
  await page.getByRole('link', { name: 'New claim' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'New claim' })).toBeVisible();

  // an unknown serial says so
  await page.getByLabel('Serial number').fill('NO-SUCH-SERIAL-0');
  await expect(page.getByText('No unit with this serial number')).toBeVisible();

  await page.getByLabel('Serial number').fill(serial);
  const unit = page.getByRole('group', { name: `Unit ${serial}` });
  await expect(unit).toBeVisible();
  await expect(unit.getByText('Revision')).toBeVisible();
  await expect(unit.getByText('Site')).toBeVisible();
  await expect(unit.getByText('Covered until').first()).toBeVisible();
  await page.getByRole('button', { name: 'Start the claim for this unit' }).click();

  await expect(page).toHaveURL(/\/claims\/[^/]+\/edit$/);
  const form = await openEditor(page);
  const number = (await form.getByRole('heading', { level: 1 }).textContent())!.trim();
  expect(number).toMatch(/^FP-\d{4}-\d{6}$/);
  const claimUrl = page.url().replace(/\/edit$/, '');

  await form.getByLabel('Failure date').fill(isoDay(-2));
  await form.getByLabel('Repair date').fill(isoDay(-1));
  await form.getByLabel('Complaint', { exact: true }).fill('The grill rocks on its stand and cooks unevenly front to back.');
  await form.getByLabel('Cause', { exact: true }).fill('Front leveling foot worn; cooking surface out of level.');
  await form.getByLabel('Correction', { exact: true }).fill('Re-leveled the stand and set the cooking height.');

  await expect(form.getByRole('region', { name: 'Safety before service' })).toContainText('OSHA 29 CFR 1910.147');
  await form.getByRole('button', { name: 'Add a labor line' }).click();
  const line = form.getByRole('listitem', { name: 'Labor line 1' });
  const option = await line.locator('option', { hasText: REPAIR_CODE }).first().getAttribute('value');
  await line.getByLabel('Repair code').selectOption(option!);
  await line.getByLabel('Hours worked').fill('0.5');

  await form.getByLabel('Claim travel to the site').check();
  await form.getByLabel('Round trip (miles)').fill('22');
  await form.getByLabel('Travel time (hours)').fill('0.6');

  const height = form.getByRole('listitem', { name: 'Cooking surface height' });
  await expect(height.getByText('Required for this repair')).toBeVisible();
  await height.getByLabel(/Before repair/).fill('35.2');
  await height.getByLabel(/After repair/).fill('36.1');
  await expect(height.getByText('Within spec')).toBeVisible();

  // the live estimate follows the form
  const estimate = page.getByRole('complementary', { name: 'Estimate' });
  await expect(estimate.getByText('Total')).toBeVisible();

  // the photo the repair code asks for
  await form.getByTestId('evidence-input').setInputFiles({ name: 'grill-on-stand.jpg', mimeType: 'image/jpeg', buffer: await scenePhoto(Date.now() % 1_000_000) });
  await expect(form.getByRole('list', { name: 'Evidence required' })).toContainText('1 attached', { timeout: 20_000 });

  await expectSaved(page);
  const check = form.getByRole('region', { name: 'Check and submit' });
  await expect(check.getByText(/Nothing missing/)).toBeVisible();
  await check.getByRole('button', { name: 'Submit the claim' }).click();
  await expect(page).toHaveURL(claimUrl);
  await expect(page.getByRole('heading', { level: 1, name: number })).toBeVisible();
  await expect(page.getByText('Submitted', { exact: true }).first()).toBeVisible();
  await signOut(page);

  // ---- the reviewer takes it and returns it ------------------------------------------------------
  await signIn(page, REVIEWER);
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Review queue' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'Review queue' })).toBeVisible();
  await page.getByRole('button', { name: `Start review of ${number}` }).click();
  await expect(page).toHaveURL(claimUrl);
  await expect(page.getByText(/^In review with /)).toBeVisible();
  await expect(page.getByRole('region', { name: 'Other claims on this unit' })).toBeVisible();
  await expect(page.getByRole('region', { name: 'Changed since the last submission' })).toHaveCount(0);
  await page.getByRole('group', { name: 'Actions' }).getByRole('button', { name: 'Return to agency' }).click();
  const ret = page.getByRole('form', { name: 'Return to the agency' });
  await ret.getByRole('button', { name: 'Return to agency' }).click();
  await expect(ret.getByText('Choose a reason.')).toBeVisible();
  await ret.getByLabel('Reason').selectOption({ label: 'Information incomplete' });
  await ret.getByLabel('Comment for the agency').fill('Say which leveling foot was worn and the cooking height you set.');
  await ret.getByRole('button', { name: 'Return to agency' }).click();
  await expect(page.getByText('Returned to the agency: Information incomplete')).toBeVisible();
  await signOut(page);

  // ---- the technician sees the reason, fixes and resubmits -------------------------------------
  await signIn(page, TECH);
  await page.goto(claimUrl);
  await expect(page.getByText('Returned to the agency: Information incomplete')).toBeVisible();
  await page.getByRole('link', { name: 'Fix and resubmit' }).click();
  const fix = await openEditor(page);
  await expect(fix.getByRole('heading', { name: 'Returned by the reviewer: fix and resubmit' })).toBeVisible();
  const story = fix.getByRole('region', { name: 'Complaint, cause and correction' });
  await expect(story.getByRole('note', { name: 'Reviewer’s note' })).toContainText('Say which leveling foot was worn');
  await expect(story.getByRole('note', { name: 'Reviewer’s note' })).toContainText('Information incomplete');
  await expect(fix.getByRole('region', { name: 'Labor' }).getByRole('note')).toHaveCount(0);
  await fix.getByLabel('Cause', { exact: true }).fill('Front left leveling foot worn through; surface 0.8 in low at the front.');
  await fix.getByLabel('Correction', { exact: true }).fill('Replaced nothing; re-leveled the stand and set the cooking height to 36.1 in.');
  await expectSaved(page);
  await fix.getByRole('region', { name: 'Check and resubmit' }).getByRole('button', { name: `Resubmit ${number}` }).click();
  await expect(page).toHaveURL(claimUrl);
  await expect(page.getByRole('heading', { level: 1, name: number })).toBeVisible();
  await expect(page.getByText('Submitted again (resubmission 1)', { exact: false })).toBeVisible();
  await signOut(page);

  // ---- the reviewer adjusts a line with a reason and approves ------------------------------------
  await signIn(page, REVIEWER);
  await page.goto('/review');
  await page.getByRole('button', { name: `Start review of ${number}` }).click();
  await expect(page).toHaveURL(claimUrl);
  // what the technician changed since the first submission, field by field, and the unit's other claims
  const changes = page.getByRole('region', { name: 'Changed since the last submission' });
  await expect(changes.getByRole('row', { name: /^Cause\b/ })).toContainText('Front left leveling foot worn through; surface 0.8 in low at the front.');
  await expect(changes.getByRole('row', { name: /^Correction\b/ })).toContainText('re-leveled the stand and set the cooking height to 36.1 in.');
  await expect(changes.getByRole('row', { name: /^Complaint\b/ })).toHaveCount(0);
  await expect(page.getByRole('region', { name: 'Other claims on this unit' })).toBeVisible();
  const review = page.getByRole('region', { name: 'Review the lines' });
  await review.getByRole('button', { name: new RegExp(`^Adjust ${REPAIR_CODE}`) }).click();
  const adjusting = review.getByRole('group', { name: new RegExp(`^Adjusting ${REPAIR_CODE}`) });
  await adjusting.getByLabel('Approved hours').fill('0.4');
  await adjusting.getByRole('button', { name: 'Apply adjustment' }).click();
  await expect(adjusting.getByText('Give the agency the reason for the adjustment.')).toBeVisible();
  await adjusting.getByLabel('Reason for the agency').fill('Leveling a stand takes 0.4 h by our own time study.');
  await adjusting.getByRole('button', { name: 'Apply adjustment' }).click();
  await expect(review.getByText('Adjusted', { exact: true })).toBeVisible();
  await expect(review.getByText(/0\.4 h approved: Leveling a stand takes 0\.4 h/)).toBeVisible();

  await page.getByRole('group', { name: 'Actions' }).getByRole('button', { name: 'Approve' }).click();
  await page.getByRole('dialog', { name: `Approve ${number}` }).getByRole('button', { name: 'Approve' }).click();
  const approved = page.getByText(/^Approved: \$[\d,]+\.\d{2}$/);
  await expect(approved).toBeVisible();
  const amount = (await approved.textContent())!.replace('Approved: ', '');
  await signOut(page);

  // ---- the technician sees the approved amount and the timeline ---------------------------------
  await signIn(page, TECH);
  await page.goto(claimUrl);
  await expect(page.getByRole('heading', { level: 1, name: number })).toBeVisible();
  await expect(page.getByText(`Approved: ${amount}`)).toBeVisible();
  const timeline = page.getByRole('list', { name: 'Timeline' });
  await expect(timeline).toContainText('Submitted');
  await expect(timeline).toContainText('Returned to the agency');
  await expect(timeline).toContainText('Reason: Information incomplete');
  await expect(timeline).toContainText('Say which leveling foot was worn');
  await expect(timeline).toContainText('Adjusted line amounts');
  await expect(timeline).toContainText('Leveling a stand takes 0.4 h');
  await expect(timeline).toContainText('Approved');
  await expect(page.getByRole('group', { name: 'Actions' })).toHaveCount(0);
});
