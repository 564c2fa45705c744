import { z } from 'zod';

const bool = z
  .enum(['true', 'false', '1', '0', 'yes', 'no'], { error: 'must be true or false' })
  .transform((v) => v === 'true' || v === '1' || v === 'yes');

const duration = z.coerce.number({ error: 'must be a number of seconds' }).int().positive();

/** Every setting Kfield reads from the environment; defaults are safe for a laptop with no network. */
export const configSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number({ error: 'must be a port number' }).int().min(0).max(65535).default(3000),
  PUBLIC_URL: z.url({ error: 'must be an absolute URL such as http://localhost:3000' }).default('http://localhost:3000'),
  DATABASE_PATH: z.string().min(1).default('data/kfield.sqlite'),
  SESSION_SECRET: z.string().min(32, 'must be at least 32 characters').default('kfield-development-secret-change-me-0123456789'),
  /** Unset: true when PUBLIC_URL is https. */
  COOKIE_SECURE: bool.optional(),
  /** Production refuses an http PUBLIC_URL unless this is true (e.g. a closed network without TLS). */
  ALLOW_HTTP_PUBLIC_URL: bool.default(false),
  TRUST_PROXY: bool.default(false),
  /** Who may create sites: admins only, or also anyone who is Lead of at least one site. */
  SITE_CREATORS: z.enum(['admins', 'leads'], { error: 'must be admins or leads' }).default('admins'),
  SESSION_IDLE_SECONDS: duration.default(8 * 3600),
  SESSION_ABSOLUTE_SECONDS: duration.default(7 * 24 * 3600),
  BCRYPT_COST: z.coerce.number().int().min(10, 'must be at least 10').max(15).default(12),
  /** Failed sign-ins to one account (from anywhere) within the window before it is refused with 429. */
  LOGIN_MAX_FAILURES: z.coerce.number().int().positive().default(10),
  /** Failed sign-ins to one account from one address within the window before that pair is refused. */
  LOGIN_MAX_FAILURES_PER_ACCOUNT_ADDRESS: z.coerce.number().int().positive().default(5),
  /** Failed sign-ins from one address (any accounts) after which each attempt is delayed, never refused. */
  LOGIN_SLOWDOWN_AFTER_PER_ADDRESS: z.coerce.number().int().positive().default(50),
  LOGIN_WINDOW_SECONDS: duration.default(15 * 60),
  /** Requests to viewer-link pages and their API (/view/…, /api/view/…) per client address per minute. */
  VIEW_REQUESTS_PER_MINUTE: z.coerce.number().int().positive().default(600),
  INVITATION_TTL_HOURS: z.coerce.number().positive().default(72),
  RESET_TTL_HOURS: z.coerce.number().positive().default(1),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
  SMTP_SECURE: bool.default(false),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().default('Kfield <kfield@localhost>'),
  /** Run the local fake SMTP service inside the app (what it receives is kept in local_mailbox). */
  FAKE_SMTP: bool.default(true),
  /** The outbox retries a message the relay refused after this long, doubling each time (up to 15 min). */
  MAIL_RETRY_BASE_SECONDS: z.coerce.number({ error: 'must be a number of seconds' }).positive().default(5),
  /** Attempts before a message is marked undelivered (an Admin can retry it from the outbox). */
  MAIL_MAX_ATTEMPTS: z.coerce.number().int().min(1).max(50).default(8),
  /** Unset: true, except with NODE_ENV=production, where demo data need an explicit DEMO_DATA=true. */
  DEMO_DATA: bool.optional(),
  CLIENT_DIST: z.string().default('dist/client'),
  /** Largest logger or barometric file accepted by a record upload, in MB; a larger one gets 413. */
  RECORD_MAX_UPLOAD_MB: z.coerce.number({ error: 'must be a number of megabytes' }).positive('must be greater than 0').max(2048, 'must be at most 2048').default(100),
  /** The built basemap (basemap.mbtiles) and glyphs, written by npm run tiles. */
  TILES_DIST: z.string().min(1).default('tiles/dist'),
  /** Where uploaded basemaps are kept; empty means a basemaps folder beside DATABASE_PATH. */
  BASEMAP_DIR: z.string().default(''),
  /** Largest MBTiles file a basemap upload accepts, in MB; a larger one gets 413. */
  BASEMAP_MAX_UPLOAD_MB: z.coerce.number({ error: 'must be a number of megabytes' }).positive('must be greater than 0').max(65536, 'must be at most 65536').default(2048),
});

type ParsedConfig = z.infer<typeof configSchema>;
export type Config = Omit<ParsedConfig, 'COOKIE_SECURE' | 'DEMO_DATA'> & { COOKIE_SECURE: boolean; DEMO_DATA: boolean };

export class ConfigError extends Error {}

const invalid = (lines: string[]) => new ConfigError(`Kfield cannot start: the configuration is invalid\n${lines.join('\n')}`);

function productionProblems(cfg: Config): string[] {
  if (cfg.NODE_ENV !== 'production') return [];
  const problems: string[] = [];
  if (cfg.SESSION_SECRET.startsWith('kfield-development-secret')) problems.push('  - SESSION_SECRET: set a secret of your own in production');
  if (new URL(cfg.PUBLIC_URL).protocol !== 'https:' && !cfg.ALLOW_HTTP_PUBLIC_URL) {
    problems.push('  - PUBLIC_URL: must be an https address in production (sign-in cookies and passwords would cross the network in clear); set ALLOW_HTTP_PUBLIC_URL=true to accept http anyway');
  }
  return problems;
}

/** What the server should say at start about a configuration that works but is risky. */
export function startupWarnings(cfg: Config): string[] {
  const warnings: string[] = [];
  if (cfg.NODE_ENV === 'production' && cfg.DEMO_DATA) {
    warnings.push('Kfield: WARNING: DEMO_DATA=true in production: the demo accounts\' password is public (it is printed in the README); anyone can sign in as the demo Admin. Set DEMO_DATA=false and remove the demo accounts before real use.');
  }
  return warnings;
}

/** Parse once at start-up; a bad value stops the process with a readable list. */
export function loadConfig(env: Record<string, string | undefined> = process.env): Config {
  const clean = Object.fromEntries(Object.entries(env).filter(([, v]) => v !== undefined && v !== ''));
  const parsed = configSchema.safeParse(clean);
  if (!parsed.success) throw invalid(parsed.error.issues.map((i) => `  - ${i.path.join('.')}: ${i.message}`));
  const { COOKIE_SECURE, DEMO_DATA, ...rest } = parsed.data;
  const cfg: Config = {
    ...rest,
    COOKIE_SECURE: COOKIE_SECURE ?? new URL(rest.PUBLIC_URL).protocol === 'https:',
    DEMO_DATA: DEMO_DATA ?? rest.NODE_ENV !== 'production',
  };
  const problems = productionProblems(cfg);
  if (problems.length) throw invalid(problems);
  return cfg;
}
