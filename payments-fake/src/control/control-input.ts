// Reading the JSON bodies of the stand-in's own control routes. Bad input names the field.
// Pure: no framework imports.

export class ControlInputError extends Error {
  constructor(
    readonly field: string,
    problem: string,
  ) {
    super(`${field}: ${problem}`);
    this.name = 'ControlInputError';
  }
}

export type JsonObject = Record<string, unknown>;

export function asObject(value: unknown, field: string): JsonObject {
  if (value === null || typeof value !== 'object' || Array.isArray(value)) {
    throw new ControlInputError(field, 'must be a JSON object');
  }
  return value as JsonObject;
}

export function refuseUnknownFields(body: JsonObject, known: readonly string[], prefix = ''): void {
  for (const key of Object.keys(body)) {
    if (!known.includes(key))
      throw new ControlInputError(prefix + key, `is not a known field (known: ${known.join(', ')})`);
  }
}

export function readInteger(
  body: JsonObject,
  field: string,
  options: { required?: boolean; min?: number; max?: number; label?: string } = {},
): number | undefined {
  const label = options.label ?? field;
  const value = body[field];
  if (value === undefined) {
    if (options.required) throw new ControlInputError(label, 'is required');
    return undefined;
  }
  if (typeof value !== 'number' || !Number.isSafeInteger(value))
    throw new ControlInputError(label, 'must be an integer');
  if (options.min !== undefined && value < options.min)
    throw new ControlInputError(label, `must be at least ${options.min}`);
  if (options.max !== undefined && value > options.max)
    throw new ControlInputError(label, `must be at most ${options.max}`);
  return value;
}

export function readBoolean(body: JsonObject, field: string, label = field): boolean | undefined {
  const value = body[field];
  if (value === undefined) return undefined;
  if (typeof value !== 'boolean') throw new ControlInputError(label, 'must be true or false');
  return value;
}

export function readString(
  body: JsonObject,
  field: string,
  options: { required?: boolean; pattern?: RegExp; patternText?: string; label?: string } = {},
): string | undefined {
  const label = options.label ?? field;
  const value = body[field];
  if (value === undefined) {
    if (options.required) throw new ControlInputError(label, 'is required');
    return undefined;
  }
  if (typeof value !== 'string' || value === '') throw new ControlInputError(label, 'must be a non-empty string');
  if (options.pattern && !options.pattern.test(value)) {
    throw new ControlInputError(label, `must be ${options.patternText ?? `of the form ${options.pattern}`}`);
  }
  return value;
}
