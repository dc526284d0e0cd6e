import { describe, expect, it } from 'vitest';
import { checkAssignmentSchemeRequest, checkSchemeParameters, checkSchemeSettings } from './assignment';

describe('checkAssignmentSchemeRequest', () => {
  it('accepts each method with only its own settings', () => {
    expect(checkAssignmentSchemeRequest({ method: 'simple' })).toEqual({ ok: true, value: { method: 'simple' } });
    expect(checkAssignmentSchemeRequest({ method: 'permuted-blocks', blockSizes: [4, 8] })).toEqual({
      ok: true,
      value: { method: 'permuted-blocks', blockSizes: [4, 8] },
    });
    expect(checkAssignmentSchemeRequest({ method: 'minimization', measure: 'variance', coinProbability: 0.8 }).ok).toBe(
      true,
    );
    expect(checkAssignmentSchemeRequest({ method: 'matched-pairs', pretestKey: 'pretest' }).ok).toBe(true);
    expect(checkAssignmentSchemeRequest({ method: 'williams', squaresPerBlock: [1, 2], stratify: true }).ok).toBe(true);
  });

  it('refuses a body that is not an object, and an unknown method, naming the field', () => {
    expect(checkAssignmentSchemeRequest(['simple'])).toEqual({
      ok: false,
      errors: [{ field: 'body', message: 'must be an object with a method' }],
    });
    expect(checkAssignmentSchemeRequest({ method: 'coin-toss' })).toEqual({
      ok: false,
      errors: [{ field: 'method', message: expect.stringMatching(/^must be one of simple, .* \(got "coin-toss"\)$/) }],
    });
  });

  it('refuses a setting of another method, and a bad value of the method’s own', () => {
    expect(checkAssignmentSchemeRequest({ method: 'simple', blockSizes: [2] })).toEqual({
      ok: false,
      errors: [{ field: 'blockSizes', message: 'is not a setting of the simple scheme' }],
    });
    expect(checkAssignmentSchemeRequest({ method: 'permuted-blocks', blockSizes: [] })).toEqual({
      ok: false,
      errors: [{ field: 'blockSizes', message: 'must list at least one allowed block size' }],
    });
    expect(checkAssignmentSchemeRequest({ method: 'minimization', coinProbability: 2 })).toMatchObject({
      ok: false,
      errors: [{ field: 'coinProbability' }],
    });
    expect(checkAssignmentSchemeRequest({ method: 'matched-pairs', pretestKey: 'pre test!' })).toEqual({
      ok: false,
      errors: [{ field: 'pretestKey', message: 'must name the numeric pretest factor' }],
    });
    expect(checkAssignmentSchemeRequest({ method: 'latin-square', stratify: 'yes' })).toEqual({
      ok: false,
      errors: [{ field: 'stratify', message: 'must be true or false' }],
    });
  });
});

describe('checkSchemeSettings', () => {
  it('checks settings for a method already chosen, under the field it came in', () => {
    expect(checkSchemeSettings('minimization', { measure: 'range' })).toEqual({
      ok: true,
      value: { measure: 'range' },
    });
    expect(checkSchemeSettings('minimization', undefined)).toEqual({ ok: true, value: {} });
    expect(checkSchemeSettings('minimization', { measure: 'max' })).toEqual({
      ok: false,
      errors: [{ field: 'settings.measure', message: 'must be range or variance (got "max")' }],
    });
    expect(checkSchemeSettings('simple', 'fast')).toEqual({
      ok: false,
      errors: [{ field: 'settings', message: 'must be an object of settings' }],
    });
  });
});

describe('checkSchemeParameters', () => {
  it('accepts full parameters and fills in defaults', () => {
    expect(checkSchemeParameters({ method: 'counterbalanced', conditionIds: ['a', 'b'] })).toEqual({
      ok: true,
      value: { method: 'counterbalanced', conditionIds: ['a', 'b'], squaresPerBlock: [1], factors: [] },
    });
  });

  it('refuses a value that is not parameters, an unknown method and an empty design, naming the field', () => {
    expect(checkSchemeParameters(null)).toEqual({
      ok: false,
      errors: [{ field: 'parameters', message: 'must be an object with a method and its settings' }],
    });
    expect(checkSchemeParameters({ method: 'lottery' })).toMatchObject({ ok: false, errors: [{ field: 'method' }] });
    expect(checkSchemeParameters({ method: 'simple', conditions: [] })).toEqual({
      ok: false,
      errors: [{ field: 'conditions', message: 'is empty; at least two conditions are needed' }],
    });
  });
});
