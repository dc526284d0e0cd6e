/**
 * The commitment shown from the moment a study opens, so the sealed seed can be checked once revealed.
 *
 * Byte layout hashed with SHA-256 (result shown as 64 lowercase hex characters):
 *
 *   <seed as 64 lowercase hex ASCII characters> 0x0A <canonical JSON of the scheme parameters, UTF-8>
 *
 * with no trailing newline. The parameters are the normalized ones that are stored (defaults filled in,
 * see parseSchemeParameters). Canonical JSON: object keys sorted by UTF-16 code units, no whitespace,
 * array order kept, strings and numbers written as JavaScript's JSON.stringify writes them — which is
 * RFC 8785 (JCS) for these values. An auditor can recompute it in a shell:
 *
 *   printf '%s\n%s' "$SEED" "$CANONICAL_JSON" | sha256sum
 */
import { createHash } from 'node:crypto';
import { fail, RandomizationErrorCode } from './randomization-error';
import { parseSchemeParameters, SchemeParameters } from './scheme-parameters';
import { normalizeSeed } from './seeded-stream';

export function canonicalJson(value: unknown, path = 'parameters'): string {
  if (value === null) return 'null';
  switch (typeof value) {
    case 'boolean':
    case 'string':
      return JSON.stringify(value);
    case 'number':
      if (!Number.isFinite(value)) fail(RandomizationErrorCode.InvalidInput, path, 'must be a finite number');
      return JSON.stringify(value);
    case 'object': {
      if (Array.isArray(value)) {
        return `[${value.map((item, i) => canonicalJson(item, `${path}[${i}]`)).join(',')}]`;
      }
      const record = value as Record<string, unknown>;
      const members = Object.keys(record)
        .filter((key) => record[key] !== undefined)
        .sort()
        .map((key) => `${JSON.stringify(key)}:${canonicalJson(record[key], `${path}.${key}`)}`);
      return `{${members.join(',')}}`;
    }
    default:
      return fail(RandomizationErrorCode.InvalidInput, path, `cannot be written as JSON (${typeof value})`);
  }
}

/** The exact bytes the commitment hashes. */
export function commitmentPayload(seed: string, parameters: SchemeParameters): Buffer {
  const normalized = parseSchemeParameters(parameters);
  return Buffer.from(`${normalizeSeed(seed)}\n${canonicalJson(normalized)}`, 'utf8');
}

export function computeCommitment(seed: string, parameters: SchemeParameters): string {
  return createHash('sha256').update(commitmentPayload(seed, parameters)).digest('hex');
}

/** True when the revealed seed and the stored parameters hash to the commitment that was shown. */
export function verifyCommitment(seed: string, parameters: SchemeParameters, commitment: string): boolean {
  return computeCommitment(seed, parameters) === commitment.trim().toLowerCase();
}
