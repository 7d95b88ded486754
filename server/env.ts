import { z } from 'zod';

const bool = z
  .enum(['true', 'false', '1', '0'])
  .transform((v) => v === 'true' || v === '1');

/** Every setting has a default that runs out of the box on one machine. */
export const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('production'),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().min(1).default('127.0.0.1'),
  /** Defaults to http://localhost:PORT. */
  PUBLIC_URL: z.url().optional(),
  DATABASE_PATH: z.string().min(1).default('./data/fieldproof.sqlite'),
  STORAGE_DIR: z.string().min(1).default('./data/files'),
  SESSION_SECRET: z.string().min(32, 'SESSION_SECRET must be at least 32 characters').default('fieldproof-local-session-secret-change-me-0001'),
  PASSWORD_PEPPER: z.string().min(16, 'PASSWORD_PEPPER must be at least 16 characters').default('fieldproof-local-pepper-change-me'),
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
}).transform((e) => ({ ...e, PUBLIC_URL: e.PUBLIC_URL ?? `http://localhost:${e.PORT}` }));

export type Env = z.output<typeof envSchema>;

export function readEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const parsed = envSchema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Invalid configuration:\n${lines.join('\n')}`);
  }
  const env = parsed.data;
  if (env.STORAGE_DRIVER === 's3' && !env.S3_BUCKET) {
    throw new Error('Invalid configuration:\n  S3_BUCKET: required when STORAGE_DRIVER=s3');
  }
  if (env.NODE_ENV === 'production' && process.env.FIELDPROOF_STRICT_SECRETS === 'true') {
    if (env.SESSION_SECRET.includes('change-me') || env.PASSWORD_PEPPER.includes('change-me')) {
      throw new Error('Invalid configuration:\n  SESSION_SECRET / PASSWORD_PEPPER: set real secrets in strict mode');
    }
  }
  return env;
}
