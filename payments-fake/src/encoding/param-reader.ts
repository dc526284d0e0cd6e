// Typed reading of decoded form parameters, with the provider's parameter errors
// (https://docs.stripe.com/api/errors, https://docs.stripe.com/error-codes) and its rule that
// any parameter an endpoint does not know is refused (`parameter_unknown`).
// Pure: no framework imports.

import { providerErrors } from '../errors/provider-error';
import { type FormObject, type FormValue, paramName } from './form-body';

/** A change to a metadata hash as sent: `metadata=` clears it, `metadata[k]=` removes one key. */
export interface MetadataChange {
  clearAll: boolean;
  set: Record<string, string>;
  unset: string[];
}

// Limits from https://docs.stripe.com/metadata: 50 keys, key names up to 40 characters,
// values up to 500 characters.
export const METADATA_LIMITS = { keys: 50, keyLength: 40, valueLength: 500 } as const;

export function applyMetadataChange(
  current: Record<string, string>,
  change: MetadataChange | undefined,
  param = 'metadata',
): Record<string, string> {
  if (!change) return { ...current };
  const next: Record<string, string> = change.clearAll ? {} : { ...current };
  for (const key of change.unset) delete next[key];
  Object.assign(next, change.set);
  if (Object.keys(next).length > METADATA_LIMITS.keys) {
    throw providerErrors.metadataProblem(param, `Metadata can have at most ${METADATA_LIMITS.keys} keys.`);
  }
  return next;
}

interface RequiredOption {
  required?: boolean;
}

const EMAIL_PATTERN = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;

export class ParamReader {
  private readonly used = new Set<string>();
  private readonly children: ParamReader[] = [];

  constructor(
    private readonly source: FormObject,
    private readonly path: readonly string[] = [],
  ) {}

  static empty(): ParamReader {
    return new ParamReader({});
  }

  /** Every decoded parameter, for comparing idempotent retries. */
  raw(): FormObject {
    return this.source;
  }

  has(name: string): boolean {
    return this.source[name] !== undefined;
  }

  nameOf(name: string): string {
    return paramName([...this.path, name]);
  }

  private take(name: string): FormValue | undefined {
    this.used.add(name);
    return this.source[name];
  }

  private takeText(name: string, options: RequiredOption): string | undefined {
    const value = this.take(name);
    if (value === undefined) {
      if (options.required) throw providerErrors.parameterMissing(this.nameOf(name));
      return undefined;
    }
    if (typeof value !== 'string') throw providerErrors.invalidString(this.nameOf(name));
    return value;
  }

  /** A text value; an empty string is refused because it would ask to unset a value that cannot be unset. */
  string(name: string, options: RequiredOption & { maxLength?: number } = {}): string | undefined {
    const value = this.takeText(name, options);
    if (value === undefined) return undefined;
    if (value === '') throw providerErrors.parameterEmpty(this.nameOf(name));
    if (options.maxLength !== undefined && value.length > options.maxLength) {
      throw providerErrors.stringTooLong(this.nameOf(name), options.maxLength);
    }
    return value;
  }

  /** A text value that may be unset: an empty string gives null. */
  nullableString(name: string, options: { maxLength?: number } = {}): string | null | undefined {
    const value = this.takeText(name, {});
    if (value === undefined) return undefined;
    if (value === '') return null;
    if (options.maxLength !== undefined && value.length > options.maxLength) {
      throw providerErrors.stringTooLong(this.nameOf(name), options.maxLength);
    }
    return value;
  }

  integer(name: string, options: RequiredOption & { min?: number; max?: number } = {}): number | undefined {
    const value = this.takeText(name, options);
    if (value === undefined) return undefined;
    if (value === '') throw providerErrors.parameterEmpty(this.nameOf(name));
    if (!/^-?\d+$/.test(value) || !Number.isSafeInteger(Number(value))) {
      throw providerErrors.invalidInteger(this.nameOf(name), value);
    }
    const number = Number(value);
    if (options.min !== undefined && number < options.min)
      throw providerErrors.integerTooSmall(this.nameOf(name), options.min);
    if (options.max !== undefined && number > options.max)
      throw providerErrors.integerTooLarge(this.nameOf(name), options.max);
    return number;
  }

  boolean(name: string, options: RequiredOption = {}): boolean | undefined {
    const value = this.takeText(name, options);
    if (value === undefined) return undefined;
    if (value === 'true') return true;
    if (value === 'false') return false;
    throw providerErrors.invalidBoolean(this.nameOf(name), value);
  }

  oneOf<T extends string>(name: string, allowed: readonly T[], options: RequiredOption = {}): T | undefined {
    const value = this.string(name, options);
    if (value === undefined) return undefined;
    if (!(allowed as readonly string[]).includes(value)) throw providerErrors.invalidEnum(this.nameOf(name), allowed);
    return value as T;
  }

  /** Three-letter ISO 4217 code; the provider accepts any case and answers in lower case. */
  currency(name: string, options: RequiredOption = {}): string | undefined {
    const value = this.string(name, options);
    if (value === undefined) return undefined;
    const lower = value.toLowerCase();
    if (!/^[a-z]{3}$/.test(lower)) throw providerErrors.invalidCurrency(this.nameOf(name), value);
    return lower;
  }

  /** Two-letter ISO 3166-1 alpha-2 code, answered in upper case. */
  country(name: string, options: RequiredOption = {}): string | undefined {
    const value = this.string(name, options);
    if (value === undefined) return undefined;
    const upper = value.toUpperCase();
    if (!/^[A-Z]{2}$/.test(upper)) throw providerErrors.invalidCountry(this.nameOf(name), value);
    return upper;
  }

  email(name: string, options: RequiredOption = {}): string | undefined {
    const value = this.string(name, { ...options, maxLength: 800 });
    if (value === undefined) return undefined;
    if (!EMAIL_PATTERN.test(value)) throw providerErrors.invalidEmail(this.nameOf(name), value);
    return value;
  }

  /** An absolute http(s) URL, as required for redirect targets. */
  url(name: string, options: RequiredOption = {}): string | undefined {
    const value = this.string(name, { ...options, maxLength: 5000 });
    if (value === undefined) return undefined;
    let parsed: URL;
    try {
      parsed = new URL(value);
    } catch {
      throw providerErrors.invalidUrl(this.nameOf(name), value);
    }
    if (parsed.protocol !== 'http:' && parsed.protocol !== 'https:')
      throw providerErrors.invalidUrl(this.nameOf(name), value);
    return value;
  }

  stringList(name: string, options: RequiredOption = {}): string[] | undefined {
    const value = this.take(name);
    if (value === undefined) {
      if (options.required) throw providerErrors.parameterMissing(this.nameOf(name));
      return undefined;
    }
    if (!Array.isArray(value)) throw providerErrors.invalidArray(this.nameOf(name));
    return value.map((entry, index) => {
      if (typeof entry !== 'string') throw providerErrors.invalidString(paramName([...this.path, name, String(index)]));
      return entry;
    });
  }

  /** A nested hash; an empty string (asking to unset the whole hash) gives null. */
  hash(name: string, options: RequiredOption = {}): ParamReader | null | undefined {
    const value = this.take(name);
    if (value === undefined) {
      if (options.required) throw providerErrors.parameterMissing(this.nameOf(name));
      return undefined;
    }
    if (value === '') return null;
    if (typeof value === 'string' || Array.isArray(value)) throw providerErrors.invalidObject(this.nameOf(name));
    const child = new ParamReader(value, [...this.path, name]);
    this.children.push(child);
    return child;
  }

  /** Keys of a nested hash whose keys are chosen by the caller (e.g. capability names). */
  keys(): string[] {
    return Object.keys(this.source);
  }

  metadata(name = 'metadata'): MetadataChange | undefined {
    const value = this.take(name);
    if (value === undefined) return undefined;
    const param = this.nameOf(name);
    if (value === '') return { clearAll: true, set: {}, unset: [] };
    if (typeof value === 'string' || Array.isArray(value)) throw providerErrors.invalidObject(param);
    const change: MetadataChange = { clearAll: false, set: {}, unset: [] };
    const entries = Object.entries(value);
    if (entries.length > METADATA_LIMITS.keys) {
      throw providerErrors.metadataProblem(param, `Metadata can have at most ${METADATA_LIMITS.keys} keys.`);
    }
    for (const [key, entry] of entries) {
      const entryParam = paramName([...this.path, name, key]);
      if (typeof entry !== 'string')
        throw providerErrors.metadataProblem(entryParam, `Metadata values must be strings (${entryParam}).`);
      if (key.length > METADATA_LIMITS.keyLength) {
        throw providerErrors.metadataProblem(
          entryParam,
          `Metadata keys can be at most ${METADATA_LIMITS.keyLength} characters long.`,
        );
      }
      if (entry.length > METADATA_LIMITS.valueLength) {
        throw providerErrors.metadataProblem(
          entryParam,
          `Metadata values can be at most ${METADATA_LIMITS.valueLength} characters long.`,
        );
      }
      if (entry === '') change.unset.push(key);
      else change.set[key] = entry;
    }
    return change;
  }

  /** Refuses the first parameter that no reader asked for, here or in a nested hash. */
  finish(): void {
    for (const key of Object.keys(this.source)) {
      if (!this.used.has(key)) throw providerErrors.parameterUnknown(this.nameOf(key));
    }
    for (const child of this.children) child.finish();
  }
}
