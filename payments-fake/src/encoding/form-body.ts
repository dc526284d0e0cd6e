// Decodes the provider's request encoding: application/x-www-form-urlencoded pairs whose keys
// use bracket notation for nesting, e.g. `metadata[study]=s1`, `capabilities[transfers][requested]=true`,
// lists as `expand[]=destination` or `expand[0]=destination`
// (https://docs.stripe.com/api/expanding_objects, https://docs.stripe.com/api/metadata).
// Pure: no framework imports.

export type FormValue = string | FormValue[] | FormObject;
export interface FormObject {
  [key: string]: FormValue;
}

export class FormBodyError extends Error {
  constructor(
    message: string,
    readonly key: string,
  ) {
    super(message);
    this.name = 'FormBodyError';
  }
}

const FORBIDDEN_SEGMENTS = new Set(['__proto__', 'prototype', 'constructor']);
const MAX_DEPTH = 8;

/** Splits `a[b][c]` into ['a', 'b', 'c'] and `a[]` into ['a', '']. */
export function splitBracketKey(key: string): string[] {
  const open = key.indexOf('[');
  if (open === -1) return [key];
  if (open === 0) throw new FormBodyError(`the key '${key}' has no name before its brackets`, key);
  const segments = [key.slice(0, open)];
  let rest = key.slice(open);
  while (rest.length > 0) {
    const match = /^\[([^[\]]*)\]/.exec(rest);
    if (!match) throw new FormBodyError(`the key '${key}' has unbalanced brackets`, key);
    segments.push(match[1] ?? '');
    rest = rest.slice(match[0].length);
  }
  return segments;
}

function decodeComponent(text: string): string {
  // In form encoding '+' stands for a space (WHATWG URL standard, application/x-www-form-urlencoded).
  try {
    return decodeURIComponent(text.replace(/\+/g, ' '));
  } catch {
    throw new FormBodyError(`'${text}' is not valid percent-encoding`, text);
  }
}

function isIndex(segment: string): boolean {
  return segment === '' || /^(0|[1-9]\d{0,3})$/.test(segment);
}

function assignPath(root: FormObject, segments: string[], value: string, key: string): void {
  let container: FormObject | FormValue[] = root;
  for (let i = 0; i < segments.length; i++) {
    const segment = segments[i] as string;
    if (FORBIDDEN_SEGMENTS.has(segment)) throw new FormBodyError(`the key '${key}' uses a reserved name`, key);
    const last = i === segments.length - 1;
    const nextSegment = segments[i + 1];

    if (Array.isArray(container)) {
      if (!isIndex(segment)) throw new FormBodyError(`the key '${key}' mixes a list with named keys`, key);
      const position: number = segment === '' ? container.length : Number(segment);
      // Sparse indices (a[0], a[5]) keep their order and close the gaps.
      if (last) {
        if (segment === '' || position >= container.length) container.push(value);
        else container[position] = value;
        return;
      }
      const existing: FormValue | undefined = segment === '' ? undefined : container[position];
      const child: FormValue = existing ?? (isIndex(nextSegment as string) ? [] : {});
      if (typeof child === 'string') throw new FormBodyError(`the key '${key}' nests under a plain value`, key);
      if (existing === undefined) {
        if (segment === '' || position >= container.length) container.push(child);
        else container[position] = child;
      }
      container = child;
      continue;
    }

    if (last) {
      const existing = container[segment];
      if (existing !== undefined && typeof existing !== 'string') {
        throw new FormBodyError(`the key '${key}' is sent both as a value and as a hash`, key);
      }
      container[segment] = value; // a repeated plain key keeps the last value
      return;
    }
    let child: FormValue | undefined = container[segment];
    if (child === undefined) {
      child = isIndex(nextSegment as string) ? [] : {};
      container[segment] = child;
    }
    if (typeof child === 'string')
      throw new FormBodyError(`the key '${key}' is sent both as a value and as a hash`, key);
    if (Array.isArray(child) && !isIndex(nextSegment as string)) {
      // `a[0]=x&a[name]=y`: the list turns out to be a hash keyed by its indices.
      const asObject: FormObject = {};
      child.forEach((entry, index) => {
        asObject[String(index)] = entry;
      });
      container[segment] = asObject;
      child = asObject;
    }
    container = child;
  }
}

/** Decodes a form-encoded body or query string into nested hashes and lists of strings. */
export function parseFormBody(encoded: string): FormObject {
  const root: FormObject = {};
  const text = encoded.startsWith('?') ? encoded.slice(1) : encoded;
  if (text.trim() === '') return root;
  for (const pair of text.split('&')) {
    if (pair === '') continue;
    const equals = pair.indexOf('=');
    const rawKey = equals === -1 ? pair : pair.slice(0, equals);
    const rawValue = equals === -1 ? '' : pair.slice(equals + 1);
    const key = decodeComponent(rawKey);
    if (key === '') throw new FormBodyError('a pair has an empty key', key);
    const segments = splitBracketKey(key);
    if (segments.length > MAX_DEPTH) throw new FormBodyError(`the key '${key}' is nested too deeply`, key);
    assignPath(root, segments, decodeComponent(rawValue), key);
  }
  return root;
}

/** The bracket name of a nested parameter, as the provider writes it in `param`: `a[b][c]`. */
export function paramName(path: readonly string[]): string {
  const [head, ...rest] = path;
  return (head ?? '') + rest.map((segment) => `[${segment}]`).join('');
}
