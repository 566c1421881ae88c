/** Port for object storage (S3-compatible). Only S3ObjectStorage talks to S3. */
export abstract class ObjectStorage {
  /** Creates the bucket when it is missing. */
  abstract ensureBucket(): Promise<void>;
  /** Resolves when the bucket is reachable (HeadBucket). */
  abstract check(): Promise<void>;
  abstract put(key: string, body: Buffer, contentType: string): Promise<void>;
  abstract get(key: string): Promise<Buffer>;
  abstract presignGet(key: string, expiresInSeconds: number): Promise<string>;
}
