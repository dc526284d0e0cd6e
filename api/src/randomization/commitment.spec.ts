import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { canonicalJson, commitmentPayload, computeCommitment, verifyCommitment } from './commitment';
import { SchemeParameters } from './scheme-parameters';

const SEED = 'C0FFEE00112233445566778899AABBCCDDEEFF0123456789ABCDEF0123456789';

const parameters: SchemeParameters = {
  method: 'stratified-blocks',
  conditions: [
    { conditionId: 'audio', weight: 1 },
    { conditionId: 'map', weight: 2 },
  ],
  blockSizes: [3, 6],
  factors: [
    { id: 'sense', kind: 'numeric', cutPoints: [3.5] },
    { id: 'site', kind: 'categorical', categories: ['Nord', 'Süd'] },
  ],
};

// Written out by hand from the documented rules (keys sorted, no whitespace), not produced by canonicalJson.
const CANONICAL_BY_HAND =
  '{"blockSizes":[3,6],"conditions":[{"conditionId":"audio","weight":1},{"conditionId":"map","weight":2}],' +
  '"factors":[{"cutPoints":[3.5],"id":"sense","kind":"numeric"},{"categories":["Nord","Süd"],"id":"site","kind":"categorical"}],' +
  '"method":"stratified-blocks"}';

describe('commitment', () => {
  it('writes canonical JSON with sorted keys and no whitespace', () => {
    expect(canonicalJson(parameters)).toBe(CANONICAL_BY_HAND);
    expect(canonicalJson({ b: [2, { d: 1, c: null }], a: 'x"y', skipped: undefined })).toBe(
      '{"a":"x\\"y","b":[2,{"c":null,"d":1}]}',
    );
    expect(() => canonicalJson({ a: Number.NaN })).toThrow(/parameters\.a/);
  });

  it('equals sha256sum of the documented byte layout, computed by the shell command auditors are given', () => {
    // Outside check: GNU coreutils sha256sum over `printf '%s\n%s' "$SEED" "$CANONICAL_JSON"`, the command in
    // commitment.ts, with the seed lowercased by the shell (tr) rather than by our code.
    const output = execFileSync(
      'bash',
      ['-c', `printf '%s\\n%s' "$(printf '%s' "$SEED" | tr A-F a-f)" "$CANONICAL_JSON" | sha256sum`],
      {
        env: { ...process.env, SEED, CANONICAL_JSON: CANONICAL_BY_HAND, LC_ALL: 'C.UTF-8' },
      },
    ).toString();
    const expected = output.split(' ')[0];
    expect(expected).toMatch(/^[0-9a-f]{64}$/);
    expect(computeCommitment(SEED, parameters)).toBe(expected);
    expect(commitmentPayload(SEED, parameters).toString('utf8')).toBe(`${SEED.toLowerCase()}\n${CANONICAL_BY_HAND}`);
  });

  it('does not depend on the key order of the stored parameters', () => {
    const reordered = JSON.parse(
      '{"method":"stratified-blocks","factors":[{"kind":"numeric","id":"sense","cutPoints":[3.5]},' +
        '{"kind":"categorical","categories":["Nord","Süd"],"id":"site"}],"blockSizes":[3,6],' +
        '"conditions":[{"weight":1,"conditionId":"audio"},{"weight":2,"conditionId":"map"}]}',
    ) as SchemeParameters;
    expect(computeCommitment(SEED, reordered)).toBe(computeCommitment(SEED, parameters));
  });

  it('verifies the revealed seed and parameters, and rejects any change to either', () => {
    const commitment = computeCommitment(SEED, parameters);
    expect(verifyCommitment(SEED.toLowerCase(), parameters, commitment.toUpperCase())).toBe(true);
    const otherSeed = `${SEED.slice(0, 63)}8`;
    expect(verifyCommitment(otherSeed, parameters, commitment)).toBe(false);
    const otherBlocks = { ...parameters, blockSizes: [3] } as SchemeParameters;
    expect(verifyCommitment(SEED, otherBlocks, commitment)).toBe(false);
  });

  it('commits to the normalized parameters, defaults included', () => {
    const bare = { method: 'williams', conditionIds: ['a', 'b', 'c'] } as unknown as SchemeParameters;
    const full: SchemeParameters = {
      method: 'williams',
      conditionIds: ['a', 'b', 'c'],
      squaresPerBlock: [1],
      factors: [],
    };
    expect(computeCommitment(SEED, bare)).toBe(computeCommitment(SEED, full));
  });
});
