// Serves processed files from the bucket through the app, so the bucket can stay private and originals
// (which may still carry GPS metadata until checked) are never reachable. A CDN can sit in front of /files.
import { openObject } from "./storage.server";

// Only what the pipeline wrote: photo variants and checked PDFs, under unguessable ids.
const servable = /^listings\/[0-9a-f-]{36}\/(photos\/[0-9a-f-]{36}\/(thumb|large)\.webp|documents\/[0-9a-f-]{36}\.pdf)$/;

export function fileUrl(key: string) {
  return `/files/${key}`;
}

export async function serveStoredFile(key: string, request: Request): Promise<Response> {
  if (!servable.test(key)) return new Response("Not found", { status: 404 });
  const object = await openObject(key);
  if (!object) return new Response("Not found", { status: 404 });
  if (object.etag && request.headers.get("if-none-match") === object.etag) {
    await object.body.cancel();
    return new Response(null, { status: 304, headers: { etag: object.etag } });
  }
  const headers = new Headers({
    "content-type": object.contentType,
    "cache-control": "public, max-age=31536000, immutable",
    "x-content-type-options": "nosniff",
  });
  if (object.contentLength !== undefined) headers.set("content-length", String(object.contentLength));
  if (object.etag) headers.set("etag", object.etag);
  if (key.endsWith(".pdf")) headers.set("content-disposition", "inline");
  return new Response(object.body as ReadableStream, { headers });
}
