// Content-addressed file store: each stored file is named by its SHA-256, so the same bytes are
// kept once and a stored file can always be checked against the hash recorded beside it. Where the
// files live (a local folder or an S3-compatible bucket) is configuration (README); everything
// stores and reads through the functions here.
import { createHash } from 'node:crypto';
import { join } from 'node:path';
import { buffer } from 'node:stream/consumers';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { config } from '../config';
import { LocalBlobStore } from './local';
import { S3BlobStore } from './s3';
import type { BlobStore } from './store';

function configuredStore(): BlobStore {
  if (config.STORAGE === 'local') return new LocalBlobStore(config.UPLOAD_DIR ?? join(import.meta.dirname, '../../.data/uploads'));
  return new S3BlobStore({
    bucket: config.S3_BUCKET!,
    region: config.S3_REGION,
    endpoint: config.S3_ENDPOINT,
    forcePathStyle: config.S3_FORCE_PATH_STYLE ?? Boolean(config.S3_ENDPOINT),
    credentials: config.S3_ACCESS_KEY_ID ? { accessKeyId: config.S3_ACCESS_KEY_ID, secretAccessKey: config.S3_SECRET_ACCESS_KEY! } : undefined,
    prefix: config.S3_PREFIX,
  });
}

export const blobStore: BlobStore = configuredStore();

export const sha256 = (data: Buffer | string) => createHash('sha256').update(data).digest('hex');

/** The advisory-lock class of blob keys ('blob' in ASCII), apart from every other lock. */
const BLOB_LOCK_CLASS = 0x626c6f62;

const lockArgs = (key: string, transaction: Transaction) => ({
  sequelize: (transaction as Transaction & { sequelize: Sequelize }).sequelize,
  options: { replacements: { lockClass: BLOB_LOCK_CLASS, key }, transaction, type: QueryTypes.SELECT } as const,
});

/**
 * Locks the key until `transaction` ends. The orphan sweep (sweep.ts) skips a locked key and
 * deletes a file only when no committed row names it, so a file stored by a transaction stays
 * exactly when that transaction commits a reference to it.
 */
export async function holdBlobKey(key: string, transaction: Transaction) {
  const { sequelize, options } = lockArgs(key, transaction);
  await sequelize.query('SELECT pg_advisory_xact_lock(:lockClass, hashtext(:key))', options);
}

/** The sweep's side of holdBlobKey: false when a transaction holds the key now. */
export async function tryHoldBlobKey(key: string, transaction: Transaction) {
  const { sequelize, options } = lockArgs(key, transaction);
  const [{ held }] = await sequelize.query<{ held: boolean }>('SELECT pg_try_advisory_xact_lock(:lockClass, hashtext(:key)) AS held', options);
  return held;
}

/** Stores the bytes for the transaction that will reference them and answers their SHA-256. */
export async function storeBlob(data: Buffer, transaction: Transaction): Promise<string> {
  const key = sha256(data);
  await holdBlobKey(key, transaction);
  if (!(await blobStore.has(key))) await blobStore.put(key, data);
  return key;
}

/** Stores a finished file under `key`, the SHA-256 its writer computed while writing it. */
export async function storeBlobFile(path: string, key: string, transaction: Transaction): Promise<string> {
  await holdBlobKey(key, transaction);
  if (!(await blobStore.has(key))) await blobStore.putFile(key, path);
  return key;
}

export const openBlob = (key: string) => blobStore.open(key);

export const readBlob = async (key: string) => buffer(await blobStore.open(key));
