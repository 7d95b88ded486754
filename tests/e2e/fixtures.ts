import { expect, type APIRequestContext, type Page } from '@playwright/test';

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

/** Signs in through the form, as a person would, and waits until the app has left the sign-in page. */
export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto('/sign-in');
  const form = page.getByRole('form', { name: 'Sign in' });
  await form.getByLabel('E-mail').fill(email);
  await form.getByLabel('Password', { exact: true }).fill(password);
  await form.getByRole('button', { name: 'Sign in' }).click();
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
