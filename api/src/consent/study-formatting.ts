/** How amounts, durations and signing times are written in forms, e-mails and the signed PDF. */
import { ConsentErrorCode, consentFail } from './consent-error';

/** Building a number format is costly (receipts format thousands of amounts), so each is built once. */
const moneyFormats = new Map<string, Intl.NumberFormat>();

/** Minor units (cents) as a currency amount, with the currency's own number of decimals as Intl knows it. */
export function formatMoney(amountMinor: number, currency: string, locale = 'en-US', field = 'amountMinor'): string {
  if (!Number.isSafeInteger(amountMinor))
    consentFail(
      ConsentErrorCode.InvalidFields,
      field,
      `must be a whole number of minor units, got ${String(amountMinor)}`,
    );
  const key = `${locale}|${currency}`;
  let format = moneyFormats.get(key);
  if (!format) {
    try {
      format = new Intl.NumberFormat(locale, { style: 'currency', currency });
    } catch {
      consentFail(
        ConsentErrorCode.InvalidFields,
        'currency',
        `must be an ISO 4217 code such as USD, got ${JSON.stringify(currency)}`,
      );
    }
    moneyFormats.set(key, format);
  }
  const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
  return format.format(amountMinor / 10 ** digits);
}

export function formatDuration(minutes: number): string {
  const hours = Math.floor(minutes / 60);
  const rest = minutes % 60;
  const parts = [];
  if (hours > 0) parts.push(`${hours} ${hours === 1 ? 'hour' : 'hours'}`);
  if (rest > 0 || hours === 0) parts.push(`${rest} ${rest === 1 ? 'minute' : 'minutes'}`);
  return parts.join(' ');
}

export interface SigningTime {
  /** ISO 8601 in UTC, e.g. 2025-03-14T09:26:53.000Z. */
  iso: string;
  /** e.g. 2025-03-14 09:26:53 UTC */
  utc: string;
  timeZone: string;
  /** Wall-clock time in that zone, e.g. 2025-03-14 10:26:53 */
  local: string;
  /** Offset from UTC in that zone at that instant, e.g. UTC+01:00 */
  offset: string;
  /** One line for people: 2025-03-14 09:26:53 UTC (10:26:53 in Europe/Berlin, UTC+01:00) */
  text: string;
}

const pad = (n: number) => String(n).padStart(2, '0');

/** The instant in UTC and in the signer's time zone, with the offset stated (the IANA database through Intl). */
export function describeSigningTime(at: Date, timeZone = 'UTC', field = 'signedAt'): SigningTime {
  if (!(at instanceof Date) || Number.isNaN(at.getTime()))
    consentFail(ConsentErrorCode.InvalidFields, field, 'must be a valid date and time');
  let parts: Intl.DateTimeFormatPart[];
  try {
    parts = new Intl.DateTimeFormat('en-US', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
      timeZoneName: 'longOffset',
    }).formatToParts(at);
  } catch {
    consentFail(
      ConsentErrorCode.InvalidFields,
      'timeZone',
      `must be an IANA time zone such as Europe/Berlin, got ${JSON.stringify(timeZone)}`,
    );
  }
  const part = (type: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === type)?.value ?? '';
  const offsetName = part('timeZoneName'); // "GMT+01:00", or "GMT" at zero offset
  const offset = offsetName === 'GMT' ? 'UTC+00:00' : offsetName.replace('GMT', 'UTC');
  const localTime = `${part('hour')}:${part('minute')}:${part('second')}`;
  const local = `${part('year')}-${part('month')}-${part('day')} ${localTime}`;
  const utc = `${at.getUTCFullYear()}-${pad(at.getUTCMonth() + 1)}-${pad(at.getUTCDate())} ${pad(at.getUTCHours())}:${pad(at.getUTCMinutes())}:${pad(at.getUTCSeconds())} UTC`;
  const localDate = local.slice(0, 10);
  const shownLocal = localDate === utc.slice(0, 10) ? localTime : local;
  // The zone as the signer's browser named it (Intl would rename e.g. Asia/Kolkata to its old alias Asia/Calcutta).
  const zone = timeZone.trim();
  const isUtc = offset === 'UTC+00:00' && /^(etc\/)?(utc|uct|gmt|zulu|universal)$/i.test(zone);
  const text = isUtc ? utc : `${utc} (${shownLocal} in ${zone}, ${offset})`;
  return { iso: at.toISOString(), utc, timeZone: isUtc ? 'UTC' : zone, local, offset, text };
}
