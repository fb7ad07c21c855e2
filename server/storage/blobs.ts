// Content-addressed file store: each stored file is named by its SHA-256, so the same bytes are
// kept once and a stored file can always be checked against the hash recorded beside it.
import { createHash } from 'node:crypto';
import { createReadStream, existsSync, mkdirSync, renameSync, writeFileSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { config } from '../config';

const root = resolve(config.UPLOAD_DIR ?? join(import.meta.dirname, '../../.data/uploads'));

export const sha256 = (data: Buffer | string) => createHash('sha256').update(data).digest('hex');

function pathOf(key: string) {
  if (!/^[0-9a-f]{64}$/.test(key)) throw new Error(`Not a blob key: ${key}`);
  return join(root, key.slice(0, 2), key);
}

/** Stores the bytes (written under a temporary name, then renamed) and returns their SHA-256. */
export function storeBlob(data: Buffer): string {
  const key = sha256(data);
  const target = pathOf(key);
  if (!existsSync(target)) {
    mkdirSync(join(root, key.slice(0, 2)), { recursive: true });
    const partial = `${target}.${process.pid}.part`;
    writeFileSync(partial, data);
    renameSync(partial, target);
  }
  return key;
}

export const readBlob = (key: string) => readFile(pathOf(key));
export const blobStream = (key: string) => createReadStream(pathOf(key));

/** A path in the store's folder for a file written piece by piece, so adopting it is a rename on the same disk. */
export function partialBlobPath(label: string) {
  mkdirSync(join(root, 'partial'), { recursive: true });
  return join(root, 'partial', `${label}.${process.pid}.${Date.now()}.part`);
}

/** Moves a finished file into the store under `key`, the SHA-256 its writer computed while writing it. */
export function adoptBlobFile(path: string, key: string): string {
  const target = pathOf(key);
  mkdirSync(join(root, key.slice(0, 2)), { recursive: true });
  renameSync(path, target);
  return key;
}
