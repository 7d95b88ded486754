import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, demoAccounts, TestClock, type TestApp } from '../factories/test-app';
import { totpCodeFor } from '../factories/second-factor';
import { makeFixtures, makeTableApp, ORIGIN, type Fixtures } from './authz-routes';

// The security audit trail (OWASP ASVS 5.0 16.2.1 each entry says when, who, where, what and the
// outcome; 16.2.2 UTC timestamps; 16.2.5 no credentials or tokens logged; 16.3.1-16.3.3
// authentication events and failed authorization are logged; 16.4.2 logs cannot be modified or
// deleted): each sign-in, each failure, a denial, a transition, an upload, a download and a role
// change each leave exactly one row.

const NOW = '2026-06-15T12:00:00.000Z';
const UTC = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/;

interface AuditRow {
  rowid: number;
  id: string;
  at: string;
  actor_id: string | null;
  organisation_id: string | null;
  action: string;
  record_type: string | null;
  record_id: string | null;
  outcome: string;
  ip: string | null;
  detail: string | null;
}

describe('audit trail', () => {
  let t: TestApp;
  let f: Fixtures;
  const clock = new TestClock(new Date(NOW));
  /** Secrets that passed through the app during the test; none may reach an audit row. */
  const secrets: string[] = [DEMO_PASSWORD];

  const mark = () => (t.db.$client.prepare('select coalesce(max(rowid), 0) as m from audit_log').get() as { m: number }).m;
  const since = (m: number) => t.db.$client.prepare('select rowid, * from audit_log where rowid > ? order by rowid').all(m) as AuditRow[];

  /** Runs the request and returns the one audit row it left (failing when it left none or several). */
  async function oneRowOf(what: string, act: () => Promise<{ status: number }>, status: number): Promise<AuditRow> {
    const m = mark();
    const res = await act();
    expect(res.status, what).toBe(status);
    const rows = since(m);
    expect(
      rows.map((r) => `${r.action} ${r.outcome}`),
      `${what}: exactly one audit row`,
    ).toHaveLength(1);
    const row = rows[0];
    expect(row.at, what).toMatch(UTC);
    expect(row.at, what).toBe(clock.now().toISOString());
    expect(row.ip, `${what}: where from`).toBeTruthy();
    return row;
  }

  beforeAll(async () => {
    t = await makeTableApp(clock);
    f = await makeFixtures(t);
  }, 60_000);
  afterAll(async () => {
    await f?.close();
    await t.close();
  });

  it('a successful sign-in: one row with the account as actor and record, its organisation, success', async () => {
    clock.advance(1_000);
    const agent = await f.freshAgent('anonymous');
    const row = await oneRowOf('sign-in', () => agent.post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: demoAccounts.techA, password: DEMO_PASSWORD }), 200);
    expect(row).toMatchObject({ action: 'auth.sign_in', outcome: 'success', actor_id: f.user.techA, organisation_id: f.org.A, record_type: 'User', record_id: f.user.techA });
    const cookie = (await agent.get('/api/auth/me')).status;
    expect(cookie).toBe(200);
  });

  it('a failed sign-in with a wrong password: one row, failure, naming the account it was aimed at', async () => {
    clock.advance(1_000);
    const agent = await f.freshAgent('anonymous');
    const wrong = 'not-the-password-at-all-123';
    secrets.push(wrong);
    const row = await oneRowOf('wrong password', () => agent.post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: demoAccounts.adminA, password: wrong }), 401);
    expect(row).toMatchObject({ action: 'auth.sign_in', outcome: 'failure', actor_id: f.user.adminA, organisation_id: f.org.A, record_type: 'User', record_id: f.user.adminA });
  });

  it('a failed sign-in for an unknown e-mail: one row, failure, without the address itself', async () => {
    clock.advance(1_000);
    const agent = await f.freshAgent('anonymous');
    const email = 'someone.unknown@elsewhere.test';
    const row = await oneRowOf('unknown e-mail', () => agent.post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email, password: 'whatever-they-typed' }), 401);
    expect(row).toMatchObject({ action: 'auth.sign_in', outcome: 'failure', actor_id: null, record_id: null });
    expect(JSON.stringify(row)).not.toContain(email);
    secrets.push('whatever-they-typed');
  });

  it('a sign-out: one row', async () => {
    clock.advance(1_000);
    const agent = await f.freshAgent('techB');
    const row = await oneRowOf('sign-out', () => agent.post('/api/auth/sign-out').set('Origin', ORIGIN), 204);
    expect(row).toMatchObject({ action: 'auth.sign_out', outcome: 'success', actor_id: f.user.techB, organisation_id: f.org.B });
  });

  it('a denied write (403): one row, denied, with the actor, their organisation and the record aimed at', async () => {
    clock.advance(1_000);
    const reviewer = await f.agent('reviewer');
    const id = f.claimA.submitted;
    const row = await oneRowOf('reviewer edits a claim', () => reviewer.patch(`/api/claims/${id}`).set('Origin', ORIGIN).send({ version: f.version(id), complaint: 'Rewritten by the reviewer.' }), 403);
    expect(row).toMatchObject({ action: 'claim.update', outcome: 'denied', actor_id: f.user.reviewer, organisation_id: f.org.M, record_type: 'claim', record_id: id });
  });

  it('a denied write on a record of another agency (404): one row, denied, with the id that was tried', async () => {
    clock.advance(1_000);
    const techB = await f.agent('techB');
    const id = f.claimA.draft;
    const row = await oneRowOf('agency B submits a claim of agency A', () => techB.post(`/api/claims/${id}/transitions`).set('Origin', ORIGIN).send({ type: 'submit', version: f.version(id) }), 404);
    expect(row).toMatchObject({ action: 'claim.submit', outcome: 'denied', actor_id: f.user.techB, organisation_id: f.org.B, record_type: 'claim', record_id: id });
    const upload = await oneRowOf('agency B uploads to a claim of agency A', async () =>
      techB
        .post(`/api/claims/${id}/attachments`)
        .set('Origin', ORIGIN)
        .attach('files', await f.fresh.png(), { filename: 'x.png', contentType: 'image/png' }),
      404,
    );
    expect(upload).toMatchObject({ action: 'attachment.upload', outcome: 'denied', actor_id: f.user.techB, organisation_id: f.org.B, record_id: id });
  });

  it('a transition: one row with from and to', async () => {
    const draft = await f.fresh.draft();
    clock.advance(1_000);
    const techA = await f.agent('techA');
    const row = await oneRowOf('submit', () => techA.post(`/api/claims/${draft.id}/transitions`).set('Origin', ORIGIN).send({ type: 'submit', version: draft.version }), 200);
    expect(row).toMatchObject({ action: 'claim.submit', outcome: 'success', actor_id: f.user.techA, organisation_id: f.org.A, record_type: 'claim', record_id: draft.id });
    expect(JSON.parse(row.detail!)).toMatchObject({ from: 'draft', to: 'submitted' });
  });

  let uploaded = '';
  it('an upload: one row for the one file', async () => {
    const draft = await f.fresh.draft();
    const png = await f.fresh.png();
    clock.advance(1_000);
    const techA = await f.agent('techA');
    let body: { attachments: Array<{ id: string }> } = { attachments: [] };
    const row = await oneRowOf(
      'upload',
      async () => {
        const res = await techA.post(`/api/claims/${draft.id}/attachments`).set('Origin', ORIGIN).field('role', 'failed_part').attach('files', png, { filename: 'part.png', contentType: 'image/png' });
        body = res.body;
        return res;
      },
      201,
    );
    uploaded = body.attachments[0].id;
    expect(row).toMatchObject({ action: 'attachment.upload', outcome: 'success', actor_id: f.user.techA, organisation_id: f.org.A, record_type: 'attachment', record_id: uploaded });
    expect(JSON.parse(row.detail!)).toMatchObject({ claimId: draft.id, role: 'failed_part' });
  });

  it('a download: one row naming the attachment', async () => {
    clock.advance(1_000);
    const adminA = await f.agent('adminA');
    const row = await oneRowOf('download', () => adminA.get(`/api/attachments/${uploaded}`), 200);
    expect(row).toMatchObject({ action: 'attachment.download', outcome: 'success', actor_id: f.user.adminA, organisation_id: f.org.A, record_type: 'attachment', record_id: uploaded });
  });

  it('a role change: one row with the old and new role', async () => {
    const person = f.fresh.user('A', 'technician');
    clock.advance(1_000);
    const adminA = await f.agent('adminA');
    const row = await oneRowOf('role change', () => adminA.patch(`/api/agency/users/${person.id}`).set('Origin', ORIGIN).send({ role: 'agency_admin' }), 200);
    expect(row).toMatchObject({ action: 'user.change_role', outcome: 'success', actor_id: f.user.adminA, organisation_id: f.org.A, record_type: 'User', record_id: person.id });
    expect(JSON.parse(row.detail!)).toMatchObject({ role: { from: 'technician', to: 'agency_admin' } });
  });

  it('a password reset and an invitation accepted: rows without the tokens or the new passwords', async () => {
    const anon = await f.freshAgent('anonymous');
    const reset = f.fresh.passwordReset();
    const newPassword = 'a brand new passphrase nobody guesses';
    secrets.push(reset.token, newPassword);
    clock.advance(1_000);
    const r1 = await oneRowOf('reset', () => anon.post('/api/auth/password-reset/confirm').set('Origin', ORIGIN).send({ token: reset.token, password: newPassword }), 204);
    expect(r1).toMatchObject({ action: 'auth.password_reset', outcome: 'success' });
    const inv = f.fresh.invitation('A', 'technician');
    const invitee = 'the invitee chose this long passphrase';
    secrets.push(inv.token, invitee);
    clock.advance(1_000);
    const r2 = await oneRowOf('accept', () => anon.post('/api/invitations/accept').set('Origin', ORIGIN).send({ token: inv.token, name: 'New Person', password: invitee }), 201);
    expect(r2).toMatchObject({ action: 'invitation.accept', outcome: 'success', organisation_id: f.org.A, record_id: inv.id });
  });

  it('no row holds a password, a token, a session cookie or a hash', async () => {
    // Sessions issued during the test: their cookie values must not be logged either.
    const anon = await f.freshAgent('anonymous');
    const signIn = await anon.post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: demoAccounts.accountant, password: DEMO_PASSWORD });
    const cookieValue = (res: { headers: Record<string, unknown> }, name: string) =>
      String(([] as string[]).concat((res.headers['set-cookie'] as string[]) ?? []).find((c) => c.startsWith(`${name}=`) && !c.startsWith(`${name}=;`)) ?? '').split(';')[0].split('=')[1] ?? '';
    const pending = cookieValue(signIn, 'fp_pending');
    const code = totpCodeFor(t.db.$client, demoAccounts.accountant, t.deps.clock.now().getTime());
    const done = await anon.post('/api/auth/second-factor/totp').set('Origin', ORIGIN).send({ code });
    const session = cookieValue(done, 'fp_session');
    expect(pending.length).toBeGreaterThan(20);
    expect(session.length).toBeGreaterThan(20);
    secrets.push(session, pending, ...(t.db.$client.prepare('select secret from totp_credentials').pluck().all() as string[]));
    const db = t.db.$client;
    const hashes = [
      ...(db.prepare('select password_hash as h from users where password_hash is not null').all() as Array<{ h: string }>).map((r) => r.h),
      ...(db.prepare('select token_hash as h from password_resets').all() as Array<{ h: string }>).map((r) => r.h),
      ...(db.prepare('select token_hash as h from invitations').all() as Array<{ h: string }>).map((r) => r.h),
      ...(db.prepare('select code_hash as h from recovery_codes').all() as Array<{ h: string }>).map((r) => r.h),
    ];
    expect(hashes.length).toBeGreaterThan(10);
    const rows = db.prepare('select * from audit_log').all() as AuditRow[];
    expect(rows.length).toBeGreaterThan(20);
    const leaks: string[] = [];
    for (const row of rows) {
      const text = JSON.stringify(row);
      for (const s of [...secrets, ...hashes]) if (text.includes(s)) leaks.push(`${row.action}: holds ${s.slice(0, 12)}…`);
      if (/\$2[aby]\$\d\d\$/.test(text)) leaks.push(`${row.action}: a bcrypt hash`);
      if (/eyJ[\w-]{8,}\.[\w-]{8,}\./.test(text)) leaks.push(`${row.action}: a JWT`);
      // No detail field may carry a password, token, secret, hash or cookie (a reason code such
      // as "wrong_password" names what happened and holds nothing secret).
      const keys: string[] = [];
      const walk = (v: unknown) => {
        if (!v || typeof v !== 'object') return;
        for (const [k, x] of Object.entries(v)) {
          keys.push(k);
          walk(x);
        }
      };
      walk(row.detail ? JSON.parse(row.detail) : null);
      for (const k of keys) if (/pass|pwd|token|secret|hash|cookie|session|jwt/i.test(k)) leaks.push(`${row.action}: a detail field "${k}"`);
    }
    expect(leaks).toEqual([]);
    for (const row of rows) expect(row.at).toMatch(UTC);
  });

  it('the database refuses to change or delete audit rows and claim events', () => {
    const db = t.db.$client;
    const count = (table: string) => (db.prepare(`select count(*) as n from ${table}`).get() as { n: number }).n;
    const audits = count('audit_log');
    const events = count('claim_events');
    expect(audits).toBeGreaterThan(0);
    expect(events).toBeGreaterThan(0);
    const anAudit = db.prepare('select id from audit_log limit 1').get() as { id: string };
    const anEvent = db.prepare('select id from claim_events limit 1').get() as { id: string };
    for (const sql of [
      "update audit_log set outcome = 'success' where outcome != 'success'",
      'update audit_log set actor_id = null',
      'delete from audit_log',
      `delete from audit_log where id = '${anAudit.id}'`,
      "update claim_events set comment = 'rewritten'",
      'update claim_events set to_state = from_state',
      'delete from claim_events',
      `delete from claim_events where id = '${anEvent.id}'`,
      `insert or replace into audit_log (id, at, action, outcome) values ('${anAudit.id}', '${NOW}', 'forged', 'success')`,
      `insert or replace into claim_events (id, claim_id, type, to_state, at) select '${anEvent.id}', claim_id, 'forged', 'paid', '${NOW}' from claim_events where id = '${anEvent.id}'`,
    ]) {
      expect(() => db.prepare(sql).run(), sql).toThrow();
    }
    expect(count('audit_log')).toBe(audits);
    expect(count('claim_events')).toBe(events);
    expect((db.prepare("select count(*) as n from audit_log where action = 'forged'").get() as { n: number }).n).toBe(0);
  });
});
