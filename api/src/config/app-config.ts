import { plainToInstance, Transform } from 'class-transformer';
import { isIP } from 'node:net';
import { resolve } from 'node:path';
import {
  IsBoolean,
  IsIn,
  IsInt,
  IsString,
  IsUrl,
  Max,
  Min,
  MinLength,
  registerDecorator,
  validateSync,
} from 'class-validator';

/** Secrets that are fine on a developer's machine and must never reach production. */
export const DEVELOPMENT_SECRETS = {
  jwtSecret: 'evenhand-development-jwt-secret-change-me',
  stripeSecretKey: 'sk_test_evenhand_local',
  stripeWebhookSecret: 'whsec_evenhand_dev',
} as const;

/** Passphrase of the development signing certificate made on first start; documents refuse it in production. */
export const DEVELOPMENT_SIGNING_PASSPHRASE = 'evenhand-development-document-signing';

/** The checkout's git-ignored folder for local state (this file sits in api/src/config or api/dist/config). */
const LOCAL_DIR = resolve(__dirname, '../../../.local');

const toInt = ({ value }: { value: unknown }) => (value === undefined || value === '' ? undefined : Number(value));
const toBool = ({ value }: { value: unknown }) =>
  value === undefined || value === '' ? undefined : value === true || value === 'true' || value === '1';

/** Express's names for address ranges, accepted in TRUST_PROXY besides addresses and subnets. */
const NAMED_PROXY_RANGES = ['loopback', 'linklocal', 'uniquelocal'];

/** One proxy entry: an IP address, a subnet (`10.0.0.0/8`) or one of express's named ranges. */
export function isProxyEntry(entry: string): boolean {
  if (NAMED_PROXY_RANGES.includes(entry)) return true;
  const [address, bits, ...rest] = entry.split('/');
  const family = isIP(address);
  if (family === 0 || rest.length > 0) return false;
  return bits === undefined || (/^\d{1,3}$/.test(bits) && Number(bits) <= (family === 4 ? 32 : 128));
}

function IsProxyList() {
  return (target: object, propertyName: string) =>
    registerDecorator({
      target: target.constructor,
      propertyName,
      options: {
        message:
          'must be empty or a comma-separated list of proxy addresses, subnets or loopback/linklocal/uniquelocal',
      },
      validator: {
        validate: (value: unknown) =>
          Array.isArray(value) && value.every((entry) => typeof entry === 'string' && isProxyEntry(entry)),
      },
    });
}

const toList = ({ value }: { value: unknown }) =>
  typeof value === 'string'
    ? value
        .split(',')
        .map((entry) => entry.trim())
        .filter((entry) => entry !== '')
    : value;

/** All run-time settings, read once from the environment at boot and validated. */
export class AppConfig {
  @IsIn(['development', 'test', 'production'])
  nodeEnv: 'development' | 'test' | 'production' = 'development';

  @IsString()
  host = '127.0.0.1';

  @Transform(toInt)
  @IsInt()
  @Min(1)
  @Max(65535)
  port = 3100;

  @IsString()
  @MinLength(1)
  databaseUrl = 'postgres://postgres@127.0.0.1:55432/evenhand';

  /** Connections this process keeps open to PostgreSQL (the job queue has its own few). */
  @Transform(toInt)
  @IsInt()
  @Min(1)
  @Max(500)
  databasePoolMax = 20;

  @IsString()
  @MinLength(32)
  jwtSecret: string = DEVELOPMENT_SECRETS.jwtSecret;

  @Transform(toInt)
  @IsInt()
  @Min(60)
  accessTokenSeconds = 15 * 60;

  @Transform(toInt)
  @IsInt()
  @Min(300)
  refreshTokenSeconds = 14 * 24 * 3600;

  @Transform(toInt)
  @IsInt()
  @Min(60)
  signInLinkSeconds = 15 * 60;

  /** How long an e-mailed password-reset link works. */
  @Transform(toInt)
  @IsInt()
  @Min(60)
  passwordResetSeconds = 60 * 60;

  /** Cookies get `Secure` everywhere but on a developer's loopback. */
  @Transform(toBool)
  @IsBoolean()
  secureCookies = false;

  @IsUrl({ require_tld: false })
  portalUrl = 'http://127.0.0.1:5173';

  @IsUrl({ require_tld: false })
  adminUrl = 'http://127.0.0.1:5174';

  @IsString()
  smtpHost = '127.0.0.1';

  @Transform(toInt)
  @IsInt()
  smtpPort = 1025;

  @IsString()
  mailFrom = 'Evenhand <no-reply@evenhand.test>';

  @IsString()
  @MinLength(8)
  stripeSecretKey: string = DEVELOPMENT_SECRETS.stripeSecretKey;

  @IsString()
  stripeHost = '127.0.0.1';

  @Transform(toInt)
  @IsInt()
  stripePort = 3200;

  @IsIn(['http', 'https'])
  stripeProtocol: 'http' | 'https' = 'http';

  @IsString()
  @MinLength(8)
  stripeWebhookSecret: string = DEVELOPMENT_SECRETS.stripeWebhookSecret;

  /** The provider's publishable key, handed to the browser for card entry. */
  @IsString()
  @MinLength(8)
  stripePublishableKey = 'pk_test_evenhand_local';

  /** Where the browser loads the provider's script from (the stand-in serves one on loopback). */
  @IsString()
  stripeScriptUrl = 'http://127.0.0.1:3200/v1/stripe.js';

  /**
   * Year-to-date pay per participant at which tax reporting applies, in minor units: US$2,000 for payments made
   * in 2026 (Internal Revenue Code §6041 as amended in 2025, as the issue states it; check with the finance office).
   */
  @Transform(toInt)
  @IsInt()
  @Min(0)
  taxReportingThresholdMinor = 200_000;

  /** Sign-in attempts (password or link) per e-mail address per window, from any number of clients. */
  @Transform(toInt)
  @IsInt()
  @Min(1)
  signInLimit = 10;

  /** Sign-in attempts per client address per window, across every e-mail address it tries; 3 × SIGN_IN_LIMIT when unset. */
  @Transform(toInt)
  @IsInt()
  @Min(1)
  signInClientLimit = 30;

  /**
   * Proxies whose X-Forwarded-For is believed when working out a client's address: addresses, subnets or express's
   * named ranges, comma-separated. None by default, so a client cannot pick its own address (and rate-limit key).
   */
  @Transform(toList)
  @IsProxyList()
  trustProxy: string[] = [];

  /** Seconds a just-replaced refresh token still answers with its successor (two tabs refreshing at once). */
  @Transform(toInt)
  @IsInt()
  @Min(0)
  @Max(120)
  refreshGraceSeconds = 20;

  @Transform(toInt)
  @IsInt()
  @Min(1)
  signInWindowSeconds = 15 * 60;

  /** First retry delay of a failed job; later retries back off from it. */
  @Transform(toInt)
  @IsInt()
  @Min(1)
  jobRetryDelaySeconds = 5;

  /** Longest wait between two tries of a failed job, so work resumes within minutes of a dependency coming back. */
  @Transform(toInt)
  @IsInt()
  @Min(1)
  jobRetryDelayMaxSeconds = 120;

  /** Cron (UTC) of the sweep that settles payouts left `sending`; empty turns the schedule off. */
  @IsString()
  payoutSweepCron = '* * * * *';

  /** A payout `sending` this long without a new try is settled by asking the provider. */
  @Transform(toInt)
  @IsInt()
  @Min(30)
  payoutStuckAfterSeconds = 300;

  /** Days links signed with a rotated-out return key keep working. */
  @Transform(toInt)
  @IsInt()
  @Min(0)
  returnLinkGraceDays = 7;

  /** Days a return link stays valid after its step is due (or after it was handed out, with no due date). */
  @Transform(toInt)
  @IsInt()
  @Min(1)
  returnLinkValidDays = 14;

  /** Cron (UTC) of the reminder sweep; empty turns the schedule off. */
  @IsString()
  reminderSweepCron = '*/10 * * * *';

  /** Cron (UTC) that folds the dropout watch's pending summary deltas into its compacted rows; empty turns it off. */
  @IsString()
  attritionCompactCron = '*/5 * * * *';

  /** Audit keys as `id=hex,id=hex` (the last signs new events); when empty, the key file below is used. */
  @IsString()
  auditKeys = '';

  /** JSON key file `{"current": id, "keys": {id: hex}}`; created with a fresh key on first start outside production. */
  @IsString()
  @MinLength(1)
  auditKeyFile = resolve(LOCAL_DIR, 'keys/audit-keys.json');

  /** Cron (UTC) of the scheduled audit receipt; empty turns the schedule off. */
  @IsString()
  auditReceiptCron = '17 * * * *';

  /** PKCS#12 file with the lab's document-signing certificate and key; created self-signed on first start outside production. */
  @IsString()
  @MinLength(1)
  documentSigningP12 = resolve(LOCAL_DIR, 'keys/document-signing.p12');

  @IsString()
  @MinLength(8)
  documentSigningPassphrase: string = DEVELOPMENT_SIGNING_PASSPHRASE;

  /** Whether this process also runs the background job workers. */
  @Transform(toBool)
  @IsBoolean()
  runWorkers = true;

  /**
   * Serves the benchmark's bare-INSERT route (`POST /api/bench/bare-insert`), the baseline signing is measured
   * against over HTTP. Only the benchmark sets it; refused in production.
   */
  @Transform(toBool)
  @IsBoolean()
  benchRoutes = false;
}

const ENVIRONMENT_NAMES: Record<keyof AppConfig, string> = {
  nodeEnv: 'NODE_ENV',
  host: 'API_HOST',
  port: 'API_PORT',
  databaseUrl: 'DATABASE_URL',
  databasePoolMax: 'DATABASE_POOL_MAX',
  jwtSecret: 'JWT_SECRET',
  accessTokenSeconds: 'ACCESS_TOKEN_SECONDS',
  refreshTokenSeconds: 'REFRESH_TOKEN_SECONDS',
  signInLinkSeconds: 'SIGN_IN_LINK_SECONDS',
  passwordResetSeconds: 'PASSWORD_RESET_SECONDS',
  secureCookies: 'SECURE_COOKIES',
  portalUrl: 'PORTAL_URL',
  adminUrl: 'ADMIN_URL',
  smtpHost: 'SMTP_HOST',
  smtpPort: 'SMTP_PORT',
  mailFrom: 'MAIL_FROM',
  stripeSecretKey: 'STRIPE_SECRET_KEY',
  stripeHost: 'STRIPE_HOST',
  stripePort: 'STRIPE_PORT',
  stripeProtocol: 'STRIPE_PROTOCOL',
  stripeWebhookSecret: 'STRIPE_WEBHOOK_SECRET',
  stripePublishableKey: 'STRIPE_PUBLISHABLE_KEY',
  stripeScriptUrl: 'STRIPE_SCRIPT_URL',
  taxReportingThresholdMinor: 'TAX_REPORTING_THRESHOLD_MINOR',
  signInLimit: 'SIGN_IN_LIMIT',
  signInClientLimit: 'SIGN_IN_CLIENT_LIMIT',
  trustProxy: 'TRUST_PROXY',
  refreshGraceSeconds: 'REFRESH_GRACE_SECONDS',
  signInWindowSeconds: 'SIGN_IN_WINDOW_SECONDS',
  jobRetryDelaySeconds: 'JOB_RETRY_DELAY_SECONDS',
  jobRetryDelayMaxSeconds: 'JOB_RETRY_DELAY_MAX_SECONDS',
  payoutSweepCron: 'PAYOUT_SWEEP_CRON',
  payoutStuckAfterSeconds: 'PAYOUT_STUCK_AFTER_SECONDS',
  runWorkers: 'RUN_WORKERS',
  benchRoutes: 'BENCH_ROUTES',
  returnLinkGraceDays: 'RETURN_LINK_GRACE_DAYS',
  returnLinkValidDays: 'RETURN_LINK_VALID_DAYS',
  reminderSweepCron: 'REMINDER_SWEEP_CRON',
  attritionCompactCron: 'ATTRITION_COMPACT_CRON',
  auditKeys: 'AUDIT_KEYS',
  auditKeyFile: 'AUDIT_KEY_FILE',
  auditReceiptCron: 'AUDIT_RECEIPT_CRON',
  documentSigningP12: 'DOCUMENT_SIGNING_P12',
  documentSigningPassphrase: 'DOCUMENT_SIGNING_PASSPHRASE',
};

/** Reads and validates the configuration; throws a message naming every bad variable. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): AppConfig {
  const raw: Record<string, unknown> = {};
  for (const [key, name] of Object.entries(ENVIRONMENT_NAMES)) {
    if (env[name] !== undefined) raw[key] = env[name];
  }
  const production = (raw.nodeEnv ?? 'development') === 'production';
  if (production && raw.secureCookies === undefined) raw.secureCookies = 'true';
  if (raw.signInClientLimit === undefined && raw.signInLimit !== undefined && /^\d+$/.test(String(raw.signInLimit))) {
    raw.signInClientLimit = String(3 * Number(raw.signInLimit));
  }
  const config = plainToInstance(AppConfig, raw);
  const problems = validateSync(config, { forbidUnknownValues: true }).map(
    (error) =>
      `${ENVIRONMENT_NAMES[error.property as keyof AppConfig]}: ${Object.values(error.constraints ?? {}).join('; ')}`,
  );
  if (production) {
    for (const [key, value] of Object.entries(DEVELOPMENT_SECRETS)) {
      if ((config as unknown as Record<string, string>)[key] === value) {
        problems.push(
          `${ENVIRONMENT_NAMES[key as keyof AppConfig]}: the development default may not be used in production`,
        );
      }
    }
    if (config.benchRoutes) problems.push('BENCH_ROUTES: the benchmark routes may not be served in production');
  }
  if (problems.length > 0) throw new Error(`Invalid configuration:\n  ${problems.join('\n  ')}`);
  return config;
}
