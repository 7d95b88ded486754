import { request as apiRequest, type APIRequestContext } from '@playwright/test';
import { test, expect } from './fixtures';
import { apiClaimNumbers, authenticatorCode, demoRoles, DEMO_PASSWORD, signIn, signOut } from './fixtures';

/** What each role may list, read from the API as that role (the server scopes the list in SQL). */
interface Visible {
  numbers: Set<string>;
  agencies: Set<string>;
}

const visible = new Map<string, Visible>();
let everyClaim = new Set<string>();

async function signedInApi(baseURL: string, email: string): Promise<APIRequestContext> {
  const ctx = await apiRequest.newContext({ baseURL, extraHTTPHeaders: { origin: baseURL } });
  const res = await ctx.post('/api/auth/sign-in', { data: { email, password: DEMO_PASSWORD } });
  expect(res.status(), `API sign-in as ${email}`).toBe(200);
  if ((await res.json()).secondFactor) {
    const done = await ctx.post('/api/auth/second-factor/totp', { data: { code: await authenticatorCode(email) } });
    expect(done.status(), `second factor of ${email}`).toBe(200);
  }
  return ctx;
}

test.beforeAll(async ({ baseURL }) => {
  for (const role of demoRoles) {
    const ctx = await signedInApi(baseURL!, role.email);
    const { numbers, agencies } = await apiClaimNumbers(ctx);
    visible.set(role.email, { numbers: new Set(numbers), agencies });
    await ctx.post('/api/auth/sign-out');
    await ctx.dispose();
  }
  everyClaim = new Set([...visible.values()].flatMap((v) => [...v.numbers]));
});

for (const role of demoRoles) {
  test(`${role.key} signs in, sees the home page and only the claims it may see, and signs out`, async ({ page }) => {
    const mine = visible.get(role.email)!;
    const others = [...everyClaim].filter((n) => !mine.numbers.has(n));

    await signIn(page, role.email);

    // Home: a heading, the person's organisation, and at least one queue card or notice.
    await expect(page).toHaveURL(/\/$/);
    await expect(page.getByRole('heading', { level: 1 })).toBeVisible();
    await expect(page.getByRole('banner')).toContainText(role.organisation);
    const cards = page.locator('main section[aria-labelledby]');
    const notices = page.getByRole('region', { name: 'Notices' });
    await expect(cards.or(notices).first()).toBeVisible();
    expect((await cards.count()) + (await notices.count()), 'at least one card or notice on the home page').toBeGreaterThan(0);

    const nav = page.getByRole('navigation', { name: 'Main' });
    if (!role.readsClaims) {
      // No claims for this role: no Claims link, an empty list, and nothing from the API.
      await expect(nav.getByRole('link', { name: 'Home' })).toBeVisible();
      await expect(nav.getByRole('link', { name: 'Claims', exact: true })).toHaveCount(0);
      expect(mine.numbers.size).toBe(0);
      await page.goto('/claims');
      await expect(page.getByRole('table').getByRole('link')).toHaveCount(0);
      for (const n of [...everyClaim].slice(0, 5)) await expect(page.getByText(n, { exact: true })).toHaveCount(0);
    } else {
      // The claims list, reached through the navigation.
      await nav.getByRole('link', { name: 'Claims', exact: true }).click();
      await expect(page).toHaveURL(/\/claims/);
      await expect(page.getByRole('heading', { level: 1, name: 'Claims' })).toBeVisible();
      const links = page.locator('main').getByRole('table').getByRole('link');
      await expect(links.first()).toBeVisible();
      const shown = (await links.allInnerTexts()).map((t) => t.trim()).filter(Boolean);
      expect(shown.length).toBeGreaterThan(0);

      // Every number on screen is one this role may list, and none belongs only to others.
      for (const n of shown) expect(mine.numbers, `claim ${n} on ${role.email}'s list`).toContain(n);
      expect(shown.filter((n) => others.includes(n))).toEqual([]);
      // The count on screen is the API's count under the same scope.
      await expect(page.getByText(new RegExp(`^${mine.numbers.size.toLocaleString('en-US')} claims?$`))).toBeVisible();

      if (role.kind === 'agency') {
        // Tenancy: an agency user lists its own agency's claims only, and other claims exist.
        expect([...mine.agencies]).toEqual([role.organisation]);
        expect(others.length).toBeGreaterThan(0);
      } else {
        expect(mine.agencies.size, 'the manufacturer sees claims of more than one agency').toBeGreaterThan(1);
      }

      // The page's own session, through the API, agrees with what the list showed.
      const first = await page.request.get('/api/claims?limit=25');
      expect(first.status()).toBe(200);
      const body = (await first.json()) as { items: { number: string }[]; total: number };
      expect(body.total).toBe(mine.numbers.size);
      expect(body.items.map((c) => c.number)).toEqual(shown);
    }

    await signOut(page);
    await page.goto('/claims');
    await expect(page).toHaveURL(/\/sign-in/);
    await expect(page.getByRole('form', { name: 'Sign in' })).toBeVisible();
    expect((await page.request.get('/api/claims')).status()).toBe(401);
  });
}
