import { describe, expect, it } from 'vitest';
import { auditActionGroups, auditActionLabel, chainLabel } from './audit-labels';

describe('audit labels', () => {
  it('names each known action once', () => {
    const actions = auditActionGroups.flatMap((group) => group.actions.map((entry) => entry.action));
    expect(new Set(actions).size).toBe(actions.length);
    expect(auditActionLabel('consent.activated')).toBe('Consent version activated');
  });

  it('reads an unknown action code as a phrase', () => {
    expect(auditActionLabel('payout.approved')).toBe('Payout approved');
    expect(auditActionLabel('mail.send-failed')).toBe('Mail send failed');
  });

  it('names chains by study title, "lab" as lab-wide, and an unknown study by its id', () => {
    const titles = new Map([['8da5576c-4820-4de3-867c-b951081f13b2', 'Wayfinding cues']]);
    expect(chainLabel('lab', titles)).toBe('Lab-wide');
    expect(chainLabel('8da5576c-4820-4de3-867c-b951081f13b2', titles)).toBe('Wayfinding cues');
    expect(chainLabel('a7afbcc1-6323-4788-b54e-0bc7a1b7acaf', titles)).toBe('Study a7afbcc1');
  });
});
