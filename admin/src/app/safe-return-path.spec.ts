import { describe, expect, it } from 'vitest';
import { safeReturnPath } from './safe-return-path';

// Open-redirect cases from the OWASP "Unvalidated Redirects and Forwards" cheat sheet (protocol-relative and backslash forms).
describe('safeReturnPath', () => {
  it.each([
    ['/staff?q=ada&page=2', '/staff?q=ada&page=2'],
    ['/studies', '/studies'],
    ['//evil.example/phish', null],
    ['/\\evil.example', null],
    ['https://evil.example', null],
    ['/sign-in', null],
    [42, null],
    [undefined, null],
  ])('%s → %s', (candidate, expected) => {
    expect(safeReturnPath(candidate)).toBe(expected);
  });
});
