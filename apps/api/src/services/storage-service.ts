import {
  CreateBucketCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3';

export interface StoredObject {
  body: Buffer;
  contentType: string;
}

/** Where photo bytes live. The API talks to it only through these three calls. */
export interface ObjectStorage {
  put(key: string, body: Buffer, contentType: string): Promise<void>;
  get(key: string): Promise<StoredObject | null>;
  delete(key: string): Promise<void>;
}

export interface S3StorageOptions {
  endpoint?: string;
  region?: string;
  bucket: string;
  accessKeyId: string;
  secretAccessKey: string;
  /** Local fakes and most self-hosted stores address buckets by path, not by sub-domain. */
  forcePathStyle?: boolean;
}

export class S3Storage implements ObjectStorage {
  private readonly client: S3Client;
  private bucketChecked: Promise<void> | null = null;

  constructor(private readonly options: S3StorageOptions) {
    this.client = new S3Client({
      endpoint: options.endpoint,
      region: options.region ?? 'eu-west-2',
      forcePathStyle: options.forcePathStyle ?? Boolean(options.endpoint),
      credentials: { accessKeyId: options.accessKeyId, secretAccessKey: options.secretAccessKey },
      // Without these the SDK frames bodies as aws-chunked, which S3-compatible stores may keep verbatim.
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
    });
  }

  async put(key: string, body: Buffer, contentType: string): Promise<void> {
    await this.ensureBucket();
    await this.client.send(new PutObjectCommand({ Bucket: this.options.bucket, Key: key, Body: body, ContentType: contentType, ContentLength: body.length }));
  }

  async get(key: string): Promise<StoredObject | null> {
    try {
      const result = await this.client.send(new GetObjectCommand({ Bucket: this.options.bucket, Key: key }));
      if (!result.Body) return null;
      const bytes = await result.Body.transformToByteArray();
      return { body: Buffer.from(bytes), contentType: result.ContentType ?? 'application/octet-stream' };
    } catch (error) {
      if (isMissing(error)) return null;
      throw error;
    }
  }

  async delete(key: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.options.bucket, Key: key }));
  }

  /** A fresh local store has no bucket yet; a real one is made by whoever owns the account. */
  private ensureBucket(): Promise<void> {
    this.bucketChecked ??= (async () => {
      try {
        await this.client.send(new HeadBucketCommand({ Bucket: this.options.bucket }));
      } catch (error) {
        if (!isMissing(error)) throw error;
        await this.client.send(new CreateBucketCommand({ Bucket: this.options.bucket }));
      }
    })().catch((error: unknown) => {
      this.bucketChecked = null;
      throw error;
    });
    return this.bucketChecked;
  }

  destroy(): void {
    this.client.destroy();
  }
}

function isMissing(error: unknown): boolean {
  const e = error as { name?: string; $metadata?: { httpStatusCode?: number } };
  return e.name === 'NoSuchKey' || e.name === 'NotFound' || e.name === 'NoSuchBucket' || e.$metadata?.httpStatusCode === 404;
}

/** Keeps objects in memory: for unit tests and a server started without storage settings. */
export class MemoryStorage implements ObjectStorage {
  readonly objects = new Map<string, StoredObject>();

  async put(key: string, body: Buffer, contentType: string): Promise<void> {
    this.objects.set(key, { body: Buffer.from(body), contentType });
  }

  async get(key: string): Promise<StoredObject | null> {
    return this.objects.get(key) ?? null;
  }

  async delete(key: string): Promise<void> {
    this.objects.delete(key);
  }
}
