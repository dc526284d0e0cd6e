import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { completionCodeHash, normalizeCompletionCode } from './completion-code';

describe('completion codes', () => {
  it('ignores case and spaces the way people copy codes', () => {
    expect(normalizeCompletionCode(' ab-12 cd ')).toBe('AB-12CD');
    expect(completionCodeHash('s1', 'ab-12 cd')).toBe(completionCodeHash('s1', 'AB-12CD'));
  });

  it('differs per step', () => {
    expect(completionCodeHash('s1', 'CODE')).not.toBe(completionCodeHash('s2', 'CODE'));
  });

  it('is the SHA-256 that sha256sum computes over "<step id>:<code>"', () => {
    // Outside check: coreutils sha256sum (FIPS 180-4).
    const reference = execFileSync('sha256sum', { input: 's1:WAY-42' }).toString().split(' ')[0];
    expect(completionCodeHash('s1', 'way-42')).toBe(reference);
  });
});
