import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, ListObjectsV2Command, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { env } from "~/utils/env.server";

let client: S3Client | undefined;

/** One S3 client per process, for s3rver locally or any S3-compatible store (path-style addressing). */
export function s3(): S3Client {
  const e = env();
  if (!e.S3_ENDPOINT) throw new Error("S3_ENDPOINT is not set: files cannot be stored");
  client ??= new S3Client({
    endpoint: e.S3_ENDPOINT,
    region: e.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY },
  });
  return client;
}

/** Drops the client so the next call connects to the S3_* settings anew (tests that move the store). */
export function resetS3Client(): void {
  client?.destroy();
  client = undefined;
}

/** Stores an object with its SHA-256 (and any further metadata) in the object's metadata. */
export async function putObject(bucket: string, key: string, body: Uint8Array, contentType: string, sha256: string, metadata: Record<string, string> = {}): Promise<void> {
  await s3().send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: body, ContentType: contentType, Metadata: { ...metadata, sha256 } }));
}

export async function getObjectBytes(bucket: string, key: string): Promise<Uint8Array> {
  const out = await s3().send(new GetObjectCommand({ Bucket: bucket, Key: key }));
  return out.Body!.transformToByteArray();
}

export async function objectExists(bucket: string, key: string): Promise<boolean> {
  try {
    await s3().send(new HeadObjectCommand({ Bucket: bucket, Key: key }));
    return true;
  } catch {
    return false;
  }
}

/** Every key under a prefix (used by tests that assert nothing was stored). */
export async function listKeys(bucket: string, prefix = ""): Promise<string[]> {
  const keys: string[] = [];
  let token: string | undefined;
  do {
    const page = await s3().send(new ListObjectsV2Command({ Bucket: bucket, Prefix: prefix, ContinuationToken: token }));
    keys.push(...(page.Contents ?? []).map((o) => o.Key!));
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
  return keys;
}

export async function deleteObject(bucket: string, key: string): Promise<void> {
  await s3().send(new DeleteObjectCommand({ Bucket: bucket, Key: key }));
}
