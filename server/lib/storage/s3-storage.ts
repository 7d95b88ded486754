import type { S3Client, S3ClientConfig } from '@aws-sdk/client-s3';
import { createReadStream } from 'node:fs';
import { readdir, rm, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import { assertKey, type ObjectInfo, type Storage } from './storage';

export interface S3StorageOptions {
  bucket: string;
  endpoint?: string;
  region: string;
  accessKeyId?: string;
  secretAccessKey?: string;
  /** Path-style addressing (http://host/bucket/key), which most S3-compatible servers want. */
  forcePathStyle?: boolean;
  /** The local folder where uploads are received before they go to the bucket (swept at start-up). */
  tempDir?: string;
}

function isNotFound(e: unknown): boolean {
  const err = e as { name?: string; $metadata?: { httpStatusCode?: number } };
  return err?.name === 'NoSuchKey' || err?.name === 'NotFound' || err?.$metadata?.httpStatusCode === 404;
}

type Sdk = typeof import('@aws-sdk/client-s3');
let sdk: Promise<Sdk> | null = null;
/** The SDK is loaded on first use, so a server on the local disk never pays for it. */
const loadSdk = (): Promise<Sdk> => (sdk ??= import('@aws-sdk/client-s3'));

/**
 * S3-compatible object storage through the AWS SDK v3, so several app servers share evidence.
 * A PutObject is atomic on the server side (the object appears whole or not at all), so there
 * are no temporary objects to clean.
 */
export class S3Storage implements Storage {
  readonly driver = 's3' as const;
  readonly bucket: string;
  private readonly config: S3ClientConfig;
  private readonly tempDir: string | undefined;
  private clientPromise: Promise<{ client: S3Client; sdk: Sdk }> | null = null;

  constructor(opts: S3StorageOptions) {
    const config: S3ClientConfig = {
      region: opts.region,
      endpoint: opts.endpoint,
      forcePathStyle: opts.forcePathStyle ?? Boolean(opts.endpoint),
      // Only send checksums where the API requires them: some S3-compatible servers do not
      // understand the newer default checksum headers.
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
    };
    if (opts.accessKeyId && opts.secretAccessKey) {
      config.credentials = { accessKeyId: opts.accessKeyId, secretAccessKey: opts.secretAccessKey };
    }
    this.config = config;
    this.bucket = opts.bucket;
    this.tempDir = opts.tempDir;
  }

  private connect() {
    return (this.clientPromise ??= loadSdk().then((m) => ({ client: new m.S3Client(this.config), sdk: m })));
  }

  async put(key: string, data: Buffer, contentType: string): Promise<void> {
    assertKey(key);
    const { client, sdk: m } = await this.connect();
    await client.send(
      new m.PutObjectCommand({ Bucket: this.bucket, Key: key, Body: data, ContentType: contentType, ContentLength: data.length }),
    );
  }

  /** Streams the file from disk to the bucket with its length, never whole in memory. */
  async putFile(key: string, path: string, contentType: string): Promise<void> {
    assertKey(key);
    const { client, sdk: m } = await this.connect();
    const { size } = await stat(path);
    const body = createReadStream(path);
    try {
      await client.send(new m.PutObjectCommand({ Bucket: this.bucket, Key: key, Body: body, ContentType: contentType, ContentLength: size }));
    } finally {
      body.destroy();
    }
  }

  async read(key: string): Promise<Buffer | null> {
    const o = await this.open(key);
    if (!o) return null;
    const chunks: Buffer[] = [];
    for await (const c of o.stream) chunks.push(Buffer.isBuffer(c) ? c : Buffer.from(c as Uint8Array));
    return Buffer.concat(chunks);
  }

  async open(key: string) {
    assertKey(key);
    const { client, sdk: m } = await this.connect();
    try {
      const out = await client.send(new m.GetObjectCommand({ Bucket: this.bucket, Key: key }));
      const body = out.Body;
      if (!body) return null;
      const stream = body instanceof Readable ? body : Readable.fromWeb(body as never);
      return { stream, size: Number(out.ContentLength ?? 0) };
    } catch (e) {
      if (isNotFound(e)) return null;
      throw e;
    }
  }

  async stat(key: string): Promise<ObjectInfo | null> {
    assertKey(key);
    const { client, sdk: m } = await this.connect();
    try {
      const out = await client.send(new m.HeadObjectCommand({ Bucket: this.bucket, Key: key }));
      return { key, size: Number(out.ContentLength ?? 0), modifiedAt: out.LastModified ?? new Date(0) };
    } catch (e) {
      if (isNotFound(e)) return null;
      throw e;
    }
  }

  async delete(key: string): Promise<void> {
    assertKey(key);
    const { client, sdk: m } = await this.connect();
    try {
      await client.send(new m.DeleteObjectCommand({ Bucket: this.bucket, Key: key }));
    } catch (e) {
      if (!isNotFound(e)) throw e;
    }
  }

  async *list(prefix = ''): AsyncIterable<ObjectInfo> {
    const { client, sdk: m } = await this.connect();
    let token: string | undefined;
    do {
      const out = await client.send(
        new m.ListObjectsV2Command({ Bucket: this.bucket, Prefix: prefix || undefined, ContinuationToken: token }),
      );
      for (const o of out.Contents ?? []) {
        if (o.Key) yield { key: o.Key, size: Number(o.Size ?? 0), modifiedAt: o.LastModified ?? new Date(0) };
      }
      token = out.IsTruncated ? out.NextContinuationToken : undefined;
    } while (token);
  }

  /** Objects need no temporary names; only the local upload folder has leftovers to remove. */
  async cleanTemp(olderThan: Date): Promise<string[]> {
    const removed: string[] = [];
    if (!this.tempDir) return removed;
    let names: string[];
    try {
      names = await readdir(this.tempDir);
    } catch (e) {
      if ((e as { code?: string }).code === 'ENOENT') return removed;
      throw e;
    }
    for (const name of names) {
      const p = join(this.tempDir, name);
      const s = await stat(p).catch(() => null);
      if (s && s.mtime <= olderThan) {
        await rm(p, { force: true, recursive: true });
        removed.push(`upload-temp/${name}`);
      }
    }
    return removed;
  }
}
