import { z } from 'zod';
import type { Role } from '../permissions/ability';

/** Roles that move money or run the catalogue and contracts: a second factor is never optional for them. */
export const rolesRequiringSecondFactor: readonly Role[] = ['accountant', 'manufacturer_admin'];

/** A 6-digit code from an authenticator app (spaces allowed, as apps show "123 456"). */
export const totpCodeSchema = z
  .string()
  .transform((s) => s.replace(/\s+/g, ''))
  .pipe(z.string().regex(/^\d{6}$/, 'Enter the 6-digit code from your authenticator app.'));

/** A recovery code as printed: 10 letters and digits, dashes and spaces ignored, any case. */
export const recoveryCodeSchema = z
  .string()
  .max(64, 'That is not a recovery code.')
  .transform((s) => s.replace(/[\s-]+/g, '').toUpperCase())
  .pipe(z.string().regex(/^[0-9A-Z]{10}$/, 'Enter one of your recovery codes (10 letters and digits).'));

export const totpBodySchema = z.strictObject({ code: totpCodeSchema });
export const recoveryBodySchema = z.strictObject({ code: recoveryCodeSchema });

/** A WebAuthn response as @simplewebauthn/browser returns it; checked in depth by @simplewebauthn/server. */
export const webAuthnResponseSchema = z.looseObject({
  id: z.string().min(1).max(1024),
  rawId: z.string().min(1).max(1024),
  type: z.literal('public-key'),
  response: z.looseObject({ clientDataJSON: z.string().max(8192) }),
});
export const passkeyBodySchema = z.strictObject({ response: webAuthnResponseSchema });
export const passkeyRegisterBodySchema = z.strictObject({
  response: webAuthnResponseSchema,
  name: z.string().trim().min(1, 'Name this passkey.').max(60, 'Use at most 60 characters.').optional(),
});

/** Step-up: the password, or a code (authenticator or recovery). */
export const stepUpBodySchema = z.union([
  z.strictObject({ password: z.string().min(1, 'Enter your password.').max(1024, 'That password is too long.') }),
  z.strictObject({ code: totpCodeSchema }),
]);

export const organisationSecuritySchema = z.strictObject({ requireSecondFactor: z.boolean() });

export type SecondFactorMethod = 'totp' | 'passkey' | 'recovery';

/** Sign-in answer when the password was right but a second factor is still needed (no session yet). */
export interface SecondFactorChallenge {
  secondFactor: {
    /** 'verify': use an enrolled factor; 'enrol': this account must set one up first. */
    purpose: 'verify' | 'enrol';
    methods: SecondFactorMethod[];
  };
}

export interface TotpSetupResponse {
  /** Base32 secret for typing in by hand. */
  secret: string;
  otpauthUri: string;
  /** The otpauth URI as a QR code, an SVG image as a data URL (rendered locally, no third party). */
  qrDataUrl: string;
}

export interface RecoveryCodesResponse {
  /** Shown once; only their hashes are stored. */
  recoveryCodes: string[];
}

export interface SecurityStatus {
  totp: boolean;
  passkeys: { id: string; name: string; createdAt: string; lastUsedAt: string | null }[];
  recoveryCodesLeft: number;
  /** Whether this account must have a second factor (its role or its organisation's setting). */
  required: boolean;
  organisation: { requireSecondFactor: boolean; canChange: boolean };
}
