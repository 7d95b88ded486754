import { z } from 'zod';
import { isPublishedSecret } from './lib/published-secrets';
import { loadSecrets, type SecretName } from './lib/secrets-file';

const bool = z
  .enum(['true', 'false', '1', '0'])
  .transform((v) => v === 'true' || v === '1');

function secret(name: SecretName, min: number) {
  return z
    .string()
    .min(min, `${name} must be at least ${min} characters (unset it to have a random one generated into the data folder)`)
    .refine((v) => !isPublishedSecret(v), `${name} is a value that stands in the Fieldproof source, which anyone can read; set a random one (e.g. \`openssl rand -base64 32\`) or unset it to have one generated`);
}

/** The names a loopback-only server may be bound to. */
export function isLoopbackHost(host: string): boolean {
  const h = host.trim().toLowerCase().replace(/^\[(.*)\]$/, '$1');
  return h === 'localhost' || h === '::1' || /^127(\.\d{1,3}){3}$/.test(h) || /^::ffff:127(\.\d{1,3}){3}$/.test(h);
}

/**
 * Every setting has a default that runs out of the box on one machine. Two modes follow from
 * SMTP_URL: unset is the demo (local mail sink and mailbox, loopback only), set is a deployment.
 */
/** Per-user rates by default: generous for autosave and an offline queue replaying, tight for scripts. */
export const DEFAULT_USER_RATES = { RATE_WRITES_PER_MINUTE: 240, RATE_UPLOADS_PER_MINUTE: 30, RATE_UNIT_LOOKUPS_PER_MINUTE: 30 } as const;

const baseSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('production'),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().min(1).default('127.0.0.1'),
  /** Defaults to http://localhost:PORT. */
  PUBLIC_URL: z.url().optional(),
  DATABASE_PATH: z.string().min(1).default('./data/fieldproof.sqlite'),
  STORAGE_DIR: z.string().min(1).default('./data/files'),
  /** Unset: generated on first start into the data folder's secrets.json (mode 0600), see readEnv. */
  SESSION_SECRET: secret('SESSION_SECRET', 32).optional(),
  PASSWORD_PEPPER: secret('PASSWORD_PEPPER', 16).optional(),
  SMTP_URL: z.string().optional(),
  MAIL_FROM: z.string().default('Fieldproof <no-reply@fieldproof.test>'),
  MAIL_SINK_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
  SEED_DEMO: bool.default(true),
  COOKIE_SECURE: bool.optional(),
  BCRYPT_COST: z.coerce.number().int().min(4).max(15).default(10),
  TRUST_PROXY: bool.default(false),
  STORAGE_DRIVER: z.enum(['local', 's3']).default('local'),
  S3_ENDPOINT: z.url().optional(),
  S3_BUCKET: z.string().min(1).optional(),
  S3_REGION: z.string().min(1).default('us-east-1'),
  S3_ACCESS_KEY_ID: z.string().min(1).optional(),
  S3_SECRET_ACCESS_KEY: z.string().min(1).optional(),
  UPLOAD_MAX_FILE_BYTES: z.coerce.number().int().min(1).default(15 * 1024 * 1024),
  UPLOAD_MAX_FILES_PER_REQUEST: z.coerce.number().int().min(1).max(50).default(10),
  UPLOAD_MAX_FILES_PER_CLAIM: z.coerce.number().int().min(1).default(40),
  UPLOAD_MAX_BYTES_PER_CLAIM: z.coerce.number().int().min(1).default(200 * 1024 * 1024),
  UPLOAD_AGENCY_QUOTA_BYTES: z.coerce.number().int().min(1).default(10 * 1024 * 1024 * 1024),
  /** Uploads one user may have in progress at once (held as lease rows in the database). */
  UPLOAD_MAX_CONCURRENT_PER_USER: z.coerce.number().int().min(1).max(50).default(2),
  /** Per signed-in user and minute (SQLite rate store): unsafe API requests, upload requests, unit look-ups. */
  RATE_WRITES_PER_MINUTE: z.coerce.number().int().min(1).default(DEFAULT_USER_RATES.RATE_WRITES_PER_MINUTE),
  RATE_UPLOADS_PER_MINUTE: z.coerce.number().int().min(1).default(DEFAULT_USER_RATES.RATE_UPLOADS_PER_MINUTE),
  RATE_UNIT_LOOKUPS_PER_MINUTE: z.coerce.number().int().min(1).default(DEFAULT_USER_RATES.RATE_UNIT_LOOKUPS_PER_MINUTE),
});

export const envSchema = baseSchema
  .superRefine((e, ctx) => {
    if (!e.SMTP_URL && !isLoopbackHost(e.HOST)) {
      ctx.addIssue({
        code: 'custom',
        path: ['HOST'],
        message: `${e.HOST} is not a loopback address. Without SMTP_URL Fieldproof runs in demo mode, whose local mailbox shows every mail (reset links included), so it listens on loopback only (127.0.0.1, ::1 or localhost). Set SMTP_URL to a real mail server to deploy it on ${e.HOST}.`,
      });
    }
  })
  .transform((e) => ({
    ...e,
    PUBLIC_URL: e.PUBLIC_URL ?? `http://localhost:${e.PORT}`,
  }));

export type Mode = 'demo' | 'deployment';
/** demo: no SMTP_URL, local mail sink and mailbox, loopback only. deployment: SMTP_URL set, no mailbox. */
export function modeOf(env: { SMTP_URL?: string | undefined }): Mode {
  return env.SMTP_URL ? 'deployment' : 'demo';
}

/** The configuration as parsed, before the secrets are resolved. */
export type Config = z.output<typeof envSchema>;
/** The configuration the app runs with: both secrets present. */
export type Env = Config & Record<SecretName, string>;

function invalid(issues: string[]): Error {
  return new Error(`Invalid configuration:\n${issues.map((l) => `  ${l}`).join('\n')}`);
}

function parseConfig(source: NodeJS.ProcessEnv): Config {
  const parsed = envSchema.safeParse(source);
  if (!parsed.success) throw invalid(parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`));
  const env = parsed.data;
  if (env.STORAGE_DRIVER === 's3' && !env.S3_BUCKET) throw invalid(['S3_BUCKET: required when STORAGE_DRIVER=s3']);
  return env;
}

/** Parses a configuration whose secrets are given (tests pass random ones); refuses one without them. */
export function parseEnv(source: NodeJS.ProcessEnv): Env {
  const env = parseConfig(source);
  const absent = (['SESSION_SECRET', 'PASSWORD_PEPPER'] as const).filter((n) => env[n] === undefined);
  if (absent.length > 0) throw invalid(absent.map((n) => `${n}: required`));
  return env as Env;
}

export interface ReadEnvResult {
  env: Env;
  /** The data folder's secrets file, and which secrets this start generated into it. */
  secrets: { file: string; generated: SecretName[]; fromFile: SecretName[] };
}

/**
 * Reads the configuration of a process. A secret the environment does not set comes from the
 * data folder's secrets.json next to DATABASE_PATH, generated there (mode 0600) on first start
 * and reused after, so sessions and password hashes survive a restart. A secret that is too
 * short or stands anywhere in the source stops start-up, wherever it came from.
 */
export function readEnvWithSecrets(source: NodeJS.ProcessEnv = process.env): ReadEnvResult {
  const config = parseConfig(source);
  const fromEnv = { SESSION_SECRET: config.SESSION_SECRET, PASSWORD_PEPPER: config.PASSWORD_PEPPER };
  const loaded = loadSecrets(config.DATABASE_PATH, fromEnv);
  const env = parseEnv({ ...source, ...loaded.secrets });
  const fromFile = (['SESSION_SECRET', 'PASSWORD_PEPPER'] as const).filter((n) => fromEnv[n] === undefined);
  return { env, secrets: { file: loaded.file, generated: loaded.generated, fromFile } };
}

export function readEnv(source: NodeJS.ProcessEnv = process.env): Env {
  return readEnvWithSecrets(source).env;
}
