// Uploads the browser sent but nobody confirmed (a tab closed between the upload and its check, a lost
// connection) stay under uploads/ exactly as sent, and a photo may still carry its GPS position. An hourly
// job removes those older than a day; an upload URL lasts 15 minutes, so none of them can still be confirmed.
import { registerWorker } from "~/modules/jobs/queue.server";
import { deleteObjects, listObjects } from "./storage.server";

export const ABANDONED_UPLOADS_QUEUE = "files.remove-abandoned-uploads";
export const ABANDONED_AFTER_MS = 24 * 60 * 60 * 1000;

/** Deletes unconfirmed uploads under `prefix` written before `now - olderThanMs`; answers how many. */
export async function removeAbandonedUploads({ prefix = "uploads/", olderThanMs = ABANDONED_AFTER_MS, now = new Date() } = {}): Promise<number> {
  const cutoff = now.getTime() - olderThanMs;
  const abandoned = (await listObjects(prefix)).filter((object) => object.lastModified !== null && object.lastModified.getTime() < cutoff);
  await deleteObjects(abandoned.map((object) => object.key));
  return abandoned.length;
}

/** Declares the hourly clean-up (see ~/modules/jobs/workers.server). */
export function declareFileWorkers() {
  registerWorker(
    ABANDONED_UPLOADS_QUEUE,
    async () => {
      const removed = await removeAbandonedUploads();
      if (removed) console.info(`[files] removed ${removed} upload(s) left unconfirmed for over a day`);
    },
    // A missed hour is made up by the next one: no long retries.
    { retryLimit: 2, retryDelay: 60, expireInSeconds: 15 * 60 },
    { cron: "23 * * * *" },
  );
}
