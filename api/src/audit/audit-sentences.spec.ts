import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  ACTION_FAMILY_KEYS,
  actionsInFamilies,
  actionWords,
  AUDIT_ACTIONS,
  describeEvent,
  EARLIER_ACTION_CODES,
  familyOf,
  formatAmount,
  personPhrase,
  SentenceContext,
} from './audit-sentences';

const SRC = join(__dirname, '..');

function sourceFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return name === 'bench' ? [] : sourceFiles(path);
    return path.endsWith('.ts') && !path.endsWith('.spec.ts') ? [path] : [];
  });
}

/**
 * Every `audit.record(…)` call in api/src and the action codes it can write: string literals, both arms of a
 * conditional, and a template literal read as the pattern it fills in. Found by reading the source, so a new call
 * site is covered without anyone listing it.
 */
function recordedActions(): Array<{ where: string; codes: string[]; pattern: RegExp | null }> {
  const found: Array<{ where: string; codes: string[]; pattern: RegExp | null }> = [];
  for (const file of sourceFiles(SRC)) {
    const text = readFileSync(file, 'utf8');
    for (const call of text.matchAll(/audit\.record\(\s*[\w.]+\s*,\s*\{/g)) {
      const start = call.index! + call[0].length;
      const body = text.slice(start, start + 1200);
      const action =
        /\baction:\s*([^,\n]+?)\s*,\s*(?:subjectType|subjectId|data|actor|chain)\b|\baction:\s*([^,\n]+)\s*,?\n/.exec(
          body,
        );
      const where = `${relative(SRC, file)}:${text.slice(0, call.index).split('\n').length}`;
      if (!action) {
        found.push({ where, codes: [], pattern: null });
        continue;
      }
      const expression = (action[1] ?? action[2]).trim();
      const template = /^`([^`]*)`$/.exec(expression);
      if (template) {
        const pattern = new RegExp(
          `^${template[1]
            .split(/\$\{[^}]*\}/)
            .map((part) => part.replace(/[.*+?^$()|[\]\\]/g, '\\$&'))
            .join('[a-z-]+')}$`,
        );
        // Only the values the interpolation can produce (the arms of a conditional), not what it compares with.
        const prefix = template[1].split('${')[0];
        found.push({
          where,
          codes: [...template[1].matchAll(/[?:]\s*'([a-z-]+)'/g)].map((m) => `${prefix}${m[1]}`),
          pattern,
        });
      } else {
        const results = expression.includes('?') ? expression.slice(expression.indexOf('?') + 1) : expression;
        found.push({ where, codes: [...results.matchAll(/'([^']+)'/g)].map((m) => m[1]), pattern: null });
      }
    }
  }
  return found;
}

const context = (overrides: Partial<SentenceContext> = {}): SentenceContext => ({
  actor: { name: 'Corin Vasquez-Hale', email: 'coordinator@evenhand.test', role: 'coordinator' },
  participantReference: 'P-7KQ2XA',
  actorIsParticipant: false,
  subjectPerson: { name: 'Rhea Mbeki-Strand', email: 'researcher@evenhand.test', role: 'researcher' },
  stepTitle: 'Session 1',
  currency: 'USD',
  payoutAmountMinor: 1200,
  ...overrides,
});

/** Data shaped as each call site writes it, so each sentence is read with what it will really get. */
const SAMPLE_DATA: Record<string, Record<string, unknown>> = {
  'auth.signed-in': { method: 'password' },
  'user.created': { email: 'new@evenhand.test', role: 'auditor' },
  'user.updated': { email: 'r@evenhand.test', changes: { role: { from: 'researcher', to: 'auditor' } } },
  'payout.approved': { count: 3, amountMinor: 3600, payoutIds: ['a', 'b', 'c'] },
  'step.completed': { stepId: 's', verifiedBy: 'return-link', payMinor: 1200, completedStudy: false },
  'consent.signed': { version: 2 },
  'study.member-added': { email: 'a@evenhand.test', role: 'auditor' },
  'audit.receipt-issued': { number: 4, chains: 3 },
};

describe('the audit trail in plain words', () => {
  it('has a sentence for every action the api records', () => {
    const calls = recordedActions();
    // The api records in about sixty places; finding far fewer means the scan itself broke.
    expect(calls.length).toBeGreaterThan(50);
    const missing: string[] = [];
    for (const call of calls) {
      if (call.codes.length === 0 && !call.pattern) missing.push(`${call.where}: action not readable from the source`);
      if (call.pattern) {
        const matches = Object.keys(AUDIT_ACTIONS).filter((code) => call.pattern!.test(code));
        if (matches.length === 0) missing.push(`${call.where}: no sentence matches ${call.pattern}`);
      }
      for (const code of call.codes) if (!AUDIT_ACTIONS[code]) missing.push(`${call.where}: ${code}`);
    }
    expect(missing).toEqual([]);
  });

  it('writes no code that spells a payment provider event type', () => {
    const written = recordedActions().flatMap((call) => call.codes);
    for (const code of Object.keys(EARLIER_ACTION_CODES)) expect(written).not.toContain(code);
  });

  it('reads every action as a finished sentence with no codes, ids or empty values in it', () => {
    for (const [action, words] of Object.entries(AUDIT_ACTIONS)) {
      const { sentence, name, family } = describeEvent(
        { action, actorEmail: 'coordinator@evenhand.test', subjectId: 'x', data: SAMPLE_DATA[action] ?? {} },
        context(),
      );
      expect(ACTION_FAMILY_KEYS, action).toContain(family);
      expect(family).toBe(words.family);
      expect(name, action).not.toMatch(/\./);
      expect(sentence, action).toMatch(/^[A-Z$“0-9].*[.”]$/);
      expect(sentence, action).not.toMatch(/undefined|null|NaN|\[object|[a-z]+\.[a-z-]+-[a-z]+/);
      expect(sentence, action).not.toContain(action);
    }
  });

  it('says who approved how many payouts and the total in the study’s currency', () => {
    expect(
      describeEvent(
        { action: 'payout.approved', actorEmail: null, subjectId: null, data: { count: 3, amountMinor: 3600 } },
        context(),
      ),
    ).toEqual({
      family: 'payouts',
      name: 'Payouts approved',
      sentence: 'Coordinator C. Vasquez-Hale approved 3 payouts, $36.00 in all.',
      amount: { minor: 3600, currency: 'USD' },
    });
  });

  it('names the participant by reference, never by e-mail, and the step by its title', () => {
    const done = describeEvent(
      {
        action: 'step.completed',
        actorEmail: 'p001@evenhand.test',
        subjectId: 'e',
        data: { verifiedBy: 'return-link', payMinor: 1200, completedStudy: true },
      },
      context({ actor: { name: '', email: 'p001@evenhand.test', role: 'participant' }, actorIsParticipant: true }),
    );
    expect(done.sentence).toBe(
      'Participant P-7KQ2XA finished the step “Session 1”, checked by the return link from the task; $12.00 is owed. That was their last step.',
    );
    expect(done.sentence).not.toContain('@');
    const byStaff = describeEvent(
      { action: 'step.completed', actorEmail: null, subjectId: 'e', data: { verifiedBy: 'staff', payMinor: 500 } },
      context(),
    );
    expect(byStaff.sentence).toBe(
      'Coordinator C. Vasquez-Hale marked the step “Session 1” done for participant P-7KQ2XA; $5.00 is owed.',
    );
  });

  it('reads events written under earlier codes as the action they meant', () => {
    const paid = describeEvent(
      { action: 'payout.paid', actorEmail: null, subjectId: 'p', data: { transferId: 'tr_1', amountMinor: 1200 } },
      context({ actor: null }),
    );
    expect(paid).toMatchObject({
      family: 'payouts',
      name: 'Paid',
      sentence: '$12.00 reached participant P-7KQ2XA’s payout account.',
    });
    expect(paid.sentence).not.toMatch(/tr_|payout\.paid/);
    expect(familyOf('funding.succeeded')).toBe('funding');
    expect(actionWords('payout.failed')?.name).toBe('Payout not sent');
  });

  it('has a place for codes it does not know, without failing', () => {
    expect(
      describeEvent(
        { action: 'probe.step-1', actorEmail: 'probe@evenhand.test', subjectId: null, data: {} },
        context({ actor: null }),
      ),
    ).toMatchObject({
      family: 'other',
      sentence: expect.stringMatching(/^probe@evenhand\.test recorded an event/),
    });
  });

  it('lists every code of a family, earlier codes included, for filtering stored events', () => {
    expect(actionsInFamilies(['funding']).sort()).toEqual([
      'funding.declined',
      'funding.failed',
      'funding.received',
      'funding.started',
      'funding.succeeded',
    ]);
    expect(actionsInFamilies(['exports'])).toEqual(['study.exported']);
    expect(new Set(actionsInFamilies([...ACTION_FAMILY_KEYS])).size).toBe(
      Object.keys(AUDIT_ACTIONS).length + Object.keys(EARLIER_ACTION_CODES).length,
    );
  });

  it('shortens names to an initial and the last name, after the role', () => {
    expect(personPhrase({ name: 'Ada Lindqvist-Oyelaran', email: 'a@x', role: 'admin' })).toBe(
      'Lab admin A. Lindqvist-Oyelaran',
    );
    expect(personPhrase({ name: 'Aurel', email: 'a@x', role: 'auditor' })).toBe('Auditor Aurel');
    expect(personPhrase({ name: ' ', email: 'a@x', role: 'researcher' })).toBe('Researcher a@x');
  });

  it('formats amounts in minor units of the currency', () => {
    // ISO 4217: USD has 2 decimals, JPY none (the minor unit is the yen).
    expect(formatAmount(3600, 'USD')).toBe('$36.00');
    expect(formatAmount(500, 'JPY')).toBe('¥500');
    expect(formatAmount(1234, null)).toBe('12.34');
  });
});
