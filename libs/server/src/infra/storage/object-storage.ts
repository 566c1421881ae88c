import type { Readable } from 'node:stream';

export interface ObjectHead {
  bytes: number;
  /** User metadata (x-amz-meta-*), lower-case keys. */
  metadata: Record<string, string>;
}

export interface ListedObject {
  key: string;
  lastModified: Date;
}

export interface UnfinishedUpload {
  key: string;
  uploadId: string;
  initiated: Date;
}

/** Port for object storage (S3-compatible). Only S3ObjectStorage talks to S3. */
export abstract class ObjectStorage {
  /** Creates the bucket when it is missing. */
  abstract ensureBucket(): Promise<void>;
  /** Resolves when the bucket is reachable (HeadBucket). */
  abstract check(): Promise<void>;
  /** One PutObject of a whole buffer: atomic in S3, a reader never sees a half-written object. */
  abstract put(key: string, body: Uint8Array, contentType: string, metadata?: Record<string, string>): Promise<void>;
  /**
   * Streams a body of unknown length (multipart upload, bounded memory). Rejects when the stream errors;
   * the partial upload is aborted then.
   */
  abstract putStream(key: string, body: Readable, contentType: string): Promise<void>;
  abstract get(key: string): Promise<Buffer>;
  /** null when there is no such object. */
  abstract head(key: string): Promise<ObjectHead | null>;
  abstract copy(fromKey: string, toKey: string, metadata?: Record<string, string>): Promise<void>;
  /** Deleting a missing object is not an error. */
  abstract delete(key: string): Promise<void>;
  /** Keys under a prefix (all pages). */
  abstract list(prefix: string): Promise<string[]>;
  /** Objects under a prefix with their last-modified time (all pages), for sweeping orphans. */
  abstract listDetailed(prefix: string): Promise<ListedObject[]>;
  /** Multipart uploads begun under a prefix and neither completed nor aborted (a process died during one). */
  abstract listUnfinishedUploads(prefix: string): Promise<UnfinishedUpload[]>;
  /** Aborts a multipart upload: its parts are deleted. Aborting one that is gone is not an error. */
  abstract abortUpload(key: string, uploadId: string): Promise<void>;
  /** opts.disposition: the Content-Disposition the storage answers with (S3 response-content-disposition). */
  abstract presignGet(key: string, expiresInSeconds: number, opts?: { disposition?: string }): Promise<string>;
}
