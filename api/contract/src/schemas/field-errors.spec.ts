import { z } from 'zod';
import { describe, expect, it } from 'vitest';
import { checkWith, describeValue, fieldErrorsOf, fieldPath } from './field-errors';

const person = z.strictObject(
  {
    name: z.string({ error: '{field} must be text' }),
    tags: z.array(z.string({ error: 'must be text' })).optional(),
  },
  { error: (issue) => (issue.code === 'unrecognized_keys' ? '{field} is not allowed' : 'must be an object') },
);

describe('fieldPath', () => {
  it('writes zod paths the way the api names fields', () => {
    expect(fieldPath(['conditions', 1, 'weight'])).toBe('conditions[1].weight');
    expect(fieldPath([0, 'id'], 'factors')).toBe('factors[0].id');
    expect(fieldPath([])).toBe('');
  });
});

describe('checkWith', () => {
  it('answers the parsed value when the input is valid', () => {
    expect(checkWith(person, { name: 'Ada', tags: ['x'] }, 'body')).toEqual({
      ok: true,
      value: { name: 'Ada', tags: ['x'] },
    });
  });

  it('names each wrong field, with {field} filled in', () => {
    expect(checkWith(person, { name: 3, tags: ['ok', 4] }, 'body')).toEqual({
      ok: false,
      errors: [
        { field: 'name', message: 'name must be text' },
        { field: 'tags[1]', message: 'must be text' },
      ],
    });
  });

  it('puts an unknown key on that key, and a wrong whole value on the name given for it', () => {
    expect(checkWith(person, { name: 'Ada', nickname: 'A' }, 'body')).toEqual({
      ok: false,
      errors: [{ field: 'nickname', message: 'nickname is not allowed' }],
    });
    expect(checkWith(person, 'Ada', 'body')).toEqual({
      ok: false,
      errors: [{ field: 'body', message: 'must be an object' }],
    });
  });
});

describe('fieldErrorsOf', () => {
  it('reports a field and message once even when zod finds it twice', () => {
    const twice = z.string().superRefine((_value, ctx) => {
      ctx.addIssue({ code: 'custom', message: 'is wrong' });
      ctx.addIssue({ code: 'custom', message: 'is wrong' });
    });
    const result = twice.safeParse('x');
    expect(result.success).toBe(false);
    if (!result.success)
      expect(fieldErrorsOf(result.error, 'value')).toEqual([{ field: 'value', message: 'is wrong' }]);
  });
});

describe('describeValue', () => {
  it('quotes text, names a missing value and writes the rest as JSON', () => {
    expect(describeValue('abc')).toBe('"abc"');
    expect(describeValue(undefined)).toBe('nothing');
    expect(describeValue(1.5)).toBe('1.5');
    expect(describeValue([1, 2])).toBe('[1,2]');
    expect(describeValue(null)).toBe('null');
  });
});
