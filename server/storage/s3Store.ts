import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  PutObjectCommand,
  S3Client,
  S3ServiceException,
} from '@aws-sdk/client-s3';
import { assertValidContentType, assertValidKey } from './keys';
import type { FileStore, StoredFile } from './types';

export interface S3StoreOptions {
  /** For S3-compatible services (e.g. `http://127.0.0.1:9000`); omit for AWS itself. */
  endpoint?: string;
  region: string;
  bucket: string;
  accessKeyId: string;
  secretAccessKey: string;
  /** `https://host/bucket/key` rather than `https://bucket.host/key`. Defaults to true when an endpoint is given. */
  forcePathStyle?: boolean;
}

const FALLBACK_TYPE = 'application/octet-stream';

/** A missing object. A missing bucket is a configuration error and is not hidden as "missing". */
function isMissingObject(err: unknown): boolean {
  if (!(err instanceof S3ServiceException)) return false;
  if (err.name === 'NoSuchKey' || err.name === 'NotFound') return true;
  return err.$metadata?.httpStatusCode === 404 && err.name !== 'NoSuchBucket';
}

/** Objects in one bucket of S3 or an S3-compatible service, keys used as object keys unchanged. */
export class S3FileStore implements FileStore {
  readonly kind = 's3' as const;
  readonly bucket: string;
  private readonly client: S3Client;

  constructor(opts: S3StoreOptions) {
    this.bucket = opts.bucket;
    const compatible = opts.endpoint !== undefined;
    this.client = new S3Client({
      region: opts.region,
      endpoint: opts.endpoint,
      forcePathStyle: opts.forcePathStyle ?? compatible,
      credentials: { accessKeyId: opts.accessKeyId, secretAccessKey: opts.secretAccessKey },
      // Many S3-compatible services do not implement the SDK's default flexible checksums: send and check
      // them only where the API requires them. AWS itself keeps the SDK defaults.
      ...(compatible
        ? { requestChecksumCalculation: 'WHEN_REQUIRED', responseChecksumValidation: 'WHEN_REQUIRED' }
        : {}),
    });
  }

  async put(key: string, body: Buffer, contentType: string): Promise<void> {
    assertValidKey(key);
    assertValidContentType(contentType);
    await this.client.send(
      new PutObjectCommand({
        Bucket: this.bucket,
        Key: key,
        Body: body,
        ContentType: contentType,
        ContentLength: body.length,
      }),
    );
  }

  async get(key: string): Promise<StoredFile | null> {
    assertValidKey(key);
    try {
      const res = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: key }));
      const bytes = res.Body ? await res.Body.transformToByteArray() : new Uint8Array();
      return {
        body: Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength),
        contentType: res.ContentType ?? FALLBACK_TYPE,
      };
    } catch (err) {
      if (isMissingObject(err)) return null;
      throw err;
    }
  }

  async delete(key: string): Promise<void> {
    assertValidKey(key);
    await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key }));
  }

  async exists(key: string): Promise<boolean> {
    assertValidKey(key);
    try {
      await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: key }));
      return true;
    } catch (err) {
      if (isMissingObject(err)) return false;
      throw err;
    }
  }

  /** Closes the client's pooled connections (tests, shutdown). */
  destroy(): void {
    this.client.destroy();
  }
}
