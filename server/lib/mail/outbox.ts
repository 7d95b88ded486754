import { and, asc, eq, lte, inArray } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { outbox } from '../../db/schema/index';
import { newId } from '../ids';
import type { Clock } from '../clock';
import type { Mailer, OutgoingMail } from './mailer';

/** Writes a mail into the outbox; call inside the transaction of the change that causes it. */
export function enqueueMail(t: Db, clock: Clock, mail: OutgoingMail): string {
  const id = newId();
  const now = clock.now().toISOString();
  const to = [...new Set(mail.to.map((a) => a.toLowerCase()))];
  if (to.length === 0) return id;
  t.insert(outbox)
    .values({ id, to, subject: mail.subject, text: mail.text, html: mail.html ?? null, attachments: mail.attachments ?? null, status: 'pending', attempts: 0, nextAttemptAt: now, createdAt: now })
    .run();
  return id;
}

const backoffSeconds = (attempt: number) => Math.min(300, 2 ** attempt);
const MAX_ATTEMPTS = 25;

/**
 * Sends pending mail after commit. A row is claimed (pending -> sending) in its own UPDATE
 * before sending, so two dispatchers never send one mail twice; a failure schedules a retry.
 */
export class OutboxDispatcher {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<number> | null = null;
  private again = false;
  private stopped = false;

  constructor(
    private readonly db: Db,
    private readonly mailer: Mailer,
    private readonly clock: Clock,
  ) {
    // Rows left in "sending" by a crash go back to pending: at-least-once after a crash only.
    this.db.update(outbox).set({ status: 'pending' }).where(eq(outbox.status, 'sending')).run();
  }

  /** Ask for a send soon (after a commit). */
  kick(): void {
    if (this.running) {
      this.again = true;
      return;
    }
    if (this.stopped) return;
    // A failed pass (e.g. the database closing) is retried by the next kick or tick, never unhandled.
    this.running = this.sendDue()
      .catch(() => 0)
      .finally(() => {
        this.running = null;
        if (this.again) {
          this.again = false;
          this.kick();
        }
      });
  }

  start(intervalMs = 2000): void {
    if (this.timer) return;
    this.timer = setInterval(() => this.kick(), intervalMs);
    this.timer.unref();
  }

  async stop(): Promise<void> {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    this.stopped = true;
    this.again = false;
    while (this.running) await this.running;
  }

  /**
   * Sends every due mail once; returns how many were sent. Waits first for a send already under
   * way (a kick after a commit), so the caller also sees the mail that send picked up.
   */
  async flush(): Promise<number> {
    while (this.running) await this.running;
    return this.sendDue();
  }

  private async sendDue(): Promise<number> {
    let sent = 0;
    const now = this.clock.now().toISOString();
    const due = this.db
      .select()
      .from(outbox)
      .where(and(inArray(outbox.status, ['pending']), lte(outbox.nextAttemptAt, now)))
      .orderBy(asc(outbox.createdAt))
      .limit(50)
      .all();
    for (const row of due) {
      const claimed = this.db
        .update(outbox)
        .set({ status: 'sending' })
        .where(and(eq(outbox.id, row.id), eq(outbox.status, 'pending')))
        .run();
      if (claimed.changes !== 1) continue;
      try {
        await this.mailer.send({ to: row.to, subject: row.subject, text: row.text, html: row.html, attachments: row.attachments });
        this.db.update(outbox).set({ status: 'sent', sentAt: this.clock.now().toISOString(), attempts: row.attempts + 1, lastError: null }).where(eq(outbox.id, row.id)).run();
        sent++;
      } catch (e) {
        const attempts = row.attempts + 1;
        const next = new Date(this.clock.now().getTime() + backoffSeconds(attempts) * 1000).toISOString();
        this.db
          .update(outbox)
          .set({ status: attempts >= MAX_ATTEMPTS ? 'failed' : 'pending', attempts, nextAttemptAt: next, lastError: String((e as Error).message ?? e).slice(0, 500) })
          .where(eq(outbox.id, row.id))
          .run();
      }
    }
    return sent;
  }
}
