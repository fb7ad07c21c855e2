// The file store's contract. Files are named by the SHA-256 of their bytes (see blobs.ts), so a
// store only keeps, hands out and forgets bytes under such a name; the local folder and an
// S3-compatible bucket both lay them out as `ab/abcd…` (the first two hex digits as a folder).
import type { Readable } from 'node:stream';

export type StoredBlob = { key: string; modifiedAt: Date };

export interface BlobStore {
  /** Where the files are, for logs and messages. */
  readonly location: string;
  has(key: string): Promise<boolean>;
  put(key: string, body: Buffer): Promise<void>;
  /** Stores the file at `path` (read as a stream, so its size does not matter). */
  putFile(key: string, path: string): Promise<void>;
  /** The stored bytes; rejects with BlobMissingError when there are none under `key`. */
  open(key: string): Promise<Readable>;
  remove(key: string): Promise<void>;
  list(): AsyncIterable<StoredBlob>;
  /** Deletes what interrupted writes left behind before `before`; answers how many. */
  removeLeftovers(before: Date): Promise<number>;
}

export class BlobMissingError extends Error {
  readonly code = 'BLOB_MISSING';
  constructor(readonly key: string) {
    super(`The stored file ${key} is missing from the file store`);
  }
}

const KEY = /^[0-9a-f]{64}$/;

export const isBlobKey = (key: string) => KEY.test(key);

/** The key's place in the store: `ab/abcd…`. */
export function blobPath(key: string) {
  if (!isBlobKey(key)) throw new Error(`Not a blob key: ${key}`);
  return `${key.slice(0, 2)}/${key}`;
}
