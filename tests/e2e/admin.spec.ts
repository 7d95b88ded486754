import { expect, test, type APIRequestContext, type Page } from './fixtures';
import { lastMailId, linkIn, signIn, signOut, waitForMail } from './fixtures';

// Administration journeys in the browser: an agency admin invites a technician who accepts from
// the mailed link; the admin records a certification; the manufacturer admin changes a repair
// code's allowance, and a claim repaired from that day is valued with it while one repaired the
// day before keeps the old allowance (allowances are effective-dated: common practice for
// labor-time guides).

// Each journey crosses several sign-ins and mails: more than the default 30 s on a busy machine.
test.describe.configure({ timeout: 120_000 });

const NEW_PASSWORD = 'marigold tugboat lantern quarry';
const today = () => new Date().toISOString().slice(0, 10);
const daysAgo = (n: number) => new Date(Date.now() - n * 86_400_000).toISOString().slice(0, 10);
const unique = Date.now().toString(36).toUpperCase();

async function openUsers(page: Page) {
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Users' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'Users and agency' })).toBeVisible();
}

test('an agency admin invites a technician, who accepts from the mailbox link and signs in; the admin records a certification, then revokes it with a reason', async ({ page, request }) => {
  const email = `e2e.tech.${unique.toLowerCase()}@harborview.test`;
  const name = 'Solveig Tarrant';

  await signIn(page, 'admin@harborview.test');
  await openUsers(page);
  const before = await lastMailId(request);
  await page.getByRole('button', { name: 'Invite someone' }).click();
  const invite = page.getByRole('form', { name: 'Invite a user' });
  await invite.getByLabel('E-mail address').fill(email);
  await invite.getByLabel('Role').selectOption({ label: 'Technician' });
  await invite.getByRole('button', { name: 'Send the invitation' }).click();
  await expect(page.getByText(`An invitation is on its way to ${email}.`)).toBeVisible();
  await expect(page.getByRole('list', { name: 'Pending invitations' }).getByText(email)).toBeVisible();
  await signOut(page);

  // The invitee opens the link from the mail.
  const mail = await waitForMail(request, email, before);
  expect(mail.subject).toContain('Harborview Appliance Service');
  const link = linkIn(mail, '/accept-invitation');
  await page.goto(link);
  const accept = page.getByRole('form', { name: 'Accept the invitation' });
  await expect(accept.getByText(email)).toBeVisible();
  await accept.getByLabel('Your name').fill(name);
  await accept.getByLabel('Password', { exact: true }).fill('password1234567');
  await accept.getByLabel('Password again').fill('password1234567');
  await accept.getByRole('button', { name: 'Create my account' }).click();
  await expect(accept.getByText(/too common|easy to guess/)).toBeVisible();
  await accept.getByLabel('Password', { exact: true }).fill(NEW_PASSWORD);
  await accept.getByLabel('Password again').fill(NEW_PASSWORD);
  await accept.getByRole('button', { name: 'Create my account' }).click();
  await expect(page.getByText('Your account is ready')).toBeVisible();

  // The link works once.
  await page.goto(link);
  await expect(page.getByText('This invitation cannot be used')).toBeVisible();
  await expect(page.getByText(/already been used/)).toBeVisible();

  await signIn(page, email, NEW_PASSWORD);
  await expect(page.getByRole('heading', { level: 1 })).toContainText('Solveig');
  await expect(page.getByText('Technician at Harborview Appliance Service')).toBeVisible();
  await signOut(page);

  // The admin records a certification for the new technician.
  await signIn(page, 'admin@harborview.test');
  await openUsers(page);
  const row = page.getByRole('row').filter({ hasText: email });
  await expect(row.getByText('None on file')).toBeVisible();
  await row.getByRole('button', { name: 'Certifications' }).click();
  const cert = page.getByRole('form', { name: 'Record a certificate' });
  await cert.getByLabel('Product family').selectOption({ index: 1 });
  await cert.getByLabel('Certificate number').fill(`E2E-${unique}`);
  await cert.getByLabel('Valid from').fill(daysAgo(10));
  await cert.getByLabel('Valid to (last day)').fill(daysAgo(-400));
  await cert.getByRole('button', { name: 'Record the certificate' }).click();
  await expect(page.getByText(`Saved certificate E2E-${unique}`)).toBeVisible();
  await expect(page.getByRole('list', { name: `Certificates of ${name}` }).getByText(`No. E2E-${unique}`)).toBeVisible();
  await page.getByRole('button', { name: 'Close' }).click();
  await expect(row.getByText('Valid', { exact: true })).toBeVisible();

  // The admin revokes it: a reason is required, and the list then says so with the reason.
  await row.getByRole('button', { name: 'Certifications' }).click();
  const list = page.getByRole('list', { name: `Certificates of ${name}` });
  await list.getByRole('button', { name: 'Revoke', exact: true }).click();
  const revoke = page.getByRole('form', { name: `Revoke certificate E2E-${unique}` });
  await revoke.getByRole('button', { name: 'Revoke the certificate' }).click();
  await expect(revoke.getByText('Enter why the certificate is revoked.')).toBeVisible();
  await revoke.getByLabel('Reason for revoking').fill('Training record could not be confirmed');
  await revoke.getByRole('button', { name: 'Revoke the certificate' }).click();
  await expect(page.getByText(`Revoked certificate E2E-${unique}`)).toBeVisible();
  await expect(list.getByText('Revoked', { exact: true })).toBeVisible();
  await expect(list.getByText(/Training record could not be confirmed/)).toBeVisible();
  await page.getByRole('button', { name: 'Close' }).click();
  await expect(row.getByText('None on file')).toBeVisible();
});

interface Labor {
  kind: string;
  inputs: Record<string, unknown>;
}

async function draftWith(request: APIRequestContext, serial: string, repairCodeId: string, repairDate: string) {
  const res = await request.post('/api/claims', {
    data: {
      serial,
      complaint: 'Unit does not reach temperature.',
      cause: 'Failed component.',
      correction: 'Replaced the component and verified a cook cycle.',
      failureDate: repairDate,
      repairDate,
      laborLines: [{ repairCodeId, hoursWorked: 4, overtime: false, note: '' }],
    },
  });
  expect(res.status(), `POST /api/claims ${await res.text()}`).toBe(201);
  const claim = (await res.json()) as { id: string; version: number };
  const v = await request.get(`/api/claims/${claim.id}/valuation`);
  expect(v.status(), `valuation ${await v.text()}`).toBe(200);
  const labor = ((await v.json()) as { lines: Labor[] }).lines.find((l) => l.kind === 'labor')!;
  return { claim, allowedHours: labor.inputs.allowedHours };
}

test('the manufacturer admin changes a repair code allowance; a claim repaired from that day is valued with it', async ({ page, browser }) => {
  // A unit the Harborview technician can claim for, and its product family.
  const tech = await browser.newContext();
  const techPage = await tech.newPage();
  await signIn(techPage, 'tech@harborview.test');
  const list = (await (await techPage.request.get('/api/claims?limit=50')).json()) as { items: { serial: string | null }[] };
  const serial = list.items.find((c) => c.serial)!.serial!;
  const unit = (await (await techPage.request.get(`/api/units/${encodeURIComponent(serial)}`)).json()) as { family: { id: string } };

  // The manufacturer admin adds a repair code for that family, then changes its allowance on screen.
  await signIn(page, 'admin@larkfield.test');
  const code = `E2E-${unique}`.slice(0, 24);
  const created = await page.request.post('/api/admin/repair-codes', {
    data: { code, familyId: unit.family.id, description: 'Replace the test component', allowedHours: 1.5, requiredEvidence: [] },
  });
  expect(created.status()).toBe(201);
  const repairCodeId = ((await created.json()) as { id: string }).id;
  // Before the change, a claim repaired yesterday is valued with 1.5 h.
  const earlier = await draftWith(techPage.request, serial, repairCodeId, daysAgo(1));
  expect(earlier.allowedHours).toBe(1.5);

  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Catalogue' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'Catalogue' })).toBeVisible();
  await page.getByRole('button', { name: `Edit repair code ${code}` }).click();
  await page.getByLabel('Allowed hours').fill('2.75');
  await expect(page.getByLabel('Applies to repairs from')).toHaveValue(today());
  await page.getByRole('button', { name: 'Save' }).click();
  await expect(page.getByRole('row').filter({ hasText: code }).getByText('2.75 h')).toBeVisible();

  // A new claim repaired today uses the new allowance; the one repaired yesterday keeps the old one.
  const later = await draftWith(techPage.request, serial, repairCodeId, today());
  expect(later.allowedHours).toBe(2.75);
  const again = await techPage.request.get(`/api/claims/${earlier.claim.id}/valuation`);
  expect(((await again.json()) as { lines: Labor[] }).lines.find((l) => l.kind === 'labor')!.inputs.allowedHours).toBe(1.5);

  // Leave the demo as it was: withdraw the two drafts and retire the test repair code.
  for (const c of [earlier.claim, later.claim]) {
    const current = (await (await techPage.request.get(`/api/claims/${c.id}`)).json()) as { version: number };
    expect((await techPage.request.post(`/api/claims/${c.id}/transitions`, { data: { type: 'withdraw', version: current.version } })).status()).toBe(200);
  }
  expect((await page.request.patch(`/api/admin/repair-codes/${repairCodeId}`, { data: { active: false } })).status()).toBe(200);
  await tech.close();
});

test('the manufacturer admin adds a mileage rate in the catalogue and sees the days no rate covers', async ({ page }) => {
  await signIn(page, 'admin@larkfield.test');
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Catalogue' }).click();
  await page.getByRole('tab', { name: 'Mileage rates' }).click();
  const table = page.getByRole('table', { name: 'Mileage rates' });
  await expect(table.getByRole('row').filter({ hasText: 'IRS Notice 2024-08' })).toContainText('67 cents per mile');

  // a per-kilometre rate for a currency with no rate yet, in a year of its own (no overlap on re-runs)
  const year = 2100 + (Date.now() % 800);
  await page.getByRole('button', { name: 'New rate' }).click();
  await page.getByLabel(/^Currency/).fill('CAD');
  await page.getByLabel(/^Distance unit/).selectOption('km');
  await page.getByLabel(/^First day in force/).fill(`${year}-01-01`);
  await page.getByLabel(/^Last day in force/).fill(`${year}-12-31`);
  await page.getByLabel(/^Rate in cents/).fill('41.5');
  await page.getByLabel(/^Source/).fill('Test rate added by the browser journey');
  await page.getByRole('button', { name: 'Add the rate' }).click();
  await expect(table.getByRole('row').filter({ hasText: 'Test rate added by the browser journey' }).filter({ hasText: String(year) })).toContainText('41.5 cents per kilometre');
  await expect(page.getByText('No CAD rate is in force today', { exact: false })).toBeVisible();

  // the same period again is refused with the period in force named on the field
  await page.getByRole('button', { name: 'New rate' }).click();
  await page.getByLabel(/^Currency/).fill('CAD');
  await page.getByLabel(/^Distance unit/).selectOption('km');
  await page.getByLabel(/^First day in force/).fill(`${year}-06-01`);
  await page.getByLabel(/^Rate in cents/).fill('42');
  await page.getByLabel(/^Source/).fill('Overlapping test rate');
  await page.getByRole('button', { name: 'Add the rate' }).click();
  await expect(page.getByText(`in force ${year}-01-01 to ${year}-12-31`).first()).toBeVisible();
});
