import { describe, expect, it } from 'vitest';
import { parseRoster } from './roster-import';

const factors = [
  { key: 'pretest', kind: 'numeric' as const, categories: null },
  { key: 'site', kind: 'categorical' as const, categories: ['lab', 'online'] },
];

describe('parseRoster', () => {
  it('reads e-mail, name and pretest columns, quoted fields included', () => {
    const parsed = parseRoster(
      'Email,Name,pretest,site\nA@Example.test,"Doe, Sam",72,lab\nb@example.test,,40,online\n',
      factors,
    );
    expect(parsed.errors).toEqual([]);
    expect(parsed.rows).toEqual([
      { line: 2, email: 'a@example.test', name: 'Doe, Sam', covariates: { pretest: 72, site: 'lab' } },
      { line: 3, email: 'b@example.test', name: null, covariates: { pretest: 40, site: 'online' } },
    ]);
  });

  it('reports each bad row by line and field and keeps the good ones', () => {
    const parsed = parseRoster(
      'email,pretest,site,shoe\nnot-an-email,1,lab,9\nc@x.test,high,lab,9\nd@x.test,3,moon,9\nc@x.test,5,lab,9\ne@x.test,7,online,9\n',
      factors,
    );
    expect(parsed.errors).toEqual([
      { line: 2, field: 'email', message: '"not-an-email" is not an e-mail address' },
      { line: 3, field: 'pretest', message: '"high" is not a number' },
      { line: 4, field: 'site', message: '"moon" is not one of lab, online' },
      // A repeated address is refused even when its first line was refused too: the file itself needs fixing.
      { line: 5, field: 'email', message: 'c@x.test already appears on line 3' },
    ]);
    expect(parsed.rows.map((r) => r.line)).toEqual([6]);
    expect(parsed.ignoredColumns).toEqual(['shoe']);
  });

  it('refuses a file without an email column', () => {
    expect(parseRoster('name\nSam\n', factors).errors).toEqual([
      { line: 1, field: 'email', message: 'the header row needs an "email" column' },
    ]);
  });

  it('refuses an over-long or control-character name and answer instead of storing it', () => {
    const parsed = parseRoster(
      `email,name,pretest,site\na@x.test,${'N'.repeat(201)},1,lab\nb@x.test,"Sam\u0000",2,lab\nc@x.test,Sam,"1\u0000",lab\nd@x.test,${'N'.repeat(200)},3,lab\n`,
      factors,
    );
    expect(parsed.errors.map((e) => [e.line, e.field])).toEqual([
      [2, 'name'],
      [3, 'name'],
      [4, 'pretest'],
    ]);
    expect(parsed.rows.map((r) => r.line)).toEqual([5]);
  });
});
