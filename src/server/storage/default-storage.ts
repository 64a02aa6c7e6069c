import { env } from "../env.ts";
import { createStorage, type ObjectStorage } from "./s3.ts";

let storage: ObjectStorage | null = null;

/** The uploads bucket named by the environment (the local fake in development and tests). */
export function defaultStorage(): ObjectStorage {
  storage ??= createStorage({
    endpoint: env.S3_ENDPOINT,
    region: env.S3_REGION,
    bucket: env.S3_BUCKET,
    accessKeyId: env.S3_ACCESS_KEY_ID,
    secretAccessKey: env.S3_SECRET_ACCESS_KEY,
    forcePathStyle: env.S3_FORCE_PATH_STYLE,
  });
  return storage;
}
