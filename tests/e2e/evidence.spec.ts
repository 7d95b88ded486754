import { test, expect, type Page } from './fixtures';
import sharp from 'sharp';
import { signIn, signOut } from './fixtures';

/**
 * Evidence end to end in the browser: a technician attaches two photos to a draft claim with
 * their roles, watches them upload and sees them in the gallery; imports a readings sheet and
 * sees the readings judged on the claim page; then attaches the very same photo bytes to a
 * returned claim of the agency. The reviewer opens that claim, opens the photo in the gallery
 * and sees the reuse check naming the draft claim.
 */

const TECH = 'tech@harborview.test';
const REVIEWER = 'reviewer@larkfield.test';

interface ListedClaim {
  id: string;
  number: string;
  state: string;
  modelNumber: string | null;
}

interface Spec {
  key: string;
  label: string;
  unit: string;
  nominal: number;
  tolerance: number;
  phase: 'before' | 'after' | 'both';
}

/** An invented picture: a plain background with a few coloured shapes, unique to the seed. */
async function photo(seed: number, format: 'png' | 'jpeg'): Promise<Buffer> {
  const hue = (n: number) => `hsl(${(seed * 47 + n * 97) % 360},70%,${40 + ((seed + n) % 4) * 10}%)`;
  const shapes = Array.from({ length: 12 }, (_, i) => {
    const x = (seed * 31 + i * 137) % 760;
    const y = (seed * 17 + i * 89) % 560;
    return i % 2
      ? `<rect x="${x}" y="${y}" width="${60 + ((i * 23) % 180)}" height="${40 + ((i * 37) % 140)}" fill="${hue(i)}"/>`
      : `<circle cx="${x}" cy="${y}" r="${30 + ((i * 29) % 90)}" fill="${hue(i + 5)}"/>`;
  }).join('');
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="800" height="600"><rect width="800" height="600" fill="${hue(99)}"/>${shapes}</svg>`;
  const img = sharp(Buffer.from(svg));
  return format === 'png' ? img.png().toBuffer() : img.jpeg({ quality: 85 }).toBuffer();
}

async function claimsIn(page: Page, state: string): Promise<ListedClaim[]> {
  const res = await page.request.get(`/api/claims?state=${state}&limit=100`);
  expect(res.status(), `GET /api/claims?state=${state}`).toBe(200);
  const items = ((await res.json()) as { items: ListedClaim[] }).items;
  return items.filter((c) => c.state === state);
}

async function readingSpecs(page: Page, claimId: string): Promise<Spec[]> {
  const res = await page.request.get(`/api/claims/${claimId}/readings`);
  expect(res.status()).toBe(200);
  return ((await res.json()) as { specs: Spec[] }).specs;
}

async function openEditor(page: Page, claim: ListedClaim) {
  await page.goto(`/claims/${claim.id}/edit`);
  const form = page.getByRole('form', { name: `Claim ${claim.number}` });
  await expect(form).toBeVisible();
  return form;
}

/** Picks the role for the next files and hands the files to the uploader's file input. */
async function attach(page: Page, roleLabel: string, file: { name: string; mimeType: string; buffer: Buffer }) {
  await page.getByLabel('What are you adding?').selectOption({ label: roleLabel });
  await page.getByTestId('evidence-input').setInputFiles(file);
  const row = page.getByTestId('upload-row').filter({ hasText: file.name });
  await expect(row.getByRole('progressbar', { name: `Upload of ${file.name}` })).toHaveAttribute('aria-valuenow', '100', { timeout: 20_000 });
  await expect(row.getByText(/^(Uploaded|Imported)$/)).toBeVisible({ timeout: 20_000 });
  return row;
}

test('photos with roles, a readings sheet, and a reused photo the reviewer sees flagged', async ({ page }) => {
  test.setTimeout(120_000);
  const seed = Date.now() % 100_000;
  const plate = { name: `serial-plate-${seed}.png`, mimeType: 'image/png', buffer: await photo(seed, 'png') };
  const part = { name: `failed-part-${seed}.jpg`, mimeType: 'image/jpeg', buffer: await photo(seed + 7, 'jpeg') };

  await signIn(page, TECH);

  // A draft of the technician's agency whose model has reading specs, and a returned claim.
  let draft: ListedClaim | undefined;
  let specs: Spec[] = [];
  for (const c of await claimsIn(page, 'draft')) {
    const s = await readingSpecs(page, c.id);
    if (s.length > 0) {
      draft = c;
      specs = s;
      break;
    }
  }
  expect(draft, 'a draft claim with reading specs').toBeDefined();
  const returned = (await claimsIn(page, 'returned'))[0];
  expect(returned, 'a returned claim').toBeDefined();

  // ---- two photos on the draft, each with its role ----------------------------------------------
  await openEditor(page, draft!);
  const plateRow = await attach(page, 'Serial plate', plate);
  await expect(plateRow.getByRole('combobox')).toHaveValue('serial_plate');
  const partRow = await attach(page, 'Failed part', part);
  await expect(partRow.getByRole('combobox')).toHaveValue('failed_part');
  const gallery = page.getByRole('list', { name: 'Evidence gallery' });
  await expect(gallery.getByRole('button', { name: `Open Serial plate: ${plate.name}` })).toBeVisible();
  await expect(gallery.getByRole('button', { name: `Open Failed part: ${part.name}` })).toBeVisible();

  // ---- a readings sheet, each value half a tolerance above nominal -------------------------------
  const valueOf = (s: Spec) => Number((s.nominal + s.tolerance / 2).toFixed(3));
  const phasesOf = (s: Spec): Array<'before' | 'after'> => (s.phase === 'both' ? ['before', 'after'] : [s.phase]);
  const rows = specs.flatMap((s) => phasesOf(s).map((ph) => `${s.key},${ph},${valueOf(s)},${s.unit}`));
  const csv = { name: `readings-${seed}.csv`, mimeType: 'text/csv', buffer: Buffer.from(`key,phase,value,unit\n${rows.join('\n')}\n`) };
  const csvRow = await attach(page, 'Readings sheet', csv);
  await expect(csvRow.getByText('Imported')).toBeVisible();
  await expect(csvRow.getByRole('list', { name: `Problems in ${csv.name}` })).toHaveCount(0);

  // the form takes the imported values, and the judged list shows each one within its band
  const judged = page.getByRole('region', { name: 'Readings against the specification' });
  await expect(judged).toBeVisible();
  for (const s of specs) {
    for (const ph of phasesOf(s)) {
      const item = judged.getByRole('listitem').filter({ hasText: `${s.label} ${ph} repair: ${valueOf(s).toLocaleString('en-US')} ` });
      await expect(item).toHaveCount(1);
      await expect(item).toContainText('within tolerance');
      await expect(item.getByText('Pass', { exact: true })).toBeVisible();
    }
  }
  const first = specs[0];
  const field = page.getByRole('listitem', { name: first.label, exact: true });
  await expect(field.getByRole('textbox', { name: new RegExp(`^${phasesOf(first)[0] === 'before' ? 'Before' : 'After'} repair`) })).toHaveValue(String(valueOf(first)));
  await expect(gallery.getByRole('button', { name: `Open Readings sheet: ${csv.name}` })).toBeVisible();

  // ---- the same photo bytes on the returned claim ------------------------------------------------
  await openEditor(page, returned);
  await attach(page, 'Serial plate', plate);
  const returnedGallery = page.getByRole('list', { name: 'Evidence gallery' });
  await expect(returnedGallery.getByRole('button', { name: `Open Serial plate: ${plate.name}` })).toContainText('Photo reused');
  await signOut(page);

  // ---- the reviewer opens the photo and sees the reuse check -------------------------------------
  await signIn(page, REVIEWER);
  await page.goto(`/claims/${returned.id}`);
  await expect(page.getByRole('heading', { level: 1, name: returned.number })).toBeVisible();
  await page.getByRole('list', { name: 'Evidence gallery' }).getByRole('button', { name: `Open Serial plate: ${plate.name}` }).click();
  const lightbox = page.getByRole('dialog', { name: `Serial plate: ${plate.name}` });
  await expect(lightbox).toBeVisible();
  await expect(lightbox.getByRole('img', { name: `Serial plate photo ${plate.name}` })).toBeVisible();
  const checks = lightbox.getByRole('list', { name: 'Checks on this file' });
  await expect(checks).toContainText('Photo reused');
  await expect(checks).toContainText(`is the same file (identical SHA-256) as a photo on claim ${draft!.number}.`);
  await lightbox.getByRole('button', { name: 'Close' }).click();
  await expect(lightbox).toBeHidden();
});
