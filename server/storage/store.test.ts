// The file store's contract, held by both implementations: the local folder and an S3-compatible
// bucket (s3rver, a local fake of the S3 API, on 127.0.0.1).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync, utimesSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buffer } from 'node:stream/consumers';
import { PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { S3_FAKE_CREDENTIALS, startS3Fake, type S3Fake } from '../../tests/helpers/s3fake';
import { sha256 } from './blobs';
import { LocalBlobStore } from './local';
import { S3BlobStore } from './s3';
import { BlobMissingError, blobPath, type BlobStore } from './store';

// SHA-256("abc") is the first worked example of FIPS 180-4's test vectors (NIST CSRC examples).
const ABC_SHA256 = 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad';

let s3: S3Fake;
const folder = mkdtempSync(join(tmpdir(), 'phaselot-store-'));
const scratch = mkdtempSync(join(tmpdir(), 'phaselot-scratch-'));

beforeAll(async () => {
  s3 = await startS3Fake();
});

afterAll(async () => {
  await s3?.close();
  rmSync(folder, { recursive: true, force: true });
  rmSync(scratch, { recursive: true, force: true });
});

const s3Store = (prefix = 'phaselot/') =>
  new S3BlobStore({ bucket: s3.bucket, region: 'us-east-1', endpoint: s3.endpoint, forcePathStyle: true, credentials: S3_FAKE_CREDENTIALS, prefix });

const stores: [string, () => BlobStore][] = [
  ['local folder', () => new LocalBlobStore(folder)],
  ['S3-compatible bucket', () => s3Store()],
];

const keys = async (store: BlobStore) => {
  const found: string[] = [];
  for await (const blob of store.list()) found.push(blob.key);
  return found.sort();
};

describe.each(stores)('the file store in a %s', (_name, make) => {
  it('keeps bytes under their SHA-256 and hands them back unchanged', async () => {
    const store = make();
    const key = sha256('abc');
    expect(key).toBe(ABC_SHA256);
    expect(blobPath(key)).toBe(`ba/${ABC_SHA256}`);
    expect(await store.has(key)).toBe(false);
    await store.put(key, Buffer.from('abc'));
    expect(await store.has(key)).toBe(true);
    expect((await buffer(await store.open(key))).toString()).toBe('abc');

    const listed = [];
    for await (const blob of store.list()) listed.push(blob);
    expect(listed).toContainEqual({ key, modifiedAt: expect.any(Date) });
    expect(Math.abs(listed.find((b) => b.key === key)!.modifiedAt.getTime() - Date.now())).toBeLessThan(60_000);
  });

  it('stores a file larger than one upload part, read as a stream', async () => {
    const store = make();
    // 6 MiB: past the 5 MiB part size of multipart uploads, the S3 API's minimum part size.
    const bytes = randomBytes(6 * 1024 * 1024);
    const path = join(scratch, 'large.bin');
    writeFileSync(path, bytes);
    const key = sha256(bytes);
    await store.putFile(key, path);
    const back = await buffer(await store.open(key));
    expect(back.length).toBe(bytes.length);
    expect(sha256(back)).toBe(key);
  });

  it('says which file is missing, and forgets what it removes', async () => {
    const store = make();
    const key = sha256(`missing ${Math.random()}`);
    const missing = await store.open(key).catch((error: unknown) => error);
    expect(missing).toBeInstanceOf(BlobMissingError);
    expect((missing as Error).message).toBe(`The stored file ${key} is missing from the file store`);

    await store.put(key, Buffer.from('soon gone'));
    expect(await keys(store)).toContain(key);
    await store.remove(key);
    expect(await store.has(key)).toBe(false);
    expect(await keys(store)).not.toContain(key);
    await store.remove(key); // removing what is not there is no error
  });

  it('refuses a name that is not a SHA-256', async () => {
    const store = make();
    await expect(store.put('../../etc/passwd', Buffer.from('x'))).rejects.toThrow('Not a blob key: ../../etc/passwd');
  });
});

describe('the local folder', () => {
  it('lists only finished files and removes the leftovers of interrupted writes once they are old', async () => {
    const store = new LocalBlobStore(folder);
    const key = sha256('finished');
    await store.put(key, Buffer.from('finished'));
    const stale = join(folder, key.slice(0, 2), `${key}.1234.part`);
    const fresh = join(folder, key.slice(0, 2), `${key}.5678.part`);
    writeFileSync(stale, 'half');
    writeFileSync(fresh, 'half');
    const twoHoursAgo = new Date(Date.now() - 2 * 3600_000);
    utimesSync(stale, twoHoursAgo, twoHoursAgo);

    expect(await keys(store)).toContain(key);
    expect((await keys(store)).every((k) => /^[0-9a-f]{64}$/.test(k))).toBe(true);
    expect(await store.removeLeftovers(new Date(Date.now() - 3600_000))).toBe(1);
    expect(existsSync(stale)).toBe(false);
    expect(existsSync(fresh)).toBe(true);
    expect(await store.has(key)).toBe(true);
  });
});

describe('the S3-compatible bucket', () => {
  it('keeps to its prefix: objects elsewhere in the bucket are neither listed nor touched', async () => {
    const raw = new S3Client({ region: 'us-east-1', endpoint: s3.endpoint, forcePathStyle: true, credentials: S3_FAKE_CREDENTIALS });
    const stranger = sha256('someone else');
    await raw.send(new PutObjectCommand({ Bucket: s3.bucket, Key: `other/${blobPath(stranger)}`, Body: 'someone else' }));
    raw.destroy();

    const ours = s3Store('ours/');
    const key = sha256('ours');
    await ours.put(key, Buffer.from('ours'));
    expect(await keys(ours)).toEqual([key]);
    expect(await ours.has(stranger)).toBe(false);
    expect(await keys(s3Store('other/'))).toEqual([stranger]);
  });
});
