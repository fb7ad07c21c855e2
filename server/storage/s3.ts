// The file store in any S3-compatible bucket through the AWS SDK v3. The bucket must exist; the
// store never creates or configures it. A write interrupted half-way leaves an unfinished
// multipart upload, which the bucket's lifecycle rule (README) aborts.
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
  S3ServiceException,
} from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import { createReadStream } from 'node:fs';
import { Readable } from 'node:stream';
import { BlobMissingError, blobPath, isBlobKey, type BlobStore, type StoredBlob } from './store';

export type S3StoreOptions = {
  bucket: string;
  region: string;
  endpoint?: string;
  /** Path-style addresses (`endpoint/bucket/key`), which most S3-compatible servers expect. */
  forcePathStyle: boolean;
  credentials?: { accessKeyId: string; secretAccessKey: string };
  /** Puts every file under this folder of the bucket, e.g. `phaselot/`. */
  prefix: string;
};

const isNotFound = (error: unknown) =>
  error instanceof S3ServiceException && (error.name === 'NotFound' || error.name === 'NoSuchKey' || error.$metadata.httpStatusCode === 404);

export class S3BlobStore implements BlobStore {
  readonly location: string;
  private readonly client: S3Client;

  constructor(private readonly options: S3StoreOptions) {
    this.location = `bucket ${options.bucket}${options.prefix ? `/${options.prefix}` : ''}${options.endpoint ? ` at ${options.endpoint}` : ''}`;
    this.client = new S3Client({
      region: options.region,
      endpoint: options.endpoint,
      forcePathStyle: options.forcePathStyle,
      credentials: options.credentials,
      // Checksums only where S3 requires them: many S3-compatible servers reject the newer
      // default checksum headers, and every stored file is checked by its SHA-256 name anyway.
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
    });
  }

  private objectKey(key: string) {
    return `${this.options.prefix}${blobPath(key)}`;
  }

  async has(key: string) {
    try {
      await this.client.send(new HeadObjectCommand({ Bucket: this.options.bucket, Key: this.objectKey(key) }));
      return true;
    } catch (error) {
      if (isNotFound(error)) return false;
      throw error;
    }
  }

  async put(key: string, body: Buffer) {
    await this.client.send(new PutObjectCommand({ Bucket: this.options.bucket, Key: this.objectKey(key), Body: body, ContentLength: body.length }));
  }

  async putFile(key: string, path: string) {
    // Upload sends a large file in parts, so its size is not bounded by a single request.
    await new Upload({ client: this.client, params: { Bucket: this.options.bucket, Key: this.objectKey(key), Body: createReadStream(path) } }).done();
  }

  async open(key: string) {
    try {
      const { Body } = await this.client.send(new GetObjectCommand({ Bucket: this.options.bucket, Key: this.objectKey(key) }));
      if (!(Body instanceof Readable)) throw new Error(`The file store answered no content for ${key}`);
      return Body;
    } catch (error) {
      if (isNotFound(error)) throw new BlobMissingError(key);
      throw error;
    }
  }

  async remove(key: string) {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.options.bucket, Key: this.objectKey(key) }));
  }

  async *list(): AsyncIterable<StoredBlob> {
    let ContinuationToken: string | undefined;
    do {
      const page = await this.client.send(new ListObjectsV2Command({ Bucket: this.options.bucket, Prefix: this.options.prefix, ContinuationToken }));
      for (const object of page.Contents ?? []) {
        const key = object.Key!.slice(this.options.prefix.length).split('/').pop()!;
        if (isBlobKey(key) && object.Key === this.objectKey(key)) yield { key, modifiedAt: object.LastModified ?? new Date(0) };
      }
      ContinuationToken = page.IsTruncated ? page.NextContinuationToken : undefined;
    } while (ContinuationToken);
  }

  async removeLeftovers() {
    // Unfinished multipart uploads are the bucket's lifecycle rule's to abort (README).
    return 0;
  }
}
