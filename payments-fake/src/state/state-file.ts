// The state file on disk: read and checked once at start, replaced atomically on every save
// (a temporary file in the same folder, flushed to disk, then renamed over the old one), so a
// crash mid-write leaves the previous snapshot, never half of one.

import {
  closeSync,
  constants,
  fsyncSync,
  openSync,
  readFileSync,
  renameSync,
  rmSync,
  statSync,
  writeFileSync,
  accessSync,
} from 'node:fs';
import { open, rm } from 'node:fs/promises';
import path from 'node:path';
import { randomToken } from '../ids/object-id';
import { readWorldSnapshot, SnapshotError } from './snapshot-reader';
import type { WorldSnapshot } from './world-snapshot';

export class StateFileError extends Error {
  constructor(
    readonly file: string,
    problem: string,
  ) {
    super(`state file ${file} ${problem}`);
    this.name = 'StateFileError';
  }
}

function reason(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

/** Refuses a state file whose folder is missing or cannot be written, before anything is done. */
export function checkStateFolder(file: string): void {
  const folder = path.dirname(file);
  let isFolder: boolean;
  try {
    isFolder = statSync(folder).isDirectory();
  } catch {
    throw new StateFileError(file, `cannot be kept: its folder ${folder} does not exist`);
  }
  if (!isFolder) throw new StateFileError(file, `cannot be kept: ${folder} is not a folder`);
  try {
    accessSync(folder, constants.W_OK);
  } catch {
    throw new StateFileError(file, `cannot be kept: its folder ${folder} is not writable`);
  }
}

/** The saved snapshot, or undefined when there is no file yet. Anything else wrong is a StateFileError. */
export function readStateFile(file: string): WorldSnapshot | undefined {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return undefined;
    throw new StateFileError(file, `cannot be read (${reason(error)})`);
  }
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch (error) {
    throw new StateFileError(file, `is not valid JSON (${text.trim() === '' ? 'the file is empty' : reason(error)})`);
  }
  try {
    return readWorldSnapshot(parsed);
  } catch (error) {
    if (error instanceof SnapshotError)
      throw new StateFileError(file, `is not a version 1 payments-fake snapshot: ${error.message}`);
    throw error;
  }
}

function temporaryNameFor(file: string): string {
  return path.join(path.dirname(file), `.${path.basename(file)}.${process.pid}.${randomToken(8)}.tmp`);
}

/** Replaces `file` with `text` in one step: temporary file, fsync, rename, then fsync of the folder. */
export function writeFileAtomically(file: string, text: string): void {
  const folder = path.dirname(file);
  const temporary = temporaryNameFor(file);
  try {
    const fd = openSync(temporary, 'w', 0o600);
    try {
      writeFileSync(fd, text, 'utf8');
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    renameSync(temporary, file);
  } catch (error) {
    rmSync(temporary, { force: true });
    throw new StateFileError(file, `could not be written (${reason(error)})`);
  }
  syncFolder(folder);
}

// Makes a rename durable; some systems cannot open a folder for this, and then the rename is still
// atomic, only perhaps not yet on disk.
function syncFolder(folder: string): void {
  try {
    const folderFd = openSync(folder, 'r');
    try {
      fsyncSync(folderFd);
    } finally {
      closeSync(folderFd);
    }
  } catch {
    // see above
  }
}

/**
 * The same replacement in two halves, so the slow part (writing and flushing the temporary file)
 * does not hold up the event loop: `prepare` resolves once the text is on disk beside `file`, and
 * `commit` then renames it over `file` (synchronously, so commits happen in the order they are
 * called) and flushes the folder; `discard` drops it instead.
 */
export async function prepareFileReplacement(file: string, text: string): Promise<{ commit(): void; discard(): void }> {
  const temporary = temporaryNameFor(file);
  try {
    const handle = await open(temporary, 'w', 0o600);
    try {
      await handle.writeFile(text, 'utf8');
      await handle.sync();
    } finally {
      await handle.close();
    }
  } catch (error) {
    await rm(temporary, { force: true });
    throw new StateFileError(file, `could not be written (${reason(error)})`);
  }
  return {
    commit: () => {
      try {
        renameSync(temporary, file);
      } catch (error) {
        rmSync(temporary, { force: true });
        throw new StateFileError(file, `could not be written (${reason(error)})`);
      }
      syncFolder(path.dirname(file));
    },
    discard: () => rmSync(temporary, { force: true }),
  };
}
