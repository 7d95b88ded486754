import { readFileSync } from 'node:fs';
import { test, expect } from './fixtures';
import { parse } from 'csv-parse/sync';
import { signIn, signOut } from './fixtures';

const AGENCY = 'Prairie Line Kitchen Repair';
const REFERENCE = `ACH E2E-${Date.now().toString().slice(-6)}`;

/**
 * The accountant pays an agency's ready claims in one run and downloads the paid-claims CSV;
 * the agency's admin then sees the run, its reference and the claims marked paid.
 */
// the payment date must lie between the run's creation day and tomorrow: pay it today (UTC)
const PAID_ON = new Date().toISOString().slice(0, 10);

test('the accountant creates a payment run, marks it paid, downloads the CSV; the agency admin sees the payment', async ({ page }) => {
  test.setTimeout(90_000);
  await signIn(page, 'accounts@larkfield.test');
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Payment runs' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'Payment runs' })).toBeVisible();
  await page.getByRole('link', { name: 'Ready to pay' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'Ready to pay' })).toBeVisible();

  // The agency's ready claims, all selected at first; their numbers and the selection total.
  const card = page.getByRole('region', { name: AGENCY });
  await expect(card).toBeVisible();
  const boxes = card.getByRole('checkbox', { name: /^Pay claim / });
  const count = await boxes.count();
  expect(count, 'ready claims of the agency in the demo scenario').toBeGreaterThan(0);
  const numbers: string[] = [];
  for (let i = 0; i < count; i++) {
    await expect(boxes.nth(i)).toBeChecked();
    numbers.push(((await boxes.nth(i).getAttribute('aria-label')) ?? '').replace('Pay claim ', ''));
  }
  await expect(card.getByText(`Selected: ${count} claim${count === 1 ? '' : 's'}`)).toBeVisible();
  await card.getByRole('button', { name: 'Create payment run' }).click();

  // The new run, open, with those claims.
  await expect(page).toHaveURL(/\/payment-runs\/[^/]+$/);
  const heading = page.getByRole('heading', { level: 1 });
  await expect(heading).toHaveText(/^PR-\d{4}-\d{4}$/);
  const runNumber = (await heading.textContent())!.trim();
  await expect(page.getByText('Open', { exact: true })).toBeVisible();
  const claimsTable = page.getByRole('table', { name: `Claims in ${runNumber}` });
  for (const n of numbers) await expect(claimsTable.getByRole('link', { name: n })).toBeVisible();

  // Mark paid with the date and the bank reference.
  await page.getByRole('button', { name: 'Mark paid' }).click();
  const dialog = page.getByRole('dialog', { name: `Mark ${runNumber} paid` });
  await expect(dialog).toBeVisible();
  await dialog.getByLabel('Payment date').fill(PAID_ON);
  await dialog.getByLabel('Bank or check reference').fill(REFERENCE);
  await dialog.getByRole('button', { name: 'Confirm payment' }).click();
  await expect(dialog).toBeHidden();
  await expect(page.getByRole('status').filter({ hasText: `reference ${REFERENCE}` })).toBeVisible();
  await expect(page.getByRole('button', { name: 'Mark paid' })).toHaveCount(0);
  for (const n of numbers) await expect(claimsTable.getByRole('row', { name: new RegExp(n) })).toContainText('Paid');

  // Download the paid-claims CSV for that payment date; the progress note ends with what was saved.
  await page.getByRole('link', { name: 'Payment runs' }).first().click();
  const exportCard = page.getByRole('region', { name: 'Paid-claims export' });
  await exportCard.getByLabel('Paid from').fill(PAID_ON);
  await exportCard.getByLabel('Paid to').fill(PAID_ON);
  const downloadPromise = page.waitForEvent('download');
  await exportCard.getByRole('button', { name: 'Download CSV' }).click();
  const download = await downloadPromise;
  expect(download.suggestedFilename()).toBe(`paid-claims-${PAID_ON}-to-${PAID_ON}.csv`);
  await expect(exportCard.getByTestId('export-done')).toContainText(/Saved paid-claims-.*\.csv: \d+ rows?/);
  const csv = readFileSync((await download.path())!, 'utf8');
  const rows = parse(csv, { columns: true, record_delimiter: ['\r\n'] }) as Record<string, string>[];
  const ours = rows.filter((r) => r.payment_run === runNumber);
  expect(ours.map((r) => r.claim_number).sort()).toEqual([...numbers].sort());
  for (const r of ours) {
    expect(r.payment_reference).toBe(REFERENCE);
    expect(r.payment_date).toBe(PAID_ON);
    expect(r.agency).toBe(AGENCY);
    expect(r.approved_total).toMatch(/^\d+\.\d{2}$/);
  }
  await signOut(page);

  // The agency's admin sees the run with its reference, and the claims marked paid.
  await signIn(page, 'admin@prairieline.test');
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Payment runs' }).click();
  const runsTable = page.getByRole('table', { name: 'Payment runs' });
  const runRow = runsTable.getByRole('row', { name: new RegExp(runNumber) });
  await expect(runRow).toContainText(REFERENCE);
  await expect(runRow).toContainText('Paid');
  await runRow.getByRole('link', { name: runNumber }).click();
  await expect(page.getByRole('heading', { level: 1 })).toHaveText(runNumber);
  await expect(page.getByRole('button', { name: 'Mark paid' })).toHaveCount(0);
  const theirClaims = page.getByRole('table', { name: `Claims in ${runNumber}` });
  for (const n of numbers) await expect(theirClaims.getByRole('row', { name: new RegExp(n) })).toContainText('Paid');
  await theirClaims.getByRole('link', { name: numbers[0] }).click();
  await expect(page.getByRole('heading', { level: 1, name: numbers[0] })).toBeVisible();
  await expect(page.locator('main').getByText('Paid', { exact: true }).first()).toBeVisible();
  await signOut(page);
});
