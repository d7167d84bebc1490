import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { CreateBucketCommand, ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import S3rver from 's3rver';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { s3Storage } from '../../server/lib/storage/s3';
import { localDiskStorage } from '../../server/lib/storage/local-disk';
import type { FileStorage } from '../../server/lib/storage/storage';

// The same behaviour is asked of both adapters: the local disk (default) and S3-compatible storage,
// here against s3rver, a local S3-compatible server from the npm registry, on 127.0.0.1.
let s3rver: S3rver;
let client: S3Client;
let dir: string;
const bucket = 'sablework-test';

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sablework-s3-'));
  s3rver = new S3rver({ port: 0, address: '127.0.0.1', silent: true, directory: path.join(dir, 's3') });
  const address = (await s3rver.run()) as unknown as AddressInfo;
  client = new S3Client({
    endpoint: `http://127.0.0.1:${address.port}`,
    region: 'us-east-1',
    forcePathStyle: true,
    credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' },
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
  await client.send(new CreateBucketCommand({ Bucket: bucket }));
});
afterAll(async () => {
  client?.destroy();
  await s3rver?.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

const readAll = async (storage: FileStorage, key: string) => {
  const f = await storage.read(key);
  if (!f) return null;
  const chunks: Buffer[] = [];
  for await (const c of f.stream) chunks.push(Buffer.from(c));
  return { size: f.size, bytes: Buffer.concat(chunks) };
};

const adapters: [string, () => FileStorage][] = [
  ['local disk', () => localDiskStorage(path.join(dir, 'disk'))],
  ['S3-compatible', () => s3Storage({ bucket, prefix: 'photos/', client })],
];

describe.each(adapters)('%s storage', (_name, make) => {
  it('stores, reads back and deletes; a missing key reads as null', async () => {
    const storage = make();
    const bytes = Buffer.from('not really a photo, but bytes all the same');
    const staged = await storage.stage('studio-1/photo-9/original.jpg', bytes);
    expect(await storage.read('studio-1/photo-9/original.jpg')).toBeNull();
    await staged.commit();
    const back = await readAll(storage, 'studio-1/photo-9/original.jpg');
    expect(back?.size).toBe(bytes.length);
    expect(back?.bytes.equals(bytes)).toBe(true);
    await storage.delete('studio-1/photo-9/original.jpg');
    expect(await storage.read('studio-1/photo-9/original.jpg')).toBeNull();
    await storage.delete('studio-1/photo-9/original.jpg');
  });

  it('a discarded upload leaves nothing under its key, before or after commit', async () => {
    const storage = make();
    const a = await storage.stage('studio-1/photo-10/thumb.webp', Buffer.from('a'));
    await a.discard();
    expect(await storage.read('studio-1/photo-10/thumb.webp')).toBeNull();
    const b = await storage.stage('studio-1/photo-11/thumb.webp', Buffer.from('b'));
    await b.commit();
    await b.discard();
    expect(await storage.read('studio-1/photo-11/thumb.webp')).toBeNull();
  });

  it('refuses keys that could escape their folder', async () => {
    const storage = make();
    await expect(storage.stage('../etc/passwd', Buffer.from('x'))).rejects.toThrow(/invalid storage key/);
    await expect(storage.read('/absolute')).rejects.toThrow(/invalid storage key/);
  });
});

it('S3 objects land under the prefix in the bucket', async () => {
  const storage = s3Storage({ bucket, prefix: 'photos/', client });
  const s = await storage.stage('studio-2/photo-1/medium.webp', Buffer.from('m'));
  await s.commit();
  const list = await client.send(new ListObjectsV2Command({ Bucket: bucket, Prefix: 'photos/studio-2/' }));
  expect(list.Contents?.map((o) => o.Key)).toEqual(['photos/studio-2/photo-1/medium.webp']);
});
