import {
  CreateBucketCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  PutObjectCommand,
  S3Client,
  S3ServiceException,
} from "@aws-sdk/client-s3";

export interface StorageConfig {
  endpoint: string;
  region: string;
  bucket: string;
  accessKeyId: string;
  secretAccessKey: string;
  forcePathStyle: boolean;
}

export interface StoredObject {
  body: Buffer;
  contentType?: string;
}

export interface ObjectStorage {
  readonly bucket: string;
  /** The underlying client, for presigned URLs and other calls this wrapper does not cover. */
  readonly client: S3Client;
  putObject(key: string, body: Buffer, contentType: string): Promise<void>;
  getObject(key: string): Promise<StoredObject | null>;
  deleteObject(key: string): Promise<void>;
  ensureBucket(): Promise<void>;
}

function requireKey(key: string): string {
  if (typeof key !== "string" || key.length === 0 || key.length > 1024) {
    throw new Error("object key must be a non-empty string of at most 1024 characters");
  }
  return key;
}

function hasErrorName(err: unknown, ...names: string[]): boolean {
  return err instanceof Error && names.includes(err.name);
}

function readStatus(err: unknown): number | undefined {
  return err instanceof S3ServiceException ? err.$metadata.httpStatusCode : undefined;
}

export function createStorage(config: StorageConfig): ObjectStorage {
  const client = new S3Client({
    endpoint: config.endpoint,
    region: config.region,
    forcePathStyle: config.forcePathStyle,
    credentials: { accessKeyId: config.accessKeyId, secretAccessKey: config.secretAccessKey },
    // The SDK's default checksums stream uploads in aws-chunked framing, which simple
    // S3-compatible stores (the local fake among them) save verbatim, corrupting the object.
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
  const bucket = config.bucket;

  return {
    bucket,
    client,

    async putObject(key: string, body: Buffer, contentType: string): Promise<void> {
      await client.send(
        new PutObjectCommand({
          Bucket: bucket,
          Key: requireKey(key),
          Body: body,
          ContentType: contentType,
          ContentLength: body.length,
        }),
      );
    },

    async getObject(key: string): Promise<StoredObject | null> {
      try {
        const result = await client.send(new GetObjectCommand({ Bucket: bucket, Key: requireKey(key) }));
        if (!result.Body) return { body: Buffer.alloc(0), contentType: result.ContentType };
        const bytes = await result.Body.transformToByteArray();
        return { body: Buffer.from(bytes), contentType: result.ContentType };
      } catch (err) {
        // Only a missing object means "absent"; a missing bucket is a configuration fault.
        if (hasErrorName(err, "NoSuchKey")) return null;
        if (readStatus(err) === 404 && !hasErrorName(err, "NoSuchBucket")) return null;
        throw err;
      }
    },

    async deleteObject(key: string): Promise<void> {
      await client.send(new DeleteObjectCommand({ Bucket: bucket, Key: requireKey(key) }));
    },

    async ensureBucket(): Promise<void> {
      try {
        await client.send(new HeadBucketCommand({ Bucket: bucket }));
        return;
      } catch (err) {
        if (readStatus(err) !== 404 && !hasErrorName(err, "NotFound", "NoSuchBucket")) throw err;
      }
      try {
        await client.send(new CreateBucketCommand({ Bucket: bucket }));
      } catch (err) {
        // Another process may have created it between the two calls.
        if (!hasErrorName(err, "BucketAlreadyOwnedByYou", "BucketAlreadyExists")) throw err;
      }
    },
  };
}
