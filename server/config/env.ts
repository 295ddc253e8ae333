// Reads and validates the environment once at start; a bad variable stops the server with its name.
import { z } from 'zod';

const bool = z.enum(['1', '0', 'true', 'false', 'yes', 'no']).transform((v) => v === '1' || v === 'true' || v === 'yes');

const optional = <T extends z.ZodType>(t: T) => z.preprocess((v) => (v === '' ? undefined : v), t.optional());

/**
 * Where uploaded bytes live: the FILES_DIR folder unless S3_BUCKET and its credentials are set,
 * then an S3-compatible bucket (AWS, or any service that speaks the S3 API at S3_ENDPOINT).
 */
export const StorageConfigSchema = z.object({
  FILES_DIR: z.string().min(1).optional(),
  S3_BUCKET: optional(z.string().regex(/^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/, 'must be a bucket name: 3 to 63 lower-case letters, digits, dots or hyphens')),
  S3_REGION: optional(z.string().regex(/^[a-z0-9-]{2,32}$/, 'must be a region name such as eu-west-1')).default('us-east-1'),
  S3_ENDPOINT: optional(z.url({ protocol: /^https?$/, error: 'must be an http:// or https:// URL of the S3-compatible service' })),
  S3_ACCESS_KEY_ID: optional(z.string().min(1)),
  S3_SECRET_ACCESS_KEY: optional(z.string().min(1)),
  /** Bucket in the path (http://host/bucket/key) instead of the host name; most self-hosted services need it. Default: on when S3_ENDPOINT is set. */
  S3_FORCE_PATH_STYLE: optional(bool),
  /** Keys start with this folder inside the bucket, e.g. "beadpath/" when the bucket is shared. */
  S3_PREFIX: optional(z.string().regex(/^[A-Za-z0-9._-]+(\/[A-Za-z0-9._-]+)*\/?$/, 'must be a folder path such as "beadpath/" (letters, digits, . _ - and /, no leading /)')),
});
export type StorageConfig = z.output<typeof StorageConfigSchema>;

export interface S3Settings {
  bucket: string;
  region: string;
  endpoint?: string;
  accessKeyId: string;
  secretAccessKey: string;
  forcePathStyle: boolean;
  /** Empty, or a folder ending in "/". */
  prefix: string;
}

/** The half-set cases, named by variable: a bucket without keys, or keys without a bucket. */
export function storageConfigProblems(c: StorageConfig): string[] {
  const out: string[] = [];
  const anyS3 = c.S3_BUCKET || c.S3_ACCESS_KEY_ID || c.S3_SECRET_ACCESS_KEY || c.S3_ENDPOINT || c.S3_PREFIX;
  if (!anyS3) return out;
  if (!c.S3_BUCKET) out.push('S3_BUCKET: required when any other S3_ variable is set (uploads go to the local folder only when no S3_ variable is set)');
  if (!c.S3_ACCESS_KEY_ID) out.push('S3_ACCESS_KEY_ID: required for S3 upload storage');
  if (!c.S3_SECRET_ACCESS_KEY) out.push('S3_SECRET_ACCESS_KEY: required for S3 upload storage');
  return out;
}

/** S3 settings when object storage is configured; null means the local folder. */
export function s3Settings(c: StorageConfig): S3Settings | null {
  if (!c.S3_BUCKET || !c.S3_ACCESS_KEY_ID || !c.S3_SECRET_ACCESS_KEY) return null;
  const prefix = c.S3_PREFIX ? c.S3_PREFIX.replace(/\/?$/, '/') : '';
  return {
    bucket: c.S3_BUCKET,
    region: c.S3_REGION,
    endpoint: c.S3_ENDPOINT,
    accessKeyId: c.S3_ACCESS_KEY_ID,
    secretAccessKey: c.S3_SECRET_ACCESS_KEY,
    forcePathStyle: c.S3_FORCE_PATH_STYLE ?? Boolean(c.S3_ENDPOINT),
    prefix,
  };
}

function configError(lines: string[]) {
  return new ConfigError(`Beadpath cannot start: invalid configuration\n${lines.map((l) => `  ${l}`).join('\n')}`);
}

/** Only the storage variables, for scripts (demo seed, backup, restore) that store files without the whole server config. */
export function loadStorageConfig(env: NodeJS.ProcessEnv = process.env): StorageConfig {
  const parsed = StorageConfigSchema.safeParse(env);
  if (!parsed.success) throw configError(parsed.error.issues.map((i) => `${i.path.join('.') || '(environment)'}: ${i.message}`));
  const problems = storageConfigProblems(parsed.data);
  if (problems.length) throw configError(problems);
  return parsed.data;
}

export const ConfigSchema = z.object({
  ...StorageConfigSchema.shape,
  NODE_ENV: z.enum(['development', 'production', 'test']).default('production'),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().min(1).default('0.0.0.0'),
  DATABASE_URL: z.string().regex(/^postgres(ql)?:\/\//, 'must be a postgres:// URL'),
  SESSION_SECRET: z.string().min(32, 'must be at least 32 characters'),
  BEADPATH_DEMO: bool.default(false),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  TRUST_PROXY: bool.default(false),
  PUBLIC_ORIGIN: z.url().optional(),
  LOGIN_RATE_LIMIT: z.coerce.number().int().min(1).default(10),
  UPLOAD_LIMIT_MB: z.coerce.number().min(1).max(100).default(15),
  JSON_BODY_LIMIT: z
    .string()
    .regex(/^\d+(kb|mb)$/i)
    .default('1mb'),
  // Search uses Meilisearch only when both are set; otherwise PostgreSQL answers alone.
  MEILI_URL: z.preprocess((v) => (v === '' ? undefined : v), z.url().optional()),
  MEILI_API_KEY: z.preprocess((v) => (v === '' ? undefined : v), z.string().optional()),
  /** Past this, a search is answered from PostgreSQL instead. */
  MEILI_TIMEOUT_MS: z.coerce.number().int().min(20).max(30_000).default(300),
  // Mail: a real SMTP server when SMTP_URL or SMTP_HOST is set; otherwise the local fake keeps
  // every message in the database (FAKE_SMTP=1 forces the fake, 0 turns it off).
  SMTP_URL: z.preprocess(
    (v) => (v === '' ? undefined : v),
    z
      .string()
      .regex(/^smtps?:\/\//, 'must be an smtp:// or smtps:// URL')
      .optional(),
  ),
  SMTP_HOST: z.preprocess((v) => (v === '' ? undefined : v), z.string().min(1).optional()),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(587),
  SMTP_SECURE: bool.default(false),
  SMTP_USER: z.preprocess((v) => (v === '' ? undefined : v), z.string().optional()),
  SMTP_PASSWORD: z.preprocess((v) => (v === '' ? undefined : v), z.string().optional()),
  FAKE_SMTP: z.preprocess((v) => (v === '' ? undefined : v), bool.optional()),
  /** 0 picks a free port on 127.0.0.1. */
  FAKE_SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(0),
  MAIL_FROM: z.string().min(3).default('Beadpath <beadpath@example.com>'),
  MAIL_RETRY_LIMIT: z.coerce.number().int().min(0).max(50).default(10),
  MAIL_RETRY_DELAY_S: z.coerce.number().int().min(1).max(3600).default(30),
  MAIL_RETRY_BACKOFF: bool.default(true),
  MAIL_POLL_S: z.coerce.number().min(0.5).max(60).default(2),
  MAIL_TIMEOUT_S: z.coerce.number().min(1).max(300).default(30),
  /** Password-reset requests per e-mail and address in 15 minutes. */
  RESET_RATE_LIMIT: z.coerce.number().int().min(1).default(5),
});

export type Config = z.output<typeof ConfigSchema>;

export class ConfigError extends Error {}

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = ConfigSchema.safeParse(env);
  if (!parsed.success) throw configError(parsed.error.issues.map((i) => `${i.path.join('.') || '(environment)'}: ${i.message}`));
  const problems = storageConfigProblems(parsed.data);
  if (problems.length) throw configError(problems);
  return parsed.data;
}
