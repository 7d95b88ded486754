import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MailSink } from '../../server/lib/mail/sink';
import { claimIn, countRows, makeClaimsApp, move, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let techA: Agent;
let reviewer: Agent;
let sink: MailSink;

const reviewers = ['reviewer@larkfield.test', 'marisol.oyelaran@larkfield.test'];
const harborviewPeople = ['tech@harborview.test', 'admin@harborview.test'];

/** Lets every kicked send finish, then sends whatever is still due. */
async function settle(): Promise<void> {
  for (let i = 0; i < 5; i++) {
    await t.deps.outbox.stop();
    await t.deps.outbox.flush();
  }
}

/** The mail one step queued, as the sink received it. */
async function mailOf(step: () => Promise<unknown>) {
  await settle();
  const from = sink.messages.length;
  await step();
  await settle();
  return sink.messages.slice(from);
}

beforeAll(async () => {
  t = await makeClaimsApp();
  sink = t.sink;
  techA = await t.signIn('techA');
  reviewer = await t.signIn('reviewer');
});
afterAll(async () => {
  await t.close();
});

describe('mail per transition, through the outbox and the local sink', () => {
  it('submit mails every active reviewer, and nobody at the agency', async () => {
    const c = await claimIn(t, { tech: techA, reviewer }, 'draft');
    const mails = await mailOf(() => move(techA, c.id, 'submit', c.version));
    expect(mails).toHaveLength(1);
    expect(mails[0].to.sort()).toEqual([...reviewers].sort());
    const number = (await techA.get(`/api/claims/${c.id}`)).body.number;
    expect(mails[0].subject).toContain(number);
    expect(mails[0].text).toContain(`http://localhost:3000/claims/${c.id}`);
  });

  it('start review and withdraw send nothing', async () => {
    const s = await claimIn(t, { tech: techA, reviewer }, 'submitted');
    expect(await mailOf(() => move(reviewer, s.id, 'start_review', s.version))).toHaveLength(0);
    const d = await claimIn(t, { tech: techA, reviewer }, 'draft');
    expect(await mailOf(() => move(techA, d.id, 'withdraw', d.version))).toHaveLength(0);
  });

  it.each([
    ['return', { reason: 'missing_evidence', comment: 'Add the serial plate photo.' }, /returned/],
    ['deny', { reason: 'duplicate_claim', comment: 'Same visit as an earlier claim.' }, /denied/],
    ['approve', {}, /approved for \$/],
  ] as const)('%s mails the claim’s technician and the agency admins, with the reason and a link', async (type, extra, subject) => {
    const c = await claimIn(t, { tech: techA, reviewer }, 'in_review');
    const mails = await mailOf(() => move(reviewer, c.id, type, c.version, extra));
    expect(mails).toHaveLength(1);
    expect(mails[0].to.sort()).toEqual([...harborviewPeople].sort());
    expect(mails[0].subject).toMatch(subject);
    expect(mails[0].text).toContain(`http://localhost:3000/claims/${c.id}`);
    if ('comment' in extra) expect(mails[0].text).toContain(extra.comment);
    for (const other of ['tech@prairieline.test', 'admin@prairieline.test', ...reviewers]) expect(mails[0].to).not.toContain(other);
  });

  it('with the mail server down the move still succeeds and the mail waits; it goes out once a server listens again', async () => {
    const c = await claimIn(t, { tech: techA, reviewer }, 'in_review');
    await settle();
    const port = sink.port;
    await sink.close();
    const res = await move(reviewer, c.id, 'approve', c.version);
    expect(res.status).toBe(200);
    expect(res.body.state).toBe('approved');
    await settle();
    const waiting = t.db.$client.prepare("select status, attempts, last_error from outbox where subject like ? ").all(`%${res.body.number} was approved%`) as Array<{ status: string; attempts: number; last_error: string | null }>;
    expect(waiting).toHaveLength(1);
    expect(waiting[0].status).toBe('pending');
    expect(waiting[0].attempts).toBeGreaterThanOrEqual(1);
    expect(waiting[0].last_error).toBeTruthy();

    const back = new MailSink();
    await back.listen(port);
    try {
      t.clock.advance(5 * 60_000); // past the retry back-off
      await settle();
      const got = back.messages.filter((m) => m.subject.includes(`${res.body.number} was approved`));
      expect(got).toHaveLength(1);
      expect(got[0].to.sort()).toEqual([...harborviewPeople].sort());
      expect(countRows(t, 'outbox', "status = 'sent' and subject like ?", `%${res.body.number} was approved%`)).toBe(1);
    } finally {
      await back.close();
    }
  });
});
