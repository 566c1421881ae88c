import { Inject, Injectable, Logger, type OnApplicationBootstrap, type OnApplicationShutdown } from '@nestjs/common';
import type { Readable } from 'node:stream';
import {
  AbortMultipartUploadCommand,
  CopyObjectCommand,
  CreateBucketCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  ListMultipartUploadsCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { APP_CONFIG } from '../../config/config.tokens';
import type { AppConfig } from '../../config/config';
import { ObjectStorage, type ObjectHead, type ListedObject, type UnfinishedUpload } from './object-storage';

const statusOf = (err: unknown) => (err as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;

/** S3 adapter; the worker builds one directly from its own config (`new S3ObjectStorage({ s3 })`). */
@Injectable()
export class S3ObjectStorage extends ObjectStorage implements OnApplicationBootstrap, OnApplicationShutdown {
  private readonly log = new Logger('Storage');
  private readonly client: S3Client;
  private readonly bucket: string;

  constructor(@Inject(APP_CONFIG) config: Pick<AppConfig, 's3'>) {
    super();
    this.bucket = config.s3.bucket;
    this.client = new S3Client({
      endpoint: config.s3.endpoint,
      region: config.s3.region,
      credentials: { accessKeyId: config.s3.accessKeyId, secretAccessKey: config.s3.secretAccessKey },
      forcePathStyle: true,
      // Stack notes: without these s3rver stores aws-chunked framing bytes of streamed bodies.
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
      maxAttempts: 2,
      // A storage that does not accept a connection fails within 2 s; one that stalls mid-request after 30 s of
      // silence (not less: s3rver copies and completes large multipart uploads without sending anything meanwhile).
      requestHandler: { connectionTimeout: 2000, requestTimeout: 30_000 },
    });
  }

  /** Start-up: create the bucket if missing; a storage outage is reported by /api/health, not fatal. */
  async onApplicationBootstrap(): Promise<void> {
    try {
      await this.ensureBucket();
    } catch (err) {
      this.log.warn(`could not ensure bucket ${this.bucket}: ${(err as Error).message}`);
    }
  }

  onApplicationShutdown(): void {
    this.client.destroy();
  }

  async ensureBucket(): Promise<void> {
    try {
      await this.client.send(new HeadBucketCommand({ Bucket: this.bucket }));
    } catch (err) {
      if (statusOf(err) !== 404) throw err;
      await this.client.send(new CreateBucketCommand({ Bucket: this.bucket }));
      this.log.log(`created bucket ${this.bucket}`);
    }
  }

  async check(): Promise<void> {
    await this.client.send(new HeadBucketCommand({ Bucket: this.bucket }));
  }

  async put(key: string, body: Uint8Array, contentType: string, metadata?: Record<string, string>): Promise<void> {
    await this.client.send(new PutObjectCommand({ Bucket: this.bucket, Key: key, Body: body, ContentType: contentType, ContentLength: body.byteLength, Metadata: metadata }));
  }

  async putStream(key: string, body: Readable, contentType: string): Promise<void> {
    // lib-storage buffers at most queueSize parts of partSize bytes (5 MiB is the S3 minimum part).
    const upload = new Upload({
      client: this.client,
      params: { Bucket: this.bucket, Key: key, Body: body, ContentType: contentType },
      queueSize: 2,
      partSize: 5 * 1024 * 1024,
      leavePartsOnError: false,
    });
    let streamError: Error | undefined;
    body.once('error', (err) => {
      streamError = err;
      void upload.abort().catch(() => undefined);
    });
    try {
      await upload.done();
    } catch (err) {
      throw streamError ?? err;
    }
    if (streamError) throw streamError;
  }

  async get(key: string): Promise<Buffer> {
    const res = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: key }));
    return Buffer.from(await res.Body!.transformToByteArray());
  }

  async head(key: string): Promise<ObjectHead | null> {
    try {
      const res = await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: key }));
      return { bytes: Number(res.ContentLength ?? 0), metadata: res.Metadata ?? {} };
    } catch (err) {
      if (statusOf(err) === 404) return null;
      throw err;
    }
  }

  async copy(fromKey: string, toKey: string, metadata?: Record<string, string>): Promise<void> {
    await this.client.send(
      new CopyObjectCommand({
        Bucket: this.bucket,
        Key: toKey,
        CopySource: `${this.bucket}/${fromKey.split('/').map(encodeURIComponent).join('/')}`,
        ...(metadata ? { Metadata: metadata, MetadataDirective: 'REPLACE' as const } : {}),
      }),
    );
  }

  async delete(key: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key }));
  }

  async list(prefix: string): Promise<string[]> {
    return (await this.listDetailed(prefix)).map((o) => o.key);
  }

  async listDetailed(prefix: string): Promise<ListedObject[]> {
    const out: ListedObject[] = [];
    let token: string | undefined;
    do {
      const res = await this.client.send(new ListObjectsV2Command({ Bucket: this.bucket, Prefix: prefix, ContinuationToken: token }));
      for (const o of res.Contents ?? []) if (o.Key) out.push({ key: o.Key, lastModified: o.LastModified ?? new Date(0) });
      token = res.IsTruncated ? res.NextContinuationToken : undefined;
    } while (token);
    return out;
  }

  async listUnfinishedUploads(prefix: string): Promise<UnfinishedUpload[]> {
    const out: UnfinishedUpload[] = [];
    let keyMarker: string | undefined;
    let uploadIdMarker: string | undefined;
    do {
      const res = await this.client.send(new ListMultipartUploadsCommand({ Bucket: this.bucket, Prefix: prefix, KeyMarker: keyMarker, UploadIdMarker: uploadIdMarker }));
      for (const u of res.Uploads ?? []) if (u.Key && u.UploadId) out.push({ key: u.Key, uploadId: u.UploadId, initiated: u.Initiated ?? new Date(0) });
      keyMarker = res.IsTruncated ? res.NextKeyMarker : undefined;
      uploadIdMarker = res.IsTruncated ? res.NextUploadIdMarker : undefined;
    } while (keyMarker);
    return out;
  }

  async abortUpload(key: string, uploadId: string): Promise<void> {
    try {
      await this.client.send(new AbortMultipartUploadCommand({ Bucket: this.bucket, Key: key, UploadId: uploadId }));
    } catch (err) {
      if (statusOf(err) !== 404) throw err;
    }
  }

  presignGet(key: string, expiresInSeconds: number, opts?: { disposition?: string }): Promise<string> {
    const disposition = opts?.disposition ? { ResponseContentDisposition: opts.disposition } : {};
    return getSignedUrl(this.client, new GetObjectCommand({ Bucket: this.bucket, Key: key, ...disposition }), { expiresIn: expiresInSeconds });
  }
}
