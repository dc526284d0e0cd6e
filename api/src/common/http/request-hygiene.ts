import type { FieldError } from '../errors/error-codes';

/** Deepest nesting a JSON body may have; our deepest real body (screening rules in a list in a list) needs 5. */
export const MAX_JSON_DEPTH = 32;

/** Largest JSON body; the biggest real one is a consent form's Markdown (at most 200,000 characters). */
export const MAX_JSON_BYTES = 1024 * 1024;

// NUL, a high surrogate not followed by a low one, or a low one not preceded by a high one.
const UNSTORABLE = /\u0000|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** PostgreSQL's text and jsonb cannot hold NUL, and UTF-8 has no encoding for an unpaired surrogate. */
export function isUnstorableText(text: string): boolean {
  return UNSTORABLE.test(text);
}

export const UNSTORABLE_TEXT_MESSAGE = 'must not contain NUL characters or unpaired UTF-16 surrogates';

/**
 * Checks a parsed JSON value (or a parsed query string) without recursion, so no nesting can overflow the stack:
 * refuses nesting deeper than `maxDepth` (reporting the path where it goes too deep, once) and every string or key
 * that cannot be stored. Paths use the validation pipe's naming: `values.studyPurpose`, `steps.0.title`.
 */
export function inspectParsedInput(value: unknown, maxDepth = MAX_JSON_DEPTH, root = ''): FieldError[] {
  const errors: FieldError[] = [];
  const stack: Array<{ value: unknown; path: string; depth: number }> = [{ value, path: root, depth: 0 }];
  while (stack.length > 0) {
    const { value: current, path, depth } = stack.pop()!;
    if (typeof current === 'string') {
      if (isUnstorableText(current)) errors.push({ field: path || 'body', message: UNSTORABLE_TEXT_MESSAGE });
      continue;
    }
    if (current === null || typeof current !== 'object') continue;
    if (depth >= maxDepth) {
      errors.push({ field: path || 'body', message: `nests deeper than ${maxDepth} levels` });
      // One report is enough; nothing below this point is read.
      return errors;
    }
    const entries = Array.isArray(current)
      ? current.map((item, index) => [String(index), item] as const)
      : Object.entries(current);
    for (let i = entries.length - 1; i >= 0; i--) {
      const [key, item] = entries[i];
      const childPath = path ? `${path}.${key}` : key;
      if (!Array.isArray(current) && isUnstorableText(key)) {
        errors.push({
          field: path || 'body',
          message: 'has a key with a NUL character or an unpaired UTF-16 surrogate',
        });
        continue;
      }
      stack.push({ value: item, path: childPath, depth: depth + 1 });
    }
  }
  return errors;
}
