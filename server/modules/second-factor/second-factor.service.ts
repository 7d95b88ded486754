import { createHmac, randomInt } from 'node:crypto';
import { and, count, eq, isNotNull, isNull, lt, or } from 'drizzle-orm';
import QRCode from 'qrcode';
import {
  generateAuthenticationOptions,
  generateRegistrationOptions,
  verifyAuthenticationResponse,
  verifyRegistrationResponse,
  type AuthenticationResponseJSON,
  type AuthenticatorTransport,
  type RegistrationResponseJSON,
} from '@simplewebauthn/server';
import { tx, type Db } from '../../db/client';
import { organisations, passkeys, recoveryCodes, totpCredentials } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import { writeAudit } from '../../lib/audit';
import { AppError, ConflictError, ForbiddenError, NotFoundError, TooManyRequestsError } from '../../lib/errors';
import { newId } from '../../lib/ids';
import { newTotpSecret, totpUri, verifyTotp } from '../../lib/totp';
import { AttemptLimiter } from '../../middleware/rate-limit';
import type { Role } from '@shared/permissions/ability';
import { rolesRequiringSecondFactor, type SecondFactorMethod, type SecurityStatus, type TotpSetupResponse } from '@shared/schemas/second-factor';

const MINUTE = 60_000;
export const RECOVERY_CODE_COUNT = 10;
/** Crockford-style alphabet without I, L, O, U: nothing to misread when typed from paper. */
const RECOVERY_ALPHABET = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';

/** A wrong code, recovery code, password (at step-up) or passkey answer: 400 naming the field; a session, if any, stays. */
export class InvalidSecondFactorError extends AppError {
  constructor(message = 'That code did not work. Check the time on your device and try the newest code.', field = 'code') {
    super(400, 'invalid_second_factor', message, { [field]: message });
  }
}

export interface FactorAccount {
  id: string;
  email: string;
  name: string;
  role: Role;
  organisationId: string;
}

export type SecondFactorService = ReturnType<typeof createSecondFactorService>;

/** TOTP, recovery codes and passkeys: enrolment, verification and the rule of who needs one. */
export function createSecondFactorService(deps: AppDeps) {
  const { db, clock, env } = deps;
  const publicUrl = new URL(env.PUBLIC_URL);
  const rpID = publicUrl.hostname;
  const expectedOrigin = publicUrl.origin;
  /** Wrong codes per account (all factors together), NIST SP 800-63B-4 §3.2.2: far below 100 in a row. */
  const guesses = new AttemptLimiter(deps.rates, 'second_factor.account', [
    { limit: 10, windowMs: 15 * MINUTE },
    { limit: 100, windowMs: 30 * 24 * 60 * MINUTE },
  ]);

  const recoveryHash = (userId: string, code: string) => createHmac('sha256', env.PASSWORD_PEPPER).update(`recovery:${userId}:${code}`).digest('hex');

  function newRecoveryCodes(): string[] {
    return Array.from({ length: RECOVERY_CODE_COUNT }, () => Array.from({ length: 10 }, () => RECOVERY_ALPHABET[randomInt(RECOVERY_ALPHABET.length)]).join(''));
  }
  const formatRecovery = (c: string) => `${c.slice(0, 5)}-${c.slice(5)}`;

  function confirmedTotp(t: Db, userId: string) {
    return t.select().from(totpCredentials).where(and(eq(totpCredentials.userId, userId), isNotNull(totpCredentials.confirmedAt))).get();
  }
  function passkeysOf(t: Db, userId: string) {
    return t.select().from(passkeys).where(eq(passkeys.userId, userId)).all();
  }
  function recoveryLeft(t: Db, userId: string): number {
    return t.select({ n: count() }).from(recoveryCodes).where(and(eq(recoveryCodes.userId, userId), isNull(recoveryCodes.usedAt))).get()?.n ?? 0;
  }

  /** Replaces the user's recovery codes with 10 new ones (inside the caller's transaction). */
  function writeRecoveryCodes(t: Db, userId: string): string[] {
    const codes = newRecoveryCodes();
    const now = clock.now().toISOString();
    t.delete(recoveryCodes).where(eq(recoveryCodes.userId, userId)).run();
    t.insert(recoveryCodes)
      .values(codes.map((c) => ({ id: newId(), userId, codeHash: recoveryHash(userId, c), createdAt: now })))
      .run();
    return codes.map(formatRecovery);
  }

  function takeGuess(userId: string) {
    const g = guesses.take(userId);
    if (!g.ok) throw new TooManyRequestsError(g.retryAfterSeconds, 'Too many wrong codes. Wait a while and try again.');
  }

  const service = {
    guesses,

    methods(userId: string): SecondFactorMethod[] {
      const m: SecondFactorMethod[] = [];
      if (confirmedTotp(db, userId)) m.push('totp');
      if (passkeysOf(db, userId).length > 0) m.push('passkey');
      if (m.length > 0 && recoveryLeft(db, userId) > 0) m.push('recovery');
      return m;
    },

    isRequired(account: { role: Role; organisationId: string }): boolean {
      if (rolesRequiringSecondFactor.includes(account.role)) return true;
      const org = db.select({ r: organisations.requireSecondFactor }).from(organisations).where(eq(organisations.id, account.organisationId)).get();
      return !!org?.r;
    },

    /** After a right password: a session at once, or which second-factor step comes first. */
    nextStep(account: FactorAccount): { step: 'session' } | { step: 'verify' | 'enrol'; methods: SecondFactorMethod[] } {
      const methods = service.methods(account.id);
      if (methods.length > 0) return { step: 'verify', methods };
      if (service.isRequired(account)) return { step: 'enrol', methods: ['totp'] };
      return { step: 'session' };
    },

    status(user: FactorAccount & { organisationKind: 'manufacturer' | 'agency' }): SecurityStatus {
      const org = db.select({ r: organisations.requireSecondFactor }).from(organisations).where(eq(organisations.id, user.organisationId)).get();
      return {
        totp: !!confirmedTotp(db, user.id),
        passkeys: passkeysOf(db, user.id).map((p) => ({ id: p.id, name: p.name, createdAt: p.createdAt, lastUsedAt: p.lastUsedAt })),
        recoveryCodesLeft: recoveryLeft(db, user.id),
        required: service.isRequired(user),
        organisation: { requireSecondFactor: !!org?.r, canChange: user.role === 'manufacturer_admin' || user.role === 'agency_admin' },
      };
    },

    // ------------------------------------------------------------------ TOTP

    /** A new, unconfirmed secret (replacing an unconfirmed one); refused while a confirmed one exists. */
    async startTotp(user: FactorAccount): Promise<TotpSetupResponse> {
      if (confirmedTotp(db, user.id)) throw new ConflictError('An authenticator app is already set up. Remove it first to set up another.', 'totp_exists');
      const secret = newTotpSecret();
      const now = clock.now().toISOString();
      db.insert(totpCredentials)
        .values({ userId: user.id, secret, createdAt: now })
        .onConflictDoUpdate({ target: totpCredentials.userId, set: { secret, createdAt: now, lastUsedStep: null } })
        .run();
      const otpauthUri = totpUri(secret, user.email);
      const svg = await QRCode.toString(otpauthUri, { type: 'svg', errorCorrectionLevel: 'M', margin: 1 });
      return { secret, otpauthUri, qrDataUrl: `data:image/svg+xml;base64,${Buffer.from(svg).toString('base64')}` };
    },

    /** The first right code confirms the secret; the first factor of an account comes with 10 recovery codes. */
    confirmTotp(user: FactorAccount, code: string, ip: string | null): { recoveryCodes: string[] | null } {
      takeGuess(user.id);
      const row = db.select().from(totpCredentials).where(eq(totpCredentials.userId, user.id)).get();
      if (!row || row.confirmedAt) throw new ConflictError('Start setting up the authenticator app again.', 'totp_not_pending');
      const step = verifyTotp(row.secret, code, clock.now().getTime(), row.lastUsedStep);
      if (step === null) throw new InvalidSecondFactorError();
      guesses.refund(user.id);
      const now = clock.now().toISOString();
      return tx(db, (t) => {
        t.update(totpCredentials).set({ confirmedAt: now, lastUsedStep: step }).where(eq(totpCredentials.userId, user.id)).run();
        const codes = recoveryLeft(t, user.id) === 0 ? writeRecoveryCodes(t, user.id) : null;
        writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action: 'auth.second_factor_enrol', recordType: 'User', recordId: user.id, outcome: 'success', ip, detail: { method: 'totp' } });
        return { recoveryCodes: codes };
      });
    },

    /** Checks a code of the enrolled authenticator; the accepted step is recorded so the code works once. */
    checkTotp(user: FactorAccount, code: string, ip: string | null, action = 'auth.second_factor'): void {
      takeGuess(user.id);
      const row = confirmedTotp(db, user.id);
      const step = row ? verifyTotp(row.secret, code, clock.now().getTime(), row.lastUsedStep) : null;
      const ok =
        row &&
        step !== null &&
        db
          .update(totpCredentials)
          .set({ lastUsedStep: step })
          .where(and(eq(totpCredentials.userId, user.id), or(isNull(totpCredentials.lastUsedStep), lt(totpCredentials.lastUsedStep, step))))
          .run().changes === 1;
      writeAudit(db, clock, { actorId: user.id, organisationId: user.organisationId, action, recordType: 'User', recordId: user.id, outcome: ok ? 'success' : 'failure', ip, detail: { method: 'totp' } });
      if (!ok) throw new InvalidSecondFactorError();
      guesses.reset(user.id);
    },

    removeTotp(user: FactorAccount, ip: string | null): void {
      if (!confirmedTotp(db, user.id)) throw new NotFoundError('No authenticator app is set up.');
      if (service.isRequired(user) && passkeysOf(db, user.id).length === 0) {
        throw new ConflictError('Your account needs a second factor: add a passkey before removing the authenticator app.', 'second_factor_required');
      }
      tx(db, (t) => {
        t.delete(totpCredentials).where(eq(totpCredentials.userId, user.id)).run();
        if (passkeysOf(t, user.id).length === 0) t.delete(recoveryCodes).where(eq(recoveryCodes.userId, user.id)).run();
        writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action: 'auth.second_factor_remove', recordType: 'User', recordId: user.id, outcome: 'success', ip, detail: { method: 'totp' } });
      });
    },

    // ------------------------------------------------------------------ recovery codes

    useRecoveryCode(user: FactorAccount, code: string, ip: string | null): void {
      takeGuess(user.id);
      const hash = recoveryHash(user.id, code);
      const now = clock.now().toISOString();
      const ok = tx(db, (t) => {
        const used = t
          .update(recoveryCodes)
          .set({ usedAt: now })
          .where(and(eq(recoveryCodes.userId, user.id), eq(recoveryCodes.codeHash, hash), isNull(recoveryCodes.usedAt)))
          .run().changes === 1;
        writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action: 'auth.second_factor', recordType: 'User', recordId: user.id, outcome: used ? 'success' : 'failure', ip, detail: { method: 'recovery', ...(used ? { left: recoveryLeft(t, user.id) } : {}) } });
        return used;
      });
      if (!ok) throw new InvalidSecondFactorError('That recovery code is not valid or was already used.');
      guesses.reset(user.id);
    },

    regenerateRecoveryCodes(user: FactorAccount, ip: string | null): string[] {
      if (service.methods(user.id).filter((m) => m !== 'recovery').length === 0) throw new ConflictError('Set up an authenticator app or a passkey first.', 'no_second_factor');
      return tx(db, (t) => {
        const codes = writeRecoveryCodes(t, user.id);
        writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action: 'auth.recovery_codes', recordType: 'User', recordId: user.id, outcome: 'success', ip });
        return codes;
      });
    },

    // ------------------------------------------------------------------ passkeys (WebAuthn)

    async passkeyRegistrationOptions(user: FactorAccount) {
      const existing = passkeysOf(db, user.id);
      return generateRegistrationOptions({
        rpName: 'Fieldproof',
        rpID,
        userName: user.email,
        userDisplayName: user.name,
        userID: new TextEncoder().encode(user.id),
        attestationType: 'none',
        excludeCredentials: existing.map((p) => ({ id: p.id, transports: transportsOf(p.transports) })),
        authenticatorSelection: { residentKey: 'preferred', userVerification: 'preferred' },
      });
    },

    async registerPasskey(user: FactorAccount, response: unknown, challenge: string, name: string | undefined, ip: string | null): Promise<{ id: string; recoveryCodes: string[] | null }> {
      let verification;
      try {
        verification = await verifyRegistrationResponse({ response: response as RegistrationResponseJSON, expectedChallenge: challenge, expectedOrigin, expectedRPID: rpID, requireUserVerification: false });
      } catch (e) {
        throw new InvalidSecondFactorError(`The passkey could not be registered: ${(e as Error).message}`);
      }
      if (!verification.verified || !verification.registrationInfo) throw new InvalidSecondFactorError('The passkey could not be registered.');
      const cred = verification.registrationInfo.credential;
      const now = clock.now().toISOString();
      return tx(db, (t) => {
        if (t.select({ id: passkeys.id }).from(passkeys).where(eq(passkeys.id, cred.id)).get()) throw new ConflictError('This passkey is already registered.', 'passkey_exists');
        t.insert(passkeys)
          .values({
            id: cred.id,
            userId: user.id,
            publicKey: Buffer.from(cred.publicKey).toString('base64url'),
            counter: cred.counter,
            transports: cred.transports?.join(',') ?? null,
            name: name ?? `Passkey added ${now.slice(0, 10)}`,
            createdAt: now,
          })
          .run();
        const codes = recoveryLeft(t, user.id) === 0 ? writeRecoveryCodes(t, user.id) : null;
        writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action: 'auth.second_factor_enrol', recordType: 'User', recordId: user.id, outcome: 'success', ip, detail: { method: 'passkey' } });
        return { id: cred.id, recoveryCodes: codes };
      });
    },

    async passkeyAuthenticationOptions(userId: string) {
      return generateAuthenticationOptions({
        rpID,
        allowCredentials: passkeysOf(db, userId).map((p) => ({ id: p.id, transports: transportsOf(p.transports) })),
        userVerification: 'preferred',
      });
    },

    async checkPasskey(user: FactorAccount, response: unknown, challenge: string, ip: string | null): Promise<void> {
      takeGuess(user.id);
      const r = response as AuthenticationResponseJSON;
      const row = db.select().from(passkeys).where(and(eq(passkeys.id, String(r.id)), eq(passkeys.userId, user.id))).get();
      let ok = false;
      if (row) {
        try {
          const v = await verifyAuthenticationResponse({
            response: r,
            expectedChallenge: challenge,
            expectedOrigin,
            expectedRPID: rpID,
            credential: { id: row.id, publicKey: new Uint8Array(Buffer.from(row.publicKey, 'base64url')), counter: row.counter, transports: transportsOf(row.transports) },
            requireUserVerification: false,
          });
          if (v.verified) {
            const newCounter = v.authenticationInfo.newCounter;
            // A signature counter that does not move forward (when the authenticator keeps one) is a cloned key.
            const moved = db
              .update(passkeys)
              .set({ counter: newCounter, lastUsedAt: clock.now().toISOString() })
              .where(and(eq(passkeys.id, row.id), newCounter === 0 ? eq(passkeys.counter, 0) : lt(passkeys.counter, newCounter)))
              .run().changes === 1;
            ok = moved;
          }
        } catch {
          ok = false;
        }
      }
      writeAudit(db, clock, { actorId: user.id, organisationId: user.organisationId, action: 'auth.second_factor', recordType: 'User', recordId: user.id, outcome: ok ? 'success' : 'failure', ip, detail: { method: 'passkey' } });
      if (!ok) throw new InvalidSecondFactorError('The passkey was not accepted.');
      guesses.reset(user.id);
    },

    removePasskey(user: FactorAccount, id: string, ip: string | null): void {
      const row = db.select().from(passkeys).where(and(eq(passkeys.id, id), eq(passkeys.userId, user.id))).get();
      if (!row) throw new NotFoundError('No such passkey.');
      const others = passkeysOf(db, user.id).length - 1 + (confirmedTotp(db, user.id) ? 1 : 0);
      if (service.isRequired(user) && others === 0) throw new ConflictError('Your account needs a second factor: set up another one before removing this passkey.', 'second_factor_required');
      tx(db, (t) => {
        t.delete(passkeys).where(eq(passkeys.id, id)).run();
        if (others === 0) t.delete(recoveryCodes).where(eq(recoveryCodes.userId, user.id)).run();
        writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action: 'auth.second_factor_remove', recordType: 'User', recordId: user.id, outcome: 'success', ip, detail: { method: 'passkey' } });
      });
    },

    // ------------------------------------------------------------------ organisation setting

    setOrganisationRequirement(user: FactorAccount, required: boolean, ip: string | null): { requireSecondFactor: boolean } {
      if (user.role !== 'manufacturer_admin' && user.role !== 'agency_admin') throw new ForbiddenError('Only an admin of the organisation may change this.');
      tx(db, (t) => {
        t.update(organisations).set({ requireSecondFactor: required, updatedAt: clock.now().toISOString() }).where(eq(organisations.id, user.organisationId)).run();
        writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action: 'organisation.require_second_factor', recordType: 'Organisation', recordId: user.organisationId, outcome: 'success', ip, detail: { required } });
      });
      return { requireSecondFactor: required };
    },
  };
  return service;
}

function transportsOf(s: string | null): AuthenticatorTransport[] | undefined {
  return s ? (s.split(',') as AuthenticatorTransport[]) : undefined;
}

