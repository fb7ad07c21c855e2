// Every setting the server reads, validated once at start. See README "Configuration".
import { z } from 'zod';

const schema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  PORT: z.coerce.number().int().min(1).max(65535).default(4870),
  HOST: z.string().default('127.0.0.1'),
  DATABASE_URL: z.string().default('postgres://phaselot@127.0.0.1:54870/phaselot'),
  JWT_SECRET: z.string().min(16).optional(),
  TOKEN_TTL_HOURS: z.coerce.number().positive().default(12),
  SMTP_URL: z.string().default('smtp://127.0.0.1:2525'),
  MAIL_FROM: z.string().default('Phaselot <phaselot@phaselot.test>'),
  MAIL_CATCHER_DIR: z.string().optional(),
  PUBLIC_URL: z.string().default('http://127.0.0.1:4870'),
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
  S3_PREFIX: z.string().regex(/^([\w.-]+\/)*$/, 'a folder path ending in /, e.g. phaselot/').default(''),
  // Background jobs: an export still running after EXPORT_TIMEOUT_SECONDS is taken for dead and
  // started again; JOBS_MAINTENANCE_SECONDS is how often that is looked for.
  EXPORT_TIMEOUT_SECONDS: z.coerce.number().int().min(1).default(900),
  JOBS_MAINTENANCE_SECONDS: z.coerce.number().int().min(1).default(60),
});

export type Config = z.infer<typeof schema> & { JWT_SECRET: string };

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
  if (Boolean(env.S3_ACCESS_KEY_ID) !== Boolean(env.S3_SECRET_ACCESS_KEY)) throw new Error('S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY are set together (or neither, for the AWS SDK\'s own credential chain)');
  // Outside production a fixed development secret keeps tokens valid across restarts.
  return { ...env, JWT_SECRET: env.JWT_SECRET ?? 'phaselot-development-secret-not-for-production' };
}

export const config = load();
export const isProduction = config.NODE_ENV === 'production';
