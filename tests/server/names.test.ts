import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cpSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { drizzle } from 'drizzle-orm/better-sqlite3';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import { eq } from 'drizzle-orm';
import { organisations } from '../../server/db/schema/index';
import { openDatabase } from '../../server/db/client';
import { makeTestApp, TestClock, type TestApp } from '../factories/test-app';
import { multiLine, nameKey, oneLine } from '../../shared/schemas/text';
import { agencyProfileSchema } from '../../shared/schemas/admin';
import { commentSchema } from '../../shared/workflow/workflow-schemas';
import { markPaidSchema } from '../../shared/schemas/payment';

// Character classes refused in names: C0/C1 controls and the bidirectional formatting characters
// listed in Unicode Standard Annex #9 (embeddings/overrides U+202A–U+202E, isolates U+2066–U+2069,
// marks U+200E, U+200F, U+061C); "Trojan Source" (CVE-2021-42574) is the known attack with U+202E.

const RLO = '\u202E';
const name = (base: string) => oneLine({ max: 120, label: 'Name' }).safeParse(base);
const messageOf = (r: { success: boolean; error?: { issues: { message: string }[] } }) => (r.success ? null : r.error!.issues[0].message);

describe('the shared text schema', () => {
  it('normalises to NFC and trims', () => {
    // U+0065 U+0301 (e + combining acute) is canonically equivalent to U+00E9 (Unicode Standard Annex #15).
    const r = name('  Cafe\u0301 Row  ');
    expect(r.success && r.data).toBe('Caf\u00e9 Row');
  });

  it('refuses CR, LF, tab, NUL, C1 controls, bidi overrides and isolates, and zero-width characters in one-line fields, with a plain message', () => {
    expect(messageOf(name('Harbor\rview'))).toBe('Name cannot contain line breaks.');
    expect(messageOf(name('Harbor\nview'))).toBe('Name cannot contain line breaks.');
    expect(messageOf(name('Harbor\u2028view'))).toBe('Name cannot contain line breaks.');
    expect(messageOf(name('Harbor\tview'))).toBe('Name cannot contain tabs.');
    expect(messageOf(name('Harbor\u0000view'))).toBe('Name cannot contain control characters.');
    expect(messageOf(name('Harbor\u009bview'))).toBe('Name cannot contain control characters.');
    for (const c of ['\u202A', '\u202B', '\u202C', '\u202D', RLO, '\u2066', '\u2067', '\u2068', '\u2069', '\u200E', '\u200F', '\u061C']) {
      expect(messageOf(name(`Harbor${c}view`)), c.codePointAt(0)!.toString(16)).toBe('Name cannot contain text-direction control characters.');
    }
    for (const c of ['\u200B', '\u200C', '\u200D', '\u2060', '\uFEFF', '\u00AD']) {
      expect(messageOf(name(`Harbor${c}view`)), c.codePointAt(0)!.toString(16)).toBe('Name cannot contain invisible characters.');
    }
  });

  it('counts code points: 120 emoji fit a 120-character name, 121 do not; an empty name is required', () => {
    expect(name('\u{1F373}'.repeat(120)).success).toBe(true);
    expect(messageOf(name('\u{1F373}'.repeat(121)))).toBe('Keep it under 120 characters.');
    expect(messageOf(name('   '))).toBe('Name is required.');
  });

  it('multi-line text keeps line breaks (CRLF becomes LF) and still refuses bidi overrides and other controls', () => {
    const body = multiLine({ max: 4000, label: 'The complaint' });
    const ok = body.safeParse('Platen does not heat.\r\nChecked the fuse.\nReplaced it.');
    expect(ok.success && ok.data).toBe('Platen does not heat.\nChecked the fuse.\nReplaced it.');
    expect(messageOf(body.safeParse(`Replaced ${RLO}the fuse`))).toBe('The complaint cannot contain text-direction control characters.');
    expect(messageOf(body.safeParse('Replaced\u0007 the fuse'))).toBe('The complaint cannot contain control characters other than line breaks.');
    expect(messageOf(body.safeParse('Replaced\tthe fuse'))).toBe('The complaint cannot contain control characters other than line breaks.');
  });

  it('is the one used by the forms: agency profile, comments, payment references', () => {
    const profile = agencyProfileSchema.safeParse({ name: `Prairie ${RLO}Line`, contactEmail: null, addressLine: 'Dock 4\nRear', city: null, region: null, postalCode: null, latitude: null, longitude: null, timeZone: 'America/Chicago' });
    expect(profile.success).toBe(false);
    const fields = Object.fromEntries(profile.error!.issues.map((i) => [i.path.join('.'), i.message]));
    expect(fields).toEqual({ name: 'The agency name cannot contain text-direction control characters.', addressLine: 'The address cannot contain line breaks.' });
    expect(commentSchema.safeParse({ body: `ok ${RLO}` }).success).toBe(false);
    expect(commentSchema.safeParse({ body: 'two\nlines' }).success).toBe(true);
    expect(messageOf(markPaidSchema.safeParse({ paymentDate: '2026-06-01', reference: 'TR-1\r\nBcc: x' }))).toBe('The bank or check reference cannot contain line breaks.');
  });

  it('compares organisation names by a key that ignores case, spaces and compatibility forms', () => {
    expect(nameKey('Harborview Appliance Service')).toBe(nameKey('  HARBORVIEW   appliance\u00a0service '));
    expect(nameKey('Harbor View Appliance Service')).toBe(nameKey('HarborviewApplianceService'));
    // U+FF28 FULLWIDTH LATIN CAPITAL LETTER H is a compatibility form of H (NFKC, UAX #15).
    expect(nameKey('\uFF28arborview')).toBe(nameKey('harborview'));
    expect(nameKey('Harborview')).not.toBe(nameKey('Harborvue'));
  });
});

describe('agency names are unique on the platform and never the manufacturer’s', () => {
  let t: TestApp;
  let adminB: Awaited<ReturnType<TestApp['signIn']>>;
  let mfr: Awaited<ReturnType<TestApp['signIn']>>;
  let agencyB: string;
  const orgName = (kind: 'manufacturer' | 'agency', not?: string) =>
    t.db
      .select({ id: organisations.id, name: organisations.name })
      .from(organisations)
      .where(eq(organisations.kind, kind))
      .all()
      .find((o) => o.id !== not)!;

  beforeAll(async () => {
    t = await makeTestApp({ clock: new TestClock() });
    adminB = await t.signIn('adminB');
    mfr = await t.signIn('mfrAdmin');
    agencyB = (await adminB.get('/api/agency/profile')).body.id;
  });
  afterAll(async () => {
    await t.close();
  });

  it('the agency admin cannot rename the agency to another agency’s name, however cased or spaced, nor the manufacturer’s; nothing changes', async () => {
    const other = orgName('agency', agencyB).name;
    const maker = orgName('manufacturer').name;
    const before = t.db.select().from(organisations).where(eq(organisations.id, agencyB)).get()!;
    const tries: Array<[string, RegExp]> = [
      [other, /Another service agency already uses this name/],
      [other.toUpperCase(), /Another service agency already uses this name/],
      [`  ${other.toLowerCase().replace(/ /g, '   ')} `, /Another service agency already uses this name/],
      [other.replace(/ /g, ''), /Another service agency already uses this name/],
      [maker, /manufacturer’s name/],
      [maker.toLowerCase().replace(/ /g, '  '), /manufacturer’s name/],
      ['Prairie Line\rKitchen Repair', /cannot contain line breaks/],
      ['Prairie Line\nKitchen Repair', /cannot contain line breaks/],
      [`Prairie Line ${RLO}riapeR nehctiK`, /text-direction control characters/],
    ];
    for (const [n, message] of tries) {
      const res = await adminB.patch('/api/agency/profile').send({ name: n });
      expect(res.status, JSON.stringify(n)).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
      expect(res.body.error.fields.name).toMatch(message);
    }
    expect(t.db.select().from(organisations).where(eq(organisations.id, agencyB)).get()).toEqual(before);
  });

  it('a rename that only changes its own case or spacing is allowed, and the key follows the name', async () => {
    const own = t.db.select().from(organisations).where(eq(organisations.id, agencyB)).get()!;
    const res = await adminB.patch('/api/agency/profile').send({ name: own.name.toUpperCase() });
    expect(res.status).toBe(200);
    const renamed = await adminB.patch('/api/agency/profile').send({ name: 'Prairie Line Kitchen Service' });
    expect(renamed.status).toBe(200);
    const row = t.db.select().from(organisations).where(eq(organisations.id, agencyB)).get()!;
    expect(row.nameKey).toBe('prairielinekitchenservice');
    await adminB.patch('/api/agency/profile').send({ name: own.name });
  });

  it('the manufacturer admin cannot create or rename an agency to a taken or the manufacturer’s name: 400 on name, nothing written', async () => {
    const other = orgName('agency', agencyB).name;
    const maker = orgName('manufacturer').name;
    const count = () => t.db.select().from(organisations).all().length;
    const before = count();
    const body = (n: string) => ({ name: n, contactEmail: null, addressLine: null, city: null, region: null, postalCode: null, timeZone: 'America/Chicago', adminEmail: 'first-admin@new-agency.test' });
    for (const n of [other.toLowerCase(), ` ${maker.toUpperCase()} `, 'New\nAgency', `New ${RLO}Agency`]) {
      const res = await mfr.post('/api/admin/agencies').send(body(n));
      expect(res.status, JSON.stringify(n)).toBe(400);
      expect(res.body.error.fields.name).toBeTruthy();
    }
    expect(count()).toBe(before);
    for (const n of [other, maker.replace(/ /g, ''), 'B\r\nC']) {
      const res = await mfr.patch(`/api/admin/agencies/${agencyB}`).send({ name: n });
      expect(res.status, JSON.stringify(n)).toBe(400);
      expect(res.body.error.fields.name).toBeTruthy();
    }
  });
});

describe('the migration that adds name keys', () => {
  it('backfills the key of existing organisations and keeps a database with duplicate names migratable', () => {
    const dir = mkdtempSync(join(tmpdir(), 'fieldproof-names-'));
    try {
      // A database as it stood before the migration: the first four migrations only.
      const old = join(dir, 'old-migrations');
      mkdirSync(join(old, 'meta'), { recursive: true });
      const journal = JSON.parse(readFileSync('drizzle/meta/_journal.json', 'utf8')) as { entries: { tag: string }[] };
      const before = journal.entries.filter((e) => e.tag < '0004');
      for (const e of before) cpSync(`drizzle/${e.tag}.sql`, join(old, `${e.tag}.sql`));
      writeFileSync(join(old, 'meta/_journal.json'), JSON.stringify({ ...journal, entries: before }));
      const path = join(dir, 'db.sqlite');
      const raw = new Database(path);
      raw.pragma('foreign_keys = OFF');
      migrate(drizzle(raw), { migrationsFolder: old });
      const ins = raw.prepare("insert into organisations (id, kind, name, country, time_zone, currency, active, created_at, updated_at) values (?, ?, ?, 'US', 'America/Chicago', 'USD', 1, 'x', 'x')");
      ins.run('m1', 'manufacturer', 'Maker Works');
      ins.run('a1', 'agency', 'Delta Grill Care');
      ins.run('a2', 'agency', 'DELTA  grill care');
      raw.close();

      const db = openDatabase(path);
      const rows = db.$client.prepare('select id, name_key as k from organisations order by id').all() as { id: string; k: string }[];
      expect(rows).toEqual([
        { id: 'a1', k: 'deltagrillcare' },
        { id: 'a2', k: 'deltagrillcare#a2' },
        { id: 'm1', k: 'makerworks' },
      ]);
      expect(() => db.$client.prepare("update organisations set name_key = 'deltagrillcare' where id = 'a2'").run()).toThrow(/UNIQUE/);
      db.$client.close();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
