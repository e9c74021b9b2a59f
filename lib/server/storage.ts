/**
 * Object storage for uploads and issued reports: any S3-compatible service through the AWS SDK.
 * Settings come from the environment (S3_ENDPOINT, S3_BUCKET, S3_ACCESS_KEY_ID, S3_SECRET_ACCESS_KEY,
 * S3_REGION); `npm run demo` and the tests start a local S3-compatible store on loopback and set them.
 * Nothing here hands out bucket URLs: every download goes through an Airtally route that checks access.
 */
import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";

export interface StorageConfig {
  endpoint?: string;
  bucket: string;
  region: string;
  accessKeyId?: string;
  secretAccessKey?: string;
}

export class StorageNotConfiguredError extends Error {
  constructor() {
    super("Object storage is not configured: set S3_BUCKET (and S3_ENDPOINT and credentials for an S3-compatible service).");
  }
}

export function storageConfigFromEnv(env: NodeJS.ProcessEnv = process.env): StorageConfig | null {
  const bucket = env.S3_BUCKET?.trim();
  if (!bucket) return null;
  return {
    bucket,
    endpoint: env.S3_ENDPOINT?.trim() || undefined,
    region: env.S3_REGION?.trim() || "us-east-1",
    accessKeyId: env.S3_ACCESS_KEY_ID || undefined,
    secretAccessKey: env.S3_SECRET_ACCESS_KEY || undefined,
  };
}

/** An SDK client for a configuration; path-style addressing and no checksum trailers suit S3-compatible servers. */
export function createS3Client(config: StorageConfig): S3Client {
  return new S3Client({
    region: config.region,
    endpoint: config.endpoint,
    forcePathStyle: Boolean(config.endpoint),
    credentials: config.accessKeyId && config.secretAccessKey ? { accessKeyId: config.accessKeyId, secretAccessKey: config.secretAccessKey } : undefined,
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
    maxAttempts: 3,
  });
}

let cached: { key: string; client: S3Client; config: StorageConfig } | undefined;

function storage(): { client: S3Client; config: StorageConfig } {
  const config = storageConfigFromEnv();
  if (!config) throw new StorageNotConfiguredError();
  const key = JSON.stringify(config);
  if (cached?.key !== key) cached = { key, client: createS3Client(config), config };
  return cached;
}

export function storageConfigured(): boolean {
  return storageConfigFromEnv() !== null;
}

/** Stores bytes under a key; the whole body is sent with its length, so a partial object is never visible. */
export async function putObject({ key, body, contentType, metadata }: { key: string; body: Uint8Array; contentType: string; metadata?: Record<string, string> }): Promise<void> {
  const { client, config } = storage();
  await client.send(
    new PutObjectCommand({ Bucket: config.bucket, Key: key, Body: body, ContentType: contentType, ContentLength: body.byteLength, Metadata: metadata }),
  );
}

export interface StoredObject {
  body: ReadableStream<Uint8Array>;
  contentLength: number | undefined;
  contentType: string | undefined;
}

/** Opens an object for streaming to a response; null when there is no such object. */
export async function getObject(key: string): Promise<StoredObject | null> {
  const { client, config } = storage();
  try {
    const out = await client.send(new GetObjectCommand({ Bucket: config.bucket, Key: key }));
    if (!out.Body) return null;
    return { body: out.Body.transformToWebStream() as ReadableStream<Uint8Array>, contentLength: out.ContentLength, contentType: out.ContentType };
  } catch (err) {
    if (isMissing(err)) return null;
    throw err;
  }
}

/** The whole object in memory (for small objects and tests). */
export async function getObjectBytes(key: string): Promise<Uint8Array | null> {
  const { client, config } = storage();
  try {
    const out = await client.send(new GetObjectCommand({ Bucket: config.bucket, Key: key }));
    return out.Body ? await out.Body.transformToByteArray() : null;
  } catch (err) {
    if (isMissing(err)) return null;
    throw err;
  }
}

export async function objectExists(key: string): Promise<boolean> {
  const { client, config } = storage();
  try {
    await client.send(new HeadObjectCommand({ Bucket: config.bucket, Key: key }));
    return true;
  } catch (err) {
    if (isMissing(err)) return false;
    throw err;
  }
}

export async function deleteObject(key: string): Promise<void> {
  const { client, config } = storage();
  await client.send(new DeleteObjectCommand({ Bucket: config.bucket, Key: key }));
}

/** Deletes objects written by a step that then failed; a failure here is logged, the original error matters more. */
export async function deleteObjectsQuietly(keys: readonly string[]): Promise<void> {
  for (const key of keys) {
    await deleteObject(key).catch((err) => console.error(`[storage] could not remove ${key} after a failed step`, err));
  }
}

function isMissing(err: unknown): boolean {
  const e = err as { name?: string; $metadata?: { httpStatusCode?: number } };
  return e?.name === "NoSuchKey" || e?.name === "NotFound" || e?.$metadata?.httpStatusCode === 404;
}

/** Keys under a prefix (at most `max`), for housekeeping and tests. */
export async function listObjectKeys(prefix: string, max = 1000): Promise<string[]> {
  const { ListObjectsV2Command } = await import("@aws-sdk/client-s3");
  const { client, config } = storage();
  const out = await client.send(new ListObjectsV2Command({ Bucket: config.bucket, Prefix: prefix, MaxKeys: max }));
  return (out.Contents ?? []).flatMap((o) => (o.Key ? [o.Key] : []));
}

/**
 * An HTTP answer that streams a stored object through the app (after the caller checked access):
 * the stored type, never sniffed by the browser, and kept by no cache (as every API answer: a shared
 * tablet must not keep another person's project files).
 */
export function objectResponse(obj: StoredObject, { contentType, fileName, download = false }: { contentType: string; fileName: string; download?: boolean }): Response {
  const safeName = fileName.replace(/[^\w.\- ]+/g, "_").slice(0, 120) || "file";
  const headers: Record<string, string> = {
    "content-type": contentType,
    "content-disposition": `${download ? "attachment" : "inline"}; filename="${safeName}"; filename*=UTF-8''${encodeURIComponent(fileName.slice(0, 120))}`,
    "x-content-type-options": "nosniff",
    "cache-control": "no-store",
    "content-security-policy": "default-src 'none'; img-src 'self'; style-src 'unsafe-inline'; sandbox",
  };
  if (obj.contentLength !== undefined) headers["content-length"] = String(obj.contentLength);
  return new Response(obj.body, { status: 200, headers });
}
