import { describe, expect, it } from 'vitest';
import { inspectParsedInput, isUnstorableText } from './request-hygiene';

describe('isUnstorableText', () => {
  it('finds NUL and unpaired surrogates but not paired ones', () => {
    expect(isUnstorableText('plain text')).toBe(false);
    expect(isUnstorableText('emoji \ud83d\ude00 fine')).toBe(false);
    expect(isUnstorableText('a\u0000b')).toBe(true);
    expect(isUnstorableText('lone high \ud83d')).toBe(true);
    expect(isUnstorableText('\ud83d at start')).toBe(true);
    expect(isUnstorableText('lone low \ude00')).toBe(true);
    expect(isUnstorableText('\ude00\ud83d reversed')).toBe(true);
  });
});

describe('inspectParsedInput', () => {
  it('names every unstorable string and key by its path', () => {
    const errors = inspectParsedInput({
      title: 'ok',
      values: { name: 'x\u0000', list: ['fine', '\ud800'] },
      ['k\u0000']: 1,
    });
    expect(errors.map((e) => e.field)).toEqual(['body', 'values.name', 'values.list.1']);
  });

  it('refuses nesting past the limit once, without recursing', () => {
    let deep: unknown = 1;
    for (let i = 0; i < 200_000; i++) deep = { a: [deep] };
    const errors = inspectParsedInput({ email: deep }, 32);
    expect(errors).toHaveLength(1);
    expect(errors[0].field.startsWith('email.a.0.a')).toBe(true);
    expect(errors[0].message).toBe('nests deeper than 32 levels');
  });

  it('accepts nesting up to the limit', () => {
    let deep: unknown = 'leaf';
    for (let i = 0; i < 32; i++) deep = { a: deep };
    expect(inspectParsedInput(deep, 32)).toEqual([]);
    expect(inspectParsedInput({ a: deep }, 32)).toHaveLength(1);
  });

  it('prefixes a root name for query strings', () => {
    expect(inspectParsedInput({ search: 'a\u0000' }, 4)).toEqual([{ field: 'search', message: expect.any(String) }]);
  });
});
