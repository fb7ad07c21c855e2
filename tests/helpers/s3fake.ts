// A local S3-compatible server (s3rver) on 127.0.0.1 for tests of the S3 file store: one bucket,
// kept in a temporary folder that is removed on close.
import S3rver from 's3rver';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** s3rver's fixed account. */
export const S3_FAKE_CREDENTIALS = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' };

export type S3Fake = { endpoint: string; bucket: string; close(): Promise<void> };

export async function startS3Fake(bucket = 'phaselot-test'): Promise<S3Fake> {
  const directory = mkdtempSync(join(tmpdir(), 'phaselot-s3-'));
  const server = new S3rver({ address: '127.0.0.1', port: 0, silent: true, directory, configureBuckets: [{ name: bucket, configs: [] }] });
  const { port } = await server.run();
  return {
    endpoint: `http://127.0.0.1:${port}`,
    bucket,
    async close() {
      await server.close();
      rmSync(directory, { recursive: true, force: true });
    },
  };
}
