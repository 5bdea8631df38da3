// Uploads nobody confirmed are removed once they are a day old, and not before; the app servers run the
// clean-up every hour.
import { randomUUID } from "node:crypto";
import { sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { env } from "~/env.server";
import { ABANDONED_AFTER_MS, ABANDONED_UPLOADS_QUEUE, removeAbandonedUploads } from "~/modules/files/abandoned-uploads.server";
import { writeObject } from "~/modules/files/storage.server";
import { objectKeysUnder } from "../../support/listings";

describe("uploads left unconfirmed", () => {
  it("stay while they are fresh and are removed once older than a day", async () => {
    // A prefix of this test's own, so that other tests' uploads in flight are never touched.
    const prefix = `uploads/${randomUUID()}/`;
    for (const name of [randomUUID(), randomUUID()]) {
      await writeObject({ key: `${prefix}${name}`, body: Buffer.from("not yet confirmed"), contentType: "image/jpeg" });
    }
    expect(await removeAbandonedUploads({ prefix })).toBe(0);
    expect(await objectKeysUnder(prefix)).toHaveLength(2);

    const aDayAndAnHourLater = new Date(Date.now() + ABANDONED_AFTER_MS + 60 * 60 * 1000);
    expect(await removeAbandonedUploads({ prefix, now: aDayAndAnHourLater })).toBe(2);
    expect(await objectKeysUnder(prefix)).toEqual([]);
  });

  it("are cleaned up on an hourly schedule by the app server's job queue", async () => {
    const db = getDatabase();
    const deadline = Date.now() + 20_000;
    let cron: string | undefined;
    while (!cron && Date.now() < deadline) {
      const { rows } = await db.execute(sql`select cron from ${sql.identifier(env().JOB_QUEUE_SCHEMA)}.schedule where name = ${ABANDONED_UPLOADS_QUEUE}`);
      cron = (rows[0] as { cron?: string } | undefined)?.cron;
      if (!cron) await new Promise((resolve) => setTimeout(resolve, 250));
    }
    expect(cron).toBe("23 * * * *");
  });
});
