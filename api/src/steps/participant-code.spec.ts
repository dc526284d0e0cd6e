import { randomBytes, randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { participantCode, participantCodeMatches } from './participant-code';

const key = randomBytes(32);

describe('participant codes', () => {
  it('has no collisions over 100,000 codes', () => {
    const stepId = randomUUID();
    const seen = new Set<string>();
    for (let i = 0; i < 100_000; i++) seen.add(participantCode(key, randomUUID(), stepId));
    expect(seen.size).toBe(100_000);
  });

  it('differs per step and per study key, and is stable for the same inputs', () => {
    const enrollmentId = randomUUID();
    const stepId = randomUUID();
    expect(participantCode(key, enrollmentId, stepId)).toBe(participantCode(key, enrollmentId, stepId));
    expect(participantCode(key, enrollmentId, randomUUID())).not.toBe(participantCode(key, enrollmentId, stepId));
    expect(participantCode(randomBytes(32), enrollmentId, stepId)).not.toBe(participantCode(key, enrollmentId, stepId));
    expect(participantCode(key, enrollmentId, stepId)).toMatch(/^[A-Z2-9]{5}-[A-Z2-9]{5}$/);
  });

  it('works only for the participant it was issued to, typed without case, spaces or dash', () => {
    const mine = randomUUID();
    const stepId = randomUUID();
    const code = participantCode(key, mine, stepId);
    expect(participantCodeMatches(key, mine, stepId, code)).toBe(true);
    expect(participantCodeMatches(key, mine, stepId, ` ${code.toLowerCase().replace('-', ' ')} `)).toBe(true);
    expect(participantCodeMatches(key, randomUUID(), stepId, code)).toBe(false);
    expect(participantCodeMatches(key, mine, stepId, code.slice(0, -1))).toBe(false);
  });
});
