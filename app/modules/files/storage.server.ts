// The one door to file storage: S3, or the s3rver stand-in locally, configured only by the S3_* variables.
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  NotFound,
  NoSuchKey,
  PutObjectCommand,
  S3Client,
} from "@aws-sdk/client-s3";
import { getSignedUrl } from "@aws-sdk/s3-request-presigner";
import { env } from "~/env.server";

let client: S3Client | undefined;

function storage(): S3Client {
  if (!client) {
    const settings = env();
    client = new S3Client({
      endpoint: settings.S3_ENDPOINT,
      region: settings.S3_REGION,
      credentials: { accessKeyId: settings.S3_ACCESS_KEY_ID, secretAccessKey: settings.S3_SECRET_ACCESS_KEY },
      // Bucket in the path, so that one endpoint URL works for S3, s3rver and other S3-speaking stores.
      forcePathStyle: true,
      // Without these the SDK streams aws-chunked bodies with trailing checksums, which s3rver stores verbatim.
      requestChecksumCalculation: "WHEN_REQUIRED",
      responseChecksumValidation: "WHEN_REQUIRED",
      maxAttempts: 2,
    });
  }
  return client;
}

const bucket = () => env().S3_BUCKET;

export class StorageUnavailableError extends Error {
  override name = "StorageUnavailableError";
  constructor(cause: unknown) {
    super("File storage is not answering. Nothing was saved; try again in a moment.", { cause });
  }
}

/** Runs one storage call; a refused or broken connection becomes a StorageUnavailableError with a plain message. */
async function call<T>(operation: () => Promise<T>): Promise<T> {
  try {
    return await operation();
  } catch (error) {
    if (error instanceof NotFound || error instanceof NoSuchKey) throw error;
    const status = (error as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
    if (status === undefined || status >= 500) throw new StorageUnavailableError(error);
    throw error;
  }
}

/**
 * A URL the browser can PUT one object to, valid for `expiresInSeconds`. The declared size and type are
 * signed (Content-Length and Content-Type in SignedHeaders), so S3 refuses a body of another size or type.
 * The local stand-in (s3rver) does not check V4 signatures; the size is checked again when the upload is confirmed.
 */
export function presignUpload({ key, contentType, contentLength, expiresInSeconds = 900 }: { key: string; contentType: string; contentLength: number; expiresInSeconds?: number }) {
  return getSignedUrl(storage(), new PutObjectCommand({ Bucket: bucket(), Key: key, ContentType: contentType, ContentLength: contentLength }), {
    expiresIn: expiresInSeconds,
    signableHeaders: new Set(["content-type", "content-length"]),
  });
}

/** Size and declared type of an object, or null when there is none. */
export async function statObject(key: string): Promise<{ size: number; contentType: string | undefined } | null> {
  try {
    const head = await call(() => storage().send(new HeadObjectCommand({ Bucket: bucket(), Key: key })));
    return { size: head.ContentLength ?? 0, contentType: head.ContentType };
  } catch (error) {
    if (error instanceof NotFound || (error as { name?: string }).name === "NotFound") return null;
    throw error;
  }
}

export async function readObject(key: string): Promise<Buffer> {
  const object = await call(() => storage().send(new GetObjectCommand({ Bucket: bucket(), Key: key })));
  return Buffer.from(await object.Body!.transformToByteArray());
}

/** A stream of the object for serving, or null when there is none. */
export async function openObject(key: string) {
  try {
    const object = await call(() => storage().send(new GetObjectCommand({ Bucket: bucket(), Key: key })));
    return {
      body: object.Body!.transformToWebStream(),
      contentType: object.ContentType ?? "application/octet-stream",
      contentLength: object.ContentLength,
      etag: object.ETag,
    };
  } catch (error) {
    if (error instanceof NoSuchKey || (error as { name?: string }).name === "NoSuchKey") return null;
    throw error;
  }
}

export async function writeObject({ key, body, contentType }: { key: string; body: Buffer; contentType: string }) {
  await call(() =>
    storage().send(
      new PutObjectCommand({
        Bucket: bucket(),
        Key: key,
        Body: body,
        ContentType: contentType,
        // Keys are never reused for different bytes, so caches may keep them for good.
        CacheControl: "public, max-age=31536000, immutable",
      }),
    ),
  );
}

/** Every object whose key starts with `prefix`, with when it was written (all pages of the listing). */
export async function listObjects(prefix: string): Promise<Array<{ key: string; lastModified: Date | null }>> {
  const found: Array<{ key: string; lastModified: Date | null }> = [];
  let token: string | undefined;
  do {
    const page = await call(() => storage().send(new ListObjectsV2Command({ Bucket: bucket(), Prefix: prefix, ContinuationToken: token })));
    for (const object of page.Contents ?? []) if (object.Key) found.push({ key: object.Key, lastModified: object.LastModified ?? null });
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
  return found;
}

/** Deletes objects one by one: DeleteObjects' checksum rules differ between S3-speaking stores. Missing keys are fine. */
export async function deleteObjects(keys: string[]) {
  await Promise.all(keys.map((key) => call(() => storage().send(new DeleteObjectCommand({ Bucket: bucket(), Key: key })))));
}
