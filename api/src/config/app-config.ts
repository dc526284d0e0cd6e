import { plainToInstance, Transform } from 'class-transformer';
import { IsBoolean, IsIn, IsInt, IsString, IsUrl, Max, Min, MinLength, validateSync } from 'class-validator';

/** Secrets that are fine on a developer's machine and must never reach production. */
export const DEVELOPMENT_SECRETS = {
  jwtSecret: 'evenhand-development-jwt-secret-change-me',
  stripeSecretKey: 'sk_test_evenhand_local',
  stripeWebhookSecret: 'whsec_evenhand_dev',
} as const;

const toInt = ({ value }: { value: unknown }) => (value === undefined || value === '' ? undefined : Number(value));
const toBool = ({ value }: { value: unknown }) =>
  value === undefined || value === '' ? undefined : value === true || value === 'true' || value === '1';

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

  /** Sign-in attempts per address and client per window. */
  @Transform(toInt)
  @IsInt()
  @Min(1)
  signInLimit = 10;

  @Transform(toInt)
  @IsInt()
  @Min(1)
  signInWindowSeconds = 15 * 60;

  /** First retry delay of a failed job; later retries back off from it. */
  @Transform(toInt)
  @IsInt()
  @Min(1)
  jobRetryDelaySeconds = 5;

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

  /** Whether this process also runs the background job workers. */
  @Transform(toBool)
  @IsBoolean()
  runWorkers = true;
}

const ENVIRONMENT_NAMES: Record<keyof AppConfig, string> = {
  nodeEnv: 'NODE_ENV',
  host: 'API_HOST',
  port: 'API_PORT',
  databaseUrl: 'DATABASE_URL',
  jwtSecret: 'JWT_SECRET',
  accessTokenSeconds: 'ACCESS_TOKEN_SECONDS',
  refreshTokenSeconds: 'REFRESH_TOKEN_SECONDS',
  signInLinkSeconds: 'SIGN_IN_LINK_SECONDS',
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
  signInWindowSeconds: 'SIGN_IN_WINDOW_SECONDS',
  jobRetryDelaySeconds: 'JOB_RETRY_DELAY_SECONDS',
  runWorkers: 'RUN_WORKERS',
  returnLinkGraceDays: 'RETURN_LINK_GRACE_DAYS',
  returnLinkValidDays: 'RETURN_LINK_VALID_DAYS',
  reminderSweepCron: 'REMINDER_SWEEP_CRON',
};

/** Reads and validates the configuration; throws a message naming every bad variable. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): AppConfig {
  const raw: Record<string, unknown> = {};
  for (const [key, name] of Object.entries(ENVIRONMENT_NAMES)) {
    if (env[name] !== undefined) raw[key] = env[name];
  }
  const production = (raw.nodeEnv ?? 'development') === 'production';
  if (production && raw.secureCookies === undefined) raw.secureCookies = 'true';
  const config = plainToInstance(AppConfig, raw);
  const problems = validateSync(config, { forbidUnknownValues: true }).map(
    (error) => `${ENVIRONMENT_NAMES[error.property as keyof AppConfig]}: ${Object.values(error.constraints ?? {}).join('; ')}`,
  );
  if (production) {
    for (const [key, value] of Object.entries(DEVELOPMENT_SECRETS)) {
      if ((config as unknown as Record<string, string>)[key] === value) {
        problems.push(`${ENVIRONMENT_NAMES[key as keyof AppConfig]}: the development default may not be used in production`);
      }
    }
  }
  if (problems.length > 0) throw new Error(`Invalid configuration:\n  ${problems.join('\n  ')}`);
  return config;
}
