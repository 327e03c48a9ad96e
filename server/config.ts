import { z } from 'zod';

const bool = z.enum(['true', 'false', '1', '0']).transform((v) => v === 'true' || v === '1');

/** Configuration from the environment, validated once at start-up (every problem named). */
const ConfigSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  PORT: z.coerce.number().int().min(1).max(65535).default(3000),
  APP_URL: z.string().url().optional(),
  DATABASE_URL: z.string().min(1, 'DATABASE_URL names the application role connection'),
  DATABASE_OWNER_URL: z.string().optional(),
  DATABASE_REPLICA_URL: z.string().optional(),
  DATABASE_APP_ROLE: z.string().default('alveolog_app'),
  SESSION_SECRET: z.string().min(32, 'SESSION_SECRET must be at least 32 characters'),
  IDENTIFIER_HASH_SECRET: z.string().min(32, 'IDENTIFIER_HASH_SECRET must be at least 32 characters'),
  DEMO_MODE: bool.default(false),
  IDLE_MINUTES: z.coerce.number().min(0.01).max(24 * 60).default(30),
  /** How long a signed-in user's roles and sites, and the session row, are reused between requests (0: read every time). */
  SESSION_USER_CACHE_MS: z.coerce.number().int().min(0).max(60_000).default(5000),
  BCRYPT_COST: z.coerce.number().int().min(4).max(15).default(12),
  LOGIN_MAX_FAILURES: z.coerce.number().int().min(1).default(5),
  LOCKOUT_MINUTES: z.coerce.number().min(0.01).default(15),
  LOGIN_RATE_LIMIT: z.coerce.number().int().min(1).default(30),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().default(2525),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  SMTP_SECURE: bool.default(false),
  SMTP_STANDIN: bool.default(false),
  MAIL_FROM: z.string().default('Alveolog <no-reply@alveolog.invalid>'),
  NETWORK_TIME_ZONE: z.string().default('Europe/Lisbon'),
  DATA_DIR: z.string().default('.data/files'),
  LOG_FILE: z.string().optional(),
  UPLOAD_MAX_MB: z.coerce.number().min(0.001).default(20),
  IMPORT_MAX_ROWS: z.coerce.number().int().min(1).default(100_000),
  /** Rows per INSERT while an import commits (progress is reported after each batch). */
  IMPORT_BATCH_ROWS: z.coerce.number().int().min(1).max(5000).default(2000),
  UPLOAD_RETENTION_HOURS: z.coerce.number().min(0).default(24),
  EXPORT_RETENTION_HOURS: z.coerce.number().min(0).default(72),
  /**
   * Largest xlsx export (rows x columns); above it the request is refused with CSV offered. Measured
   * (tests/bench/exports.bench.ts): 12M cells took 26 s and 329 MB in a process of its own (505 MB in
   * the app), about +9 MB per million cells: 20M cells stays under 60 s and 700 MB.
   */
  EXPORT_XLSX_MAX_CELLS: z.coerce.number().int().min(1).default(20_000_000),
  VERIFY_WAIT_DAYS: z.coerce.number().int().min(1).default(14),
  SESSION_LIMIT_MINUTES: z.coerce.number().min(0).default(60),
  TRUST_PROXY: bool.default(false),
});
export type Config = z.infer<typeof ConfigSchema>;

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = ConfigSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`).join('\n');
    throw new Error(`Alveolog configuration is incomplete:\n${lines}\nSet these environment variables (npm start sets them for the demo).`);
  }
  return parsed.data;
}
