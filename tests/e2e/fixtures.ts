import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import AxeBuilder from '@axe-core/playwright';
import { totpCodeFor } from '../factories/second-factor';
import { test as base, expect, type APIRequestContext, type Browser, type BrowserContext, type Page } from '@playwright/test';

export { expect };
export type { APIRequestContext, Page } from '@playwright/test';

/** The narrowest phone width every screen must fit without sideways scrolling. */
export const PHONE = { width: 390, height: 844 } as const;

/** How wide the document is against its viewport, measured in the page as it is now. */
async function measureWidth(page: Page): Promise<{ scrollWidth: number; clientWidth: number; widest: string }> {
  // two frames, so layout and any resize observers have run at the current width
  return page.evaluate(
    () =>
      new Promise<{ scrollWidth: number; clientWidth: number; widest: string }>((resolve) =>
        requestAnimationFrame(() =>
          requestAnimationFrame(() => {
            const root = document.documentElement;
            // name the element that sticks out furthest, so a failure says where to look
            let widest = '';
            let right = root.clientWidth;
            for (const el of Array.from(document.body.querySelectorAll('*'))) {
              const r = el.getBoundingClientRect().right + window.scrollX;
              if (r > right + 0.5) {
                right = r;
                widest = `${el.tagName.toLowerCase()}${el.id ? `#${el.id}` : ''}${typeof el.className === 'string' && el.className ? `.${el.className.split(/\s+/).slice(0, 3).join('.')}` : ''} (right edge ${Math.round(r)} px)`;
              }
            }
            resolve({ scrollWidth: root.scrollWidth, clientWidth: root.clientWidth, widest });
          }),
        ),
      ),
  );
}

/** How wide the document is at a 390 px phone width: this page resized, measured, and restored. */
export async function widthAt390(page: Page): Promise<{ scrollWidth: number; clientWidth: number; widest: string }> {
  const before = page.viewportSize();
  await page.setViewportSize(PHONE);
  try {
    return await measureWidth(page);
  } finally {
    if (before) await page.setViewportSize(before);
  }
}

/** Pages the screen checks open themselves, which are not watched in turn. */
const twins = new WeakSet<Page>();

/**
 * The same address opened in a second page of the same context (same session) at 390x844 and
 * measured there, so the journey's own page never changes size under its steps (a read of a
 * table hidden at phone width would otherwise come back empty).
 */
async function widthAt390Twin(context: BrowserContext, url: string): Promise<{ scrollWidth: number; clientWidth: number; widest: string }> {
  const twin = await context.newPage();
  twins.add(twin);
  try {
    await twin.setViewportSize(PHONE);
    await twin.goto(url, { waitUntil: 'load', timeout: 15_000 });
    await twin.waitForLoadState('networkidle', { timeout: 2_000 }).catch(() => undefined);
    return await measureWidth(twin);
  } finally {
    await twin.close();
  }
}

/** Asserts the screen does not scroll sideways at a 390 px phone width. */
export async function expectNoOverflowAt390(page: Page): Promise<void> {
  const w = await widthAt390(page);
  expect(w.scrollWidth, `${page.url()} is ${w.scrollWidth} px wide at 390 px; widest: ${w.widest}`).toBeLessThanOrEqual(w.clientWidth);
}

/** Every axe-core violation on the page as it is now, one line each (rule, impact, first targets). */
export async function axeViolations(page: Page): Promise<string[]> {
  // colours mid-transition (a hover fading out under the pointer) are not the page's colours:
  // stop transitions while axe measures contrast, then put them back
  await page.evaluate(() => {
    const style = document.createElement('style');
    style.id = 'screen-check-no-motion';
    style.textContent = '*, *::before, *::after { transition: none !important; animation: none !important; }';
    document.head.append(style);
  });
  let results;
  try {
    results = await new AxeBuilder({ page }).analyze();
  } finally {
    await page.evaluate(() => document.getElementById('screen-check-no-motion')?.remove()).catch(() => undefined);
  }
  return results.violations.map(
    (v) => `${v.id} (${v.impact ?? 'n/a'}): ${v.help} at ${v.nodes
      .slice(0, 3)
      .map((n) => n.target.join(' '))
      .join(', ')}${v.nodes.length > 3 ? ` and ${v.nodes.length - 3} more` : ''}`,
  );
}

/** Asserts axe-core finds no violation on the page as it is now. */
export async function expectNoAxeViolations(page: Page): Promise<void> {
  const found = await axeViolations(page);
  expect(found, `axe-core on ${page.url()}`).toEqual([]);
}

/** A navigation away or a closed page ends a check without a finding; the next screen gets its own check. */
function gone(e: unknown): boolean {
  const m = e instanceof Error ? e.message : String(e);
  return /Execution context was destroyed|Target page, context or browser has been closed|Target closed|navigation|frame was detached|has been closed/i.test(m);
}

/**
 * Watches a page: after every main-frame navigation (loads and in-app route changes alike) the
 * screen, once settled, is checked with axe-core (in the page as it is) and for sideways overflow
 * at 390 px (the same address in a second page at phone size). Checks run one at a time; findings
 * are collected, never thrown into the journey's own steps.
 */
class ScreenWatch {
  private chain: Promise<void> = Promise.resolve();
  private timers = new Set<ReturnType<typeof setTimeout>>();
  readonly findings: string[] = [];
  private checked = 0;

  watch(page: Page): void {
    if (twins.has(page)) return;
    page.on('framenavigated', (frame) => {
      if (frame !== page.mainFrame()) return;
      if (!/^https?:/.test(frame.url())) return;
      this.schedule(page);
    });
  }

  private seen = new Set<string>();

  private schedule(page: Page): void {
    // each address once per test (axe takes a second of the page's CPU on a busy machine); the
    // last state of every page is checked again at the end
    const key = page.url().split('#')[0]!;
    if (this.seen.has(key)) return;
    this.seen.add(key);
    // let the route render its data before looking; a newer navigation still gets its own check
    const t = setTimeout(() => {
      this.timers.delete(t);
      this.chain = this.chain.then(() => this.check(page));
    }, 400);
    this.timers.add(t);
  }

  private async check(page: Page): Promise<void> {
    if (page.isClosed()) return;
    const url = page.url();
    // a page that never left about:blank (opened, then not used) shows no screen of the app
    if (!/^https?:/.test(url)) return;
    try {
      await page.waitForLoadState('load', { timeout: 10_000 });
      await page.waitForLoadState('networkidle', { timeout: 2_000 }).catch(() => undefined);
      if (page.isClosed() || page.url() !== url) return;
      const w = await widthAt390Twin(page.context(), url);
      if (w.scrollWidth > w.clientWidth) this.findings.push(`${url}: ${w.scrollWidth} px wide at 390 px (widest: ${w.widest})`);
      if (page.isClosed() || page.url() !== url) return;
      for (const v of await axeViolations(page)) this.findings.push(`${url}: axe ${v}`);
      this.checked += 1;
    } catch (e) {
      if (!gone(e)) this.findings.push(`${url}: screen check failed: ${e instanceof Error ? e.message : String(e)}`);
    }
  }

  /** Checks the last state of every open page, then waits for every queued check. */
  async finish(pages: Page[]): Promise<{ findings: string[]; checked: number }> {
    for (const t of this.timers) clearTimeout(t);
    this.timers.clear();
    for (const p of pages) if (!p.isClosed()) this.chain = this.chain.then(() => this.check(p));
    await this.chain;
    return { findings: [...new Set(this.findings)], checked: this.checked };
  }
}

/**
 * The journeys' `test`: every page of every browser context a test opens (its own `page` and any
 * `browser.newContext()`) is checked automatically on every screen it visits, and the test fails
 * listing each screen with an axe-core violation or sideways overflow at 390 px.
 */
export const test = base.extend<{ screenChecks: void }>({
  screenChecks: [
    async ({ context, browser }, use, testInfo) => {
      const watch = new ScreenWatch();
      const contexts: BrowserContext[] = [context];
      const hook = (c: BrowserContext) => {
        for (const p of c.pages()) watch.watch(p);
        c.on('page', (p) => watch.watch(p));
      };
      hook(context);
      const b = browser as Browser & { newContext: Browser['newContext'] };
      const original = b.newContext;
      b.newContext = async (...args: Parameters<Browser['newContext']>) => {
        const c = await original.apply(browser, args);
        contexts.push(c);
        hook(c);
        return c;
      };
      try {
        await use();
      } finally {
        b.newContext = original;
      }
      if (testInfo.status !== testInfo.expectedStatus) return; // the journey's own failure is the story
      const { findings, checked } = await watch.finish(contexts.flatMap((c) => c.pages()));
      testInfo.annotations.push({ type: 'screens checked', description: String(checked) });
      expect(findings, 'screens with an axe-core violation or sideways overflow at 390 px').toEqual([]);
    },
    { auto: true },
  ],
});

export const DEMO_PASSWORD = 'fieldproof-demo';

export interface DemoRole {
  key: string;
  email: string;
  /** The organisation the account belongs to, as the app shows it. */
  organisation: string;
  kind: 'agency' | 'manufacturer';
  /** Whether the role reads claims at all (the manufacturer's admin runs the catalogue and agencies, not claims). */
  readsClaims: boolean;
}

export const demoRoles: DemoRole[] = [
  { key: 'technician (Harborview)', email: 'tech@harborview.test', organisation: 'Harborview Appliance Service', kind: 'agency', readsClaims: true },
  { key: 'agency admin (Harborview)', email: 'admin@harborview.test', organisation: 'Harborview Appliance Service', kind: 'agency', readsClaims: true },
  { key: 'technician (Prairie Line)', email: 'tech@prairieline.test', organisation: 'Prairie Line Kitchen Repair', kind: 'agency', readsClaims: true },
  { key: 'agency admin (Prairie Line)', email: 'admin@prairieline.test', organisation: 'Prairie Line Kitchen Repair', kind: 'agency', readsClaims: true },
  { key: 'reviewer', email: 'reviewer@larkfield.test', organisation: 'Larkfield Cookline Co.', kind: 'manufacturer', readsClaims: true },
  { key: 'accountant', email: 'accounts@larkfield.test', organisation: 'Larkfield Cookline Co.', kind: 'manufacturer', readsClaims: true },
  { key: 'manufacturer admin', email: 'admin@larkfield.test', organisation: 'Larkfield Cookline Co.', kind: 'manufacturer', readsClaims: false },
];

/** Demo accounts whose role needs a second factor: the seed gives them an authenticator secret. */
export const accountsWithCode = new Set(['accounts@larkfield.test', 'admin@larkfield.test']);

/** The database of the app under test (tests/e2e/start-server.ts puts it there). */
export const e2eDatabasePath = join(tmpdir(), `fieldproof-e2e-${process.env.E2E_PORT ?? 3210}`, 'e2e.sqlite');

/**
 * The current authenticator code of a seeded account, computed from its secret in the app's
 * database as `npm run demo:code` does. Each code works once: when the codes of this moment
 * were all used by earlier sign-ins, it waits for the next 30-second step, as a person would.
 */
export async function authenticatorCode(email: string): Promise<string> {
  for (let attempt = 0; ; attempt++) {
    const db = new Database(e2eDatabasePath, { readonly: true, fileMustExist: true });
    try {
      return totpCodeFor(db, email);
    } catch (e) {
      if (attempt >= 8) throw e;
    } finally {
      db.close();
    }
    await new Promise((r) => setTimeout(r, 5_000));
  }
}

/** Types the authenticator code into the sign-in's second step. */
export async function enterAuthenticatorCode(page: Page, email: string): Promise<void> {
  const form = page.getByRole('form', { name: 'Second factor' });
  await expect(form).toBeVisible();
  await form.getByLabel('Authenticator code').fill(await authenticatorCode(email));
  await form.getByRole('button', { name: 'Verify' }).click();
}

/** Signs in through the form, as a person would (with the authenticator code where the account has one), and waits until the app has left the sign-in page. */
export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto('/sign-in');
  const form = page.getByRole('form', { name: 'Sign in' });
  await form.getByLabel('E-mail').fill(email);
  await form.getByLabel('Password', { exact: true }).fill(password);
  await form.getByRole('button', { name: 'Sign in' }).click();
  if (accountsWithCode.has(email)) await enterAuthenticatorCode(page, email);
  await expect(page).not.toHaveURL(/\/sign-in/);
}

/** Signs out with the header button and waits for the sign-in page. */
export async function signOut(page: Page): Promise<void> {
  await page.getByRole('button', { name: 'Sign out' }).click();
  await expect(page).toHaveURL(/\/sign-in/);
}

export interface MailboxMessage {
  id: number;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  receivedAt: string;
}

/** Every message the app's local mail sink holds, read through the development mailbox API. */
export async function readMailbox(request: APIRequestContext): Promise<MailboxMessage[]> {
  const res = await request.get('/api/dev/mailbox');
  expect(res.status(), 'GET /api/dev/mailbox').toBe(200);
  const body = (await res.json()) as MailboxMessage[] | { messages: MailboxMessage[] };
  return Array.isArray(body) ? body : body.messages;
}

/** Waits for a message to `to` newer than `afterId` and returns it (mail leaves through the outbox after the commit). */
export async function waitForMail(request: APIRequestContext, to: string, afterId = 0, timeoutMs = 15_000): Promise<MailboxMessage> {
  let found: MailboxMessage | undefined;
  await expect
    .poll(
      async () => {
        const all = await readMailbox(request);
        found = all.filter((m) => m.id > afterId && m.to.some((t) => t.toLowerCase() === to.toLowerCase())).at(-1);
        return !!found;
      },
      { timeout: timeoutMs, message: `a message to ${to}` },
    )
    .toBe(true);
  return found!;
}

/** The highest message id in the mailbox now, so a test can wait for a newer one. */
export async function lastMailId(request: APIRequestContext): Promise<number> {
  const all = await readMailbox(request);
  return all.reduce((max, m) => Math.max(max, m.id), 0);
}

/** The first link in a message that points at the app, or throws. */
export function linkIn(message: MailboxMessage, pathStart: string): string {
  const links = [...`${message.text}\n${message.html ?? ''}`.matchAll(/https?:\/\/[^\s"'<>)]+/g)].map((m) => m[0].replace(/&amp;/g, '&'));
  const link = links.find((l) => new URL(l).pathname.startsWith(pathStart));
  if (!link) throw new Error(`no ${pathStart} link in "${message.subject}": ${links.join(', ') || 'no links'}`);
  return link;
}

/** Every claim number the API lets the signed-in user list (all pages), through the page's own cookie. */
export async function apiClaimNumbers(request: APIRequestContext): Promise<{ numbers: string[]; agencies: Set<string> }> {
  const numbers: string[] = [];
  const agencies = new Set<string>();
  let cursor: string | null = null;
  for (let i = 0; i < 50; i++) {
    const url: string = `/api/claims?limit=100${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ''}`;
    const res = await request.get(url);
    expect(res.status(), `GET ${url}`).toBe(200);
    const page = (await res.json()) as { items: { number: string; agencyName: string }[]; nextCursor: string | null };
    for (const c of page.items) {
      numbers.push(c.number);
      agencies.add(c.agencyName);
    }
    cursor = page.nextCursor;
    if (!cursor) break;
  }
  return { numbers, agencies };
}
