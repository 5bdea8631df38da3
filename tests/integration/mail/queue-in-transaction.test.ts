// A message queued inside a transaction shares its fate: stored (and so sent) if the transaction commits,
// gone if it rolls back. Checked against pg-boss's own job table.
import { randomUUID } from "node:crypto";
import { sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { env } from "~/env.server";
import { MAIL_QUEUE, queueEmail } from "~/modules/mail/mail.server";

const db = getDatabase();

async function jobsTo(to: string): Promise<number> {
  const { rows } = await db.execute(sql`select count(*)::int as count from ${sql.identifier(env().JOB_QUEUE_SCHEMA)}.job where name = ${MAIL_QUEUE} and data->>'to' = ${to}`);
  return (rows[0] as { count: number }).count;
}

const message = (to: string) => ({ to, subject: "Question about your lathe", html: "<p>Is it still for sale?</p>", text: "Is it still for sale?", tag: "test" });

describe("e-mail queued inside a transaction", () => {
  it("is stored with the transaction when it commits", async () => {
    const to = `commit-${randomUUID().slice(0, 8)}@example.test`;
    await db.transaction(async (tx) => {
      await queueEmail(message(to), { within: tx });
      // Not visible outside the transaction until it commits.
      expect(await jobsTo(to)).toBe(0);
    });
    expect(await jobsTo(to)).toBe(1);
  });

  it("is not stored, so never sent, when the transaction rolls back after it", async () => {
    const to = `rollback-${randomUUID().slice(0, 8)}@example.test`;
    await expect(
      db.transaction(async (tx) => {
        await queueEmail(message(to), { within: tx });
        throw new Error("a later step of the same change failed");
      }),
    ).rejects.toThrow("a later step");
    expect(await jobsTo(to)).toBe(0);
  });
});
