import { describe, expect, it } from 'vitest';
import * as randomization from './index';

describe('randomization entry point', () => {
  it('exposes the schemes, replay, dry run and commitment the service builds on', () => {
    for (const name of [
      'parseSchemeParameters',
      'validateSchemeParameters',
      'computeCommitment',
      'verifyCommitment',
      'generateSeed',
      'generateSlots',
      'slotStratumKey',
      'assignByMinimization',
      'assignMatchedPairs',
      'deriveSequence',
      'verifyAllocations',
      'runDryRun',
      'williamsDesign',
      'PRETEST_CUTOFF_EXPLANATION',
      'RandomizationError',
    ]) {
      expect(randomization, name).toHaveProperty(name);
    }
  });
});
