import { Readable } from 'node:stream';
import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, NoSuchKey, NotFound, PutObjectCommand, S3Client, type S3ClientConfig } from '@aws-sdk/client-s3';
import { assertKey, type FileStorage, type StagedFile } from './storage';

export type S3StorageOptions = {
  bucket: string;
  /** Key prefix inside the bucket, e.g. "photos/". */
  prefix?: string;
  client?: S3Client;
  clientConfig?: S3ClientConfig;
};

const missing = (err: unknown) => err instanceof NoSuchKey || err instanceof NotFound || (err as { name?: string })?.name === 'NoSuchKey' || (err as { $metadata?: { httpStatusCode?: number } })?.$metadata?.httpStatusCode === 404;

/**
 * Photos in S3-compatible object storage, for several app instances behind a load balancer.
 * An object store has no rename, but a PUT is atomic: the object appears whole or not at all. So
 * `stage` only keeps the bytes, and `commit` writes them under their final key; a failed upload never
 * leaves an object, and a discard after commit deletes it.
 */
export function s3Storage(opts: S3StorageOptions): FileStorage {
  const client =
    opts.client ??
    new S3Client({
      // Some S3-compatible stores reject the SDK's default CRC checksums; send them only when an operation needs one.
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
      ...opts.clientConfig,
    });
  const prefix = opts.prefix ?? '';
  const objectKey = (key: string) => {
    assertKey(key);
    return `${prefix}${key}`;
  };
  const remove = (key: string) => client.send(new DeleteObjectCommand({ Bucket: opts.bucket, Key: objectKey(key) })).then(() => undefined);

  return {
    async stage(key, data): Promise<StagedFile> {
      objectKey(key);
      let committed = false;
      return {
        key,
        async commit() {
          await client.send(new PutObjectCommand({ Bucket: opts.bucket, Key: objectKey(key), Body: data, ContentLength: data.length }));
          committed = true;
        },
        async discard() {
          if (committed) await remove(key).catch(() => undefined);
        },
      };
    },
    async read(key) {
      try {
        const head = await client.send(new HeadObjectCommand({ Bucket: opts.bucket, Key: objectKey(key) }));
        const obj = await client.send(new GetObjectCommand({ Bucket: opts.bucket, Key: objectKey(key) }));
        const body = obj.Body as Readable | undefined;
        if (!body) return null;
        return { stream: body instanceof Readable ? body : Readable.from(body as AsyncIterable<Uint8Array>), size: Number(head.ContentLength ?? obj.ContentLength ?? 0) };
      } catch (err) {
        if (missing(err)) return null;
        throw err;
      }
    },
    async delete(key) {
      try {
        await remove(key);
      } catch (err) {
        if (!missing(err)) throw err;
      }
    },
  };
}
