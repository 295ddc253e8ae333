// Reads and validates the environment once at start; a bad variable stops the server with its name.
import { z } from 'zod';

const bool = z
  .enum(['1', '0', 'true', 'false', 'yes', 'no'])
  .transform((v) => v === '1' || v === 'true' || v === 'yes');

export const ConfigSchema = z.object({
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
  FILES_DIR: z.string().min(1).optional(),
  UPLOAD_LIMIT_MB: z.coerce.number().min(1).max(100).default(15),
  JSON_BODY_LIMIT: z.string().regex(/^\d+(kb|mb)$/i).default('1mb'),
  // Search uses Meilisearch only when both are set; otherwise PostgreSQL answers alone.
  MEILI_URL: z.preprocess((v) => (v === '' ? undefined : v), z.url().optional()),
  MEILI_API_KEY: z.preprocess((v) => (v === '' ? undefined : v), z.string().optional()),
  /** Past this, a search is answered from PostgreSQL instead. */
  MEILI_TIMEOUT_MS: z.coerce.number().int().min(20).max(30_000).default(300),
  // Mail: a real SMTP server when SMTP_URL or SMTP_HOST is set; otherwise the local fake keeps
  // every message in the database (FAKE_SMTP=1 forces the fake, 0 turns it off).
  SMTP_URL: z.preprocess((v) => (v === '' ? undefined : v), z.string().regex(/^smtps?:\/\//, 'must be an smtp:// or smtps:// URL').optional()),
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
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.') || '(environment)'}: ${i.message}`);
    throw new ConfigError(`Beadpath cannot start: invalid configuration\n${lines.join('\n')}`);
  }
  return parsed.data;
}
