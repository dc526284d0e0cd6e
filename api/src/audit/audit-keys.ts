/**
 * The audit keys: HMAC secrets held outside the database. Each event and receipt names the key it was made with,
 * so keys can be rotated while events made with an earlier key stay verifiable.
 *
 * Sources, in order: AUDIT_KEYS (`id=hex,id=hex`, the last is current), else the key file (JSON
 * `{"current": id, "keys": {id: hex}}`). Outside production a missing key file is created with a fresh random key.
 */
import { randomBytes } from 'node:crypto';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';

export interface AuditKeyRing {
  currentId: string;
  current: Buffer;
  keys: Map<string, Buffer>;
}

const KEY_ID = /^[A-Za-z0-9._-]{1,64}$/;
const MIN_KEY_BYTES = 32;

function ringOf(entries: Array<[string, string]>, currentId: string, source: string): AuditKeyRing {
  const keys = new Map<string, Buffer>();
  for (const [id, hex] of entries) {
    if (!KEY_ID.test(id)) throw new Error(`${source}: key id "${id}" must be 1–64 letters, digits, ".", "_" or "-"`);
    if (!/^[0-9a-fA-F]+$/.test(hex) || hex.length < MIN_KEY_BYTES * 2 || hex.length % 2) {
      throw new Error(`${source}: key "${id}" must be at least ${MIN_KEY_BYTES} bytes written as hex`);
    }
    keys.set(id, Buffer.from(hex, 'hex'));
  }
  const current = keys.get(currentId);
  if (!current) throw new Error(`${source}: the current key "${currentId}" is not among the keys`);
  return { currentId, current, keys };
}

export function parseKeyList(value: string): AuditKeyRing {
  const entries = value
    .split(',')
    .map((part) => part.trim())
    .filter(Boolean)
    .map((part): [string, string] => {
      const at = part.indexOf('=');
      if (at < 1) throw new Error('AUDIT_KEYS: write each key as id=hex, separated by commas');
      return [part.slice(0, at), part.slice(at + 1)];
    });
  if (entries.length === 0) throw new Error('AUDIT_KEYS: no key given');
  return ringOf(entries, entries[entries.length - 1][0], 'AUDIT_KEYS');
}

export function parseKeyFile(text: string, path: string): AuditKeyRing {
  let parsed: { current?: unknown; keys?: unknown };
  try {
    parsed = JSON.parse(text);
  } catch {
    throw new Error(`${path}: the audit key file is not JSON`);
  }
  if (typeof parsed.current !== 'string' || typeof parsed.keys !== 'object' || parsed.keys === null) {
    throw new Error(`${path}: the audit key file needs "current" and "keys"`);
  }
  return ringOf(
    Object.entries(parsed.keys as Record<string, string>).map(([id, hex]) => [id, String(hex)]),
    parsed.current,
    path,
  );
}

/** Loads the key ring; creates a development key file when allowed and none exists. */
export function loadAuditKeys(options: { keyList: string; keyFile: string; mayCreate: boolean }): AuditKeyRing {
  if (options.keyList.trim()) return parseKeyList(options.keyList);
  let text: string;
  try {
    text = readFileSync(options.keyFile, 'utf8');
  } catch (error: unknown) {
    if ((error as NodeJS.ErrnoException).code !== 'ENOENT') throw error;
    if (!options.mayCreate)
      throw new Error(`AUDIT_KEY_FILE: ${options.keyFile} does not exist; set AUDIT_KEYS or provide the key file`);
    const id = `dev-${randomBytes(4).toString('hex')}`;
    const created = JSON.stringify(
      { current: id, keys: { [id]: randomBytes(MIN_KEY_BYTES).toString('hex') } },
      null,
      2,
    );
    mkdirSync(dirname(options.keyFile), { recursive: true, mode: 0o700 });
    try {
      // "wx": two processes starting at once end up with the one file that was written first.
      writeFileSync(options.keyFile, created, { flag: 'wx', mode: 0o600 });
    } catch (raced: unknown) {
      if ((raced as NodeJS.ErrnoException).code !== 'EEXIST') throw raced;
    }
    text = readFileSync(options.keyFile, 'utf8');
  }
  return parseKeyFile(text, options.keyFile);
}
