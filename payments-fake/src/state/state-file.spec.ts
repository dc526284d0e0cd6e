import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { checkStateFolder, readStateFile, StateFileError, writeFileAtomically } from './state-file';

// Temporary files stay under the repository's git-ignored .local folder.
const TEMP_ROOT = path.resolve(__dirname, '../../../.local/tmp');
let folder: string;
let file: string;

beforeEach(() => {
  mkdirSync(TEMP_ROOT, { recursive: true });
  folder = mkdtempSync(path.join(TEMP_ROOT, 'payments-fake-file-'));
  file = path.join(folder, 'state.json');
});
afterEach(() => {
  rmSync(folder, { recursive: true, force: true });
});

describe('state file', () => {
  it('replaces the file in one step and leaves no temporary file behind', () => {
    writeFileSync(file, 'old');
    writeFileAtomically(file, 'new content\n');
    expect(readFileSync(file, 'utf8')).toBe('new content\n');
    expect(readdirSync(folder)).toEqual(['state.json']);
    expect(statSync(file).mode & 0o777).toBe(0o600);
  });

  it('reads a missing file as no snapshot, and refuses a folder or a non-snapshot naming the file', () => {
    expect(readStateFile(file)).toBeUndefined();
    expect(() => readStateFile(folder)).toThrow(StateFileError);
    expect(() => readStateFile(folder)).toThrow(`state file ${folder} cannot be read`);
    writeFileSync(file, '[1, 2');
    expect(() => readStateFile(file)).toThrow(`state file ${file} is not valid JSON`);
    writeFileSync(file, '{"format": "evenhand-payments-fake-state", "version": 7}');
    expect(() => readStateFile(file)).toThrow(/is not a version 1 payments-fake snapshot: version: must be 1/);
  });

  it('refuses a file whose folder is missing', () => {
    expect(() => checkStateFolder(path.join(folder, 'missing', 'state.json'))).toThrow(/does not exist/);
    writeFileSync(file, '');
    expect(() => checkStateFolder(path.join(file, 'state.json'))).toThrow(/is not a folder/);
    expect(() => checkStateFolder(file)).not.toThrow();
  });
});
