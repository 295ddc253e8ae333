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
