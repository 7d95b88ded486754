import { createHmac } from 'node:crypto';
import { and, eq, isNull, ne, sql } from 'drizzle-orm';
import { tx } from '../../db/client';
import { passwordResets, users } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import { writeAudit } from '../../lib/audit';
import { auditSignIn } from './sign-in-audit';
import { AppError, TooManyRequestsError, ValidationError } from '../../lib/errors';
import { hashToken, newId, newToken } from '../../lib/ids';
import { enqueueMail } from '../../lib/mail/outbox';
import { checkPassword } from '../../lib/password-policy';
import { dummyPasswordHash, hashPassword, verifyPassword } from '../../lib/passwords';
import { AttemptLimiter, type LimitTier } from '../../middleware/rate-limit';
import { createSignInThrottle, defaultSignInLimits, type DeviceCookie, type SignInLimits } from './sign-in-throttle';
import { defineAbilityFor, type AppAbility, type SessionUser } from '@shared/permissions/ability';
import type { MeResponse } from '@shared/schemas/user';
import type { SecondFactorChallenge } from '@shared/schemas/second-factor';
import type { SecondFactorService } from '../second-factor/second-factor.service';
import { findAccountByEmail, findAccountById, findResetByTokenHash, type AccountRow } from './auth.queries';

const MINUTE = 60_000;

/** Per-app limits (NIST SP 800-63B-4 §3.2.2 rate limiting); tests and deployments may override. */
export interface AuthLimits extends SignInLimits {
  /** Reset requests per client address (all count). */
  resetRequestsPerAddress: LimitTier[];
  /** Reset mails per account; over it the request still answers 202 but sends nothing. */
  resetMailsPerAccount: LimitTier[];
  /** Failed reset confirmations per client address. */
  resetConfirmPerAddress: LimitTier[];
}

export const defaultAuthLimits: AuthLimits = {
  ...defaultSignInLimits,
  resetRequestsPerAddress: [{ limit: 20, windowMs: 15 * MINUTE }],
  resetMailsPerAccount: [{ limit: 3, windowMs: 15 * MINUTE }],
  resetConfirmPerAddress: [{ limit: 50, windowMs: 15 * MINUTE }],
};

export const RESET_TTL_MS = 30 * MINUTE;

export const INVALID_CREDENTIALS_MESSAGE = 'That e-mail address and password do not match an active account.';
export { THROTTLED_MESSAGE } from './sign-in-throttle';
export const RESET_REQUESTED_MESSAGE =
  'If an active account uses that e-mail address, a link to set a new password is on its way. The link works once, within 30 minutes.';

export class InvalidCredentialsError extends AppError {
  constructor() {
    super(401, 'invalid_credentials', INVALID_CREDENTIALS_MESSAGE);
  }
}
export class InvalidResetTokenError extends AppError {
  constructor(message: string) {
    super(400, 'invalid_reset_token', message);
  }
}

/** `device`: the device cookie that makes this browser a trusted device for the account (set once the password is right). */
export type SignInResult =
  | { kind: 'session'; token: string; me: MeResponse; device: DeviceCookie }
  /** The password was right; `pending` is the short-lived second-factor token, not a session. */
  | { kind: 'pending'; pending: string; challenge: SecondFactorChallenge; device: DeviceCookie };

export type AuthService = ReturnType<typeof createAuthService>;

/** Sign-in, sign-out, "me" and password reset. Limiters live in this instance (one per app). */
export function createAuthService(deps: AppDeps, limits: Partial<AuthLimits> = {}, secondFactor?: SecondFactorService) {
  const l: AuthLimits = { ...defaultAuthLimits, ...limits };
  const { db, clock, env } = deps;
  const throttle = createSignInThrottle(deps, l);
  const limiters = {
    resetRequests: new AttemptLimiter(deps.rates, 'reset.request.address', l.resetRequestsPerAddress),
    resetMails: new AttemptLimiter(deps.rates, 'reset.mail.account', l.resetMailsPerAccount),
    resetConfirm: new AttemptLimiter(deps.rates, 'reset.confirm.address', l.resetConfirmPerAddress),
  };
  // Computed now, so the first unknown-account attempt is not slower than the rest.
  dummyPasswordHash(env.PASSWORD_PEPPER, env.BCRYPT_COST);
  const nowSeconds = () => Math.floor(clock.now().getTime() / 1000);
  /** The e-mail as it may appear in the audit log: keyed hash, never the address of an unknown account. */
  const emailDigest = (email: string) => createHmac('sha256', env.PASSWORD_PEPPER).update(`audit-email:${email}`).digest('hex').slice(0, 32);

  function meOf(a: { id: string; email: string; name: string; role: SessionUser['role']; organisationId: string; organisationName: string; organisationKind: 'manufacturer' | 'agency'; organisationTimeZone: string }, ability: AppAbility): MeResponse {
    return {
      user: { id: a.id, email: a.email, name: a.name, role: a.role, organisationId: a.organisationId },
      organisation: { id: a.organisationId, name: a.organisationName, kind: a.organisationKind, timeZone: a.organisationTimeZone },
      rules: ability.rules,
    };
  }

  const service = {
    limiters,

    /**
     * Same 401 for an unknown e-mail, a wrong password and a deactivated account; an unknown
     * account is compared against a dummy hash of the same cost so the timing matches. The
     * throttle admits each attempt before the password is compared (device cookies: see
     * sign-in-throttle.ts), so parallel guesses cannot pass the limit.
     */
    async signIn(input: { email: string; password: string }, ip: string, cookies?: Record<string, unknown>): Promise<SignInResult> {
      const email = input.email;
      const account = findAccountByEmail(db, email);
      const admission = await throttle.admit({ email, account: account ?? null, cookies, ip, emailDigest: emailDigest(email) });

      const hash = account?.passwordHash ?? dummyPasswordHash(env.PASSWORD_PEPPER, env.BCRYPT_COST);
      const matches = await verifyPassword(input.password, hash, env.PASSWORD_PEPPER);
      const usable = !!account && !!account.passwordHash && account.active && account.organisationActive;

      throttle.settle(admission, matches && usable);
      if (!matches || !usable) {
        const reason = !account ? 'unknown_account' : !account.passwordHash ? 'no_password' : !matches ? 'wrong_password' : 'inactive';
        auditSignIn(db, clock, account, 'failure', ip, { reason, ...(account ? {} : { emailDigest: emailDigest(email) }) }, 'keep');
        throw new InvalidCredentialsError();
      }

      const a = account as AccountRow;
      // A right password alone is not a session when a second factor is enrolled or required.
      const next = secondFactor ? secondFactor.nextStep(a) : ({ step: 'session' } as const);
      if (next.step !== 'session') {
        auditSignIn(db, clock, a, 'success', ip, { secondFactor: next.step });
        const pending = await deps.tokens.issuePending({ sub: a.id, sv: a.sessionVersion, pu: next.step }, nowSeconds());
        return { kind: 'pending', pending, challenge: { secondFactor: { purpose: next.step, methods: next.methods } }, device: await throttle.deviceCookie(a.id) };
      }
      return { kind: 'session', ...(await service.startSession(a.id, ip, null)), device: await throttle.deviceCookie(a.id) };
    },

    /**
     * Issues a session for a user who has proved who they are (password, and the second factor
     * where one is needed). `factor` names the second factor used, for the audit row.
     */
    async startSession(userId: string, ip: string, factor: string | null): Promise<{ token: string; me: MeResponse }> {
      const a = findAccountById(db, userId);
      const sv = db.select({ sv: users.sessionVersion }).from(users).where(eq(users.id, userId)).get()?.sv;
      if (!a || sv === undefined || !a.active || !a.organisationActive) throw new InvalidCredentialsError();
      const now = clock.now().toISOString();
      tx(db, (t) => {
        t.update(users).set({ lastSignInAt: now }).where(eq(users.id, a.id)).run();
        auditSignIn(t, clock, a, 'success', ip, factor ? { secondFactor: factor } : undefined);
      });
      const token = await deps.tokens.issue(a.id, sv, nowSeconds(), nowSeconds(), a.role);
      const ability = defineAbilityFor({ id: a.id, email: a.email, name: a.name, role: a.role, organisationId: a.organisationId, organisationKind: a.organisationKind });
      return { token, me: meOf(a, ability) };
    },

    auditStepUp(user: SessionUser, ip: string, method: string, ok: boolean): void {
      writeAudit(db, clock, { actorId: user.id, organisationId: user.organisationId, action: 'auth.step_up', recordType: 'User', recordId: user.id, outcome: ok ? 'success' : 'failure', ip, detail: { method } });
    },

    /** Step-up with the password: same hashing and timing as sign-in, counted against the account's code guesses. */
    async checkPassword(userId: string, password: string): Promise<boolean> {
      const row = db.select({ hash: users.passwordHash }).from(users).where(eq(users.id, userId)).get();
      return verifyPassword(password, row?.hash ?? dummyPasswordHash(env.PASSWORD_PEPPER, env.BCRYPT_COST), env.PASSWORD_PEPPER).then((ok) => ok && !!row?.hash);
    },

    /** Ends every session of the user at once (the session version moves on). */
    signOut(user: SessionUser, ip: string): void {
      tx(db, (t) => {
        t.update(users)
          .set({ sessionVersion: sql`${users.sessionVersion} + 1`, updatedAt: clock.now().toISOString() })
          .where(eq(users.id, user.id))
          .run();
        writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action: 'auth.sign_out', recordType: 'User', recordId: user.id, outcome: 'success', ip });
      });
    },

    me(user: SessionUser, ability: AppAbility): MeResponse | null {
      const a = findAccountById(db, user.id);
      if (!a) return null;
      return meOf(a, ability);
    },

    /**
     * Always the same answer. For an active account, a one-time token (only its SHA-256 is
     * stored) with a 30-minute expiry is mailed through the outbox in the same transaction.
     */
    requestReset(email: string, ip: string): { sendAfterCommit: boolean } {
      const r = limiters.resetRequests.take(ip);
      if (!r.ok) throw new TooManyRequestsError(r.retryAfterSeconds, 'Too many reset requests from this address. Try again later.');
      const account = findAccountByEmail(db, email);
      const eligible = !!account && account.active && account.organisationActive;
      if (!eligible) {
        writeAudit(db, clock, {
          actorId: account?.id ?? null,
          organisationId: account?.organisationId ?? null,
          action: 'auth.password_reset_request',
          recordType: 'User',
          recordId: account?.id ?? null,
          outcome: 'failure',
          ip,
          detail: { reason: account ? 'inactive' : 'unknown_account', ...(account ? {} : { emailDigest: emailDigest(email) }) },
        });
        return { sendAfterCommit: false };
      }
      const a = account as AccountRow;
      if (!limiters.resetMails.take(email).ok) {
        writeAudit(db, clock, { actorId: a.id, organisationId: a.organisationId, action: 'auth.password_reset_request', recordType: 'User', recordId: a.id, outcome: 'denied', ip, detail: { reason: 'throttled_account' } });
        return { sendAfterCommit: false };
      }
      const { token, hash } = newToken();
      const now = clock.now();
      const expiresAt = new Date(now.getTime() + RESET_TTL_MS).toISOString();
      const link = `${env.PUBLIC_URL.replace(/\/+$/, '')}/reset-password?token=${encodeURIComponent(token)}`;
      tx(db, (t) => {
        const id = newId();
        t.insert(passwordResets).values({ id, userId: a.id, tokenHash: hash, expiresAt, createdAt: now.toISOString() }).run();
        enqueueMail(t, clock, {
          to: [a.email],
          subject: 'Set a new Fieldproof password',
          text: [
            `Hello ${a.name},`,
            '',
            'Someone (we hope you) asked to set a new password for your Fieldproof account.',
            'Open this link within 30 minutes to choose one. It works once:',
            '',
            link,
            '',
            'If you did not ask, ignore this message: your password stays as it is.',
          ].join('\n'),
        });
        writeAudit(t, clock, { actorId: a.id, organisationId: a.organisationId, action: 'auth.password_reset_request', recordType: 'PasswordReset', recordId: id, outcome: 'success', ip });
      });
      return { sendAfterCommit: true };
    },

    /**
     * Sets the new password from a valid, unused, unexpired token; marks it (and every other open
     * token of the user) used and moves the session version on, so every session ends.
     */
    confirmReset(input: { token: string; password: string }, ip: string): void {
      const gate = limiters.resetConfirm.take(ip);
      if (!gate.ok) throw new TooManyRequestsError(gate.retryAfterSeconds, 'Too many attempts from this address. Try again later.');
      const row = findResetByTokenHash(db, hashToken(input.token));
      const now = clock.now();
      const account = row ? findAccountById(db, row.userId) : undefined;
      let problem: string | null = null;
      if (!row || !account) problem = 'This reset link is not valid. Ask for a new one from the sign-in page.';
      else if (row.usedAt) problem = 'This reset link has already been used. Ask for a new one if you still need it.';
      else if (row.expiresAt <= now.toISOString()) problem = 'This reset link has expired (links last 30 minutes). Ask for a new one.';
      else if (!account.active || !account.organisationActive) problem = 'This reset link is not valid. Ask for a new one from the sign-in page.';
      if (problem || !row || !account) {
        writeAudit(db, clock, {
          actorId: account?.id ?? null,
          organisationId: account?.organisationId ?? null,
          action: 'auth.password_reset',
          recordType: 'PasswordReset',
          recordId: row?.id ?? null,
          outcome: 'failure',
          ip,
          detail: { reason: !row ? 'unknown_token' : row.usedAt ? 'used' : row.expiresAt <= now.toISOString() ? 'expired' : 'inactive' },
        });
        throw new InvalidResetTokenError(problem ?? 'This reset link is not valid.');
      }
      // A link holder is not guessing: a good token gives its attempt back.
      limiters.resetConfirm.refund(ip);
      const policy = checkPassword(input.password, [account.email, account.name, account.organisationName]);
      if (policy) throw new ValidationError('Choose a different password.', { password: policy });

      const hash = hashPassword(input.password, env.PASSWORD_PEPPER, env.BCRYPT_COST);
      const stamp = now.toISOString();
      tx(db, (t) => {
        const used = t
          .update(passwordResets)
          .set({ usedAt: stamp })
          .where(and(eq(passwordResets.id, row.id), isNull(passwordResets.usedAt)))
          .run();
        if (used.changes !== 1) throw new InvalidResetTokenError('This reset link has already been used. Ask for a new one if you still need it.');
        t.update(passwordResets)
          .set({ usedAt: stamp })
          .where(and(eq(passwordResets.userId, account.id), isNull(passwordResets.usedAt), ne(passwordResets.id, row.id)))
          .run();
        t.update(users)
          .set({ passwordHash: hash, sessionVersion: sql`${users.sessionVersion} + 1`, updatedAt: stamp })
          .where(eq(users.id, account.id))
          .run();
        writeAudit(t, clock, { actorId: account.id, organisationId: account.organisationId, action: 'auth.password_reset', recordType: 'PasswordReset', recordId: row.id, outcome: 'success', ip });
      });
      // The owner proved control of the mailbox: earlier failed sign-ins no longer hold the account.
      throttle.clearAccount(account.email);
    },
  };
  return service;
}
