// Every setting the server reads, validated once at start. See README "Configuration".
import { randomBytes } from 'node:crypto';
import { linkSync, mkdirSync, readFileSync, unlinkSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { z } from 'zod';

const schema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  PORT: z.coerce.number().int().min(1).max(65535).default(4870),
  HOST: z.string().default('127.0.0.1'),
  // The application's connection (a role that may read and write rows only) and the owner's, which
  // runs the migrations, backups and restores; one URL for both when MIGRATION_DATABASE_URL is unset.
  DATABASE_URL: z.string().default('postgres://phaselot_app@127.0.0.1:54870/phaselot'),
  MIGRATION_DATABASE_URL: z.string().optional(),
  JWT_SECRET: z.string().min(16).optional(),
  JWT_SECRET_FILE: z.string().default(join(resolve(import.meta.dirname, '..'), '.data', 'jwt-secret')),
  TOKEN_TTL_HOURS: z.coerce.number().positive().default(12),
  SMTP_URL: z.string().default('smtp://127.0.0.1:2525'),
  MAIL_FROM: z.string().default('Phaselot <phaselot@phaselot.test>'),
  MAIL_CATCHER_DIR: z.string().optional(),
  // The address printed in links; a comma-separated list when several addresses reach the same
  // servers (behind a proxy): the first is printed, all are accepted as origins of changes.
  PUBLIC_URL: z
    .string()
    .default('http://127.0.0.1:4870')
    .transform((value) =>
      value
        .split(',')
        .map((entry) => entry.trim())
        .filter(Boolean),
    )
    .pipe(z.array(z.url({ protocol: /^https?$/ })).min(1)),
  UPLOAD_DIR: z.string().optional(),
  LOG_LEVEL: z.string().default('info'),
  // The file store: a local folder (UPLOAD_DIR) or an S3-compatible bucket.
  STORAGE: z.enum(['local', 's3']).default('local'),
  S3_BUCKET: z.string().min(1).optional(),
  S3_REGION: z.string().default('us-east-1'),
  S3_ENDPOINT: z.url().optional(),
  S3_FORCE_PATH_STYLE: z.stringbool().optional(),
  S3_ACCESS_KEY_ID: z.string().min(1).optional(),
  S3_SECRET_ACCESS_KEY: z.string().min(1).optional(),
  S3_PREFIX: z
    .string()
    .regex(/^([\w.-]+\/)*$/, 'a folder path ending in /, e.g. phaselot/')
    .default(''),
  // Background jobs: an export still running after EXPORT_TIMEOUT_SECONDS is taken for dead and
  // started again; JOBS_MAINTENANCE_SECONDS is how often that is looked for.
  EXPORT_TIMEOUT_SECONDS: z.coerce.number().int().min(1).default(900),
  JOBS_MAINTENANCE_SECONDS: z.coerce.number().int().min(1).default(60),
  // Every database statement of the application is stopped after STATEMENT_TIMEOUT_SECONDS (0: never);
  // work known to read everything (the audit chain check) is allowed LONG_STATEMENT_TIMEOUT_SECONDS.
  STATEMENT_TIMEOUT_SECONDS: z.coerce.number().int().min(0).default(30),
  LONG_STATEMENT_TIMEOUT_SECONDS: z.coerce.number().int().min(0).default(900),
});

export type Config = Omit<z.infer<typeof schema>, 'PUBLIC_URL'> & {
  JWT_SECRET: string;
  PUBLIC_URL: string;
  PUBLIC_ORIGINS: string[];
  MIGRATION_DATABASE_URL: string;
};

function load(): Config {
  const parsed = schema.safeParse(process.env);
  if (!parsed.success) {
    throw new Error(`Invalid configuration: ${parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ')}`);
  }
  const env = parsed.data;
  if (env.NODE_ENV === 'production' && !env.JWT_SECRET) {
    throw new Error('JWT_SECRET must be set (16 characters or more) when NODE_ENV=production');
  }
  if (env.STORAGE === 's3' && !env.S3_BUCKET) throw new Error('S3_BUCKET must be set when STORAGE=s3');
  if (Boolean(env.S3_ACCESS_KEY_ID) !== Boolean(env.S3_SECRET_ACCESS_KEY))
    throw new Error("S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY are set together (or neither, for the AWS SDK's own credential chain)");
  return {
    ...env,
    MIGRATION_DATABASE_URL: env.MIGRATION_DATABASE_URL ?? env.DATABASE_URL,
    JWT_SECRET: env.JWT_SECRET ?? storedSecret(env.JWT_SECRET_FILE),
    PUBLIC_URL: env.PUBLIC_URL[0].replace(/\/+$/, ''),
    PUBLIC_ORIGINS: env.PUBLIC_URL.map((url) => new URL(url).origin),
  };
}

const MIN_STORED_SECRET = 32;

/** Outside production, without JWT_SECRET: a random secret made on the first start and kept in
 * the git-ignored data folder, so sessions outlive a restart and no secret sits in the repository.
 * It is written to a temporary file and linked into place, so no process ever reads a half-written
 * secret: of two starting at once, the first to link wins and the other reads its secret. */
function storedSecret(file: string): string {
  const read = () => {
    const secret = readFileSync(file, 'utf8').trim();
    if (secret.length < MIN_STORED_SECRET) throw new Error(`${file} holds no usable secret (under ${MIN_STORED_SECRET} characters): delete it and start again`);
    return secret;
  };
  try {
    return read();
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'ENOENT') throw error;
  }
  mkdirSync(dirname(file), { recursive: true });
  const temporary = `${file}.${process.pid}.${randomBytes(4).toString('hex')}`;
  writeFileSync(temporary, `${randomBytes(48).toString('base64url')}\n`, { mode: 0o600 });
  try {
    linkSync(temporary, file);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
  } finally {
    unlinkSync(temporary);
  }
  return read();
}

export const config = load();
export const isProduction = config.NODE_ENV === 'production';
