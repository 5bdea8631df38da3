// The mail queue in this test process, pointed at a mail stand-in of its own that is down at first: the
// message must wait in PostgreSQL and go out once the stand-in is back. Its own pg-boss schema keeps the app
// server's workers from taking the job.
import { randomUUID } from "node:crypto";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import pg from "pg";
import { afterAll, describe, expect, it } from "vitest";
import { freePort } from "../../../scripts/lib/ports.ts";
import { startMailStandIn } from "../../../stand-ins/mail/index.ts";

const schema = `pgboss_mail_test_${randomUUID().slice(0, 8)}`;
const dataDir = mkdtempSync(path.join(os.tmpdir(), "mail-outage-"));
let standIn: Awaited<ReturnType<typeof startMailStandIn>> | undefined;
let stopQueue: (() => Promise<void>) | undefined;

afterAll(async () => {
  await stopQueue?.();
  await standIn?.stop();
  rmSync(dataDir, { recursive: true, force: true });
  const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
  await client.connect();
  await client.query(`drop schema if exists "${schema}" cascade`);
  await client.end();
});

describe("the mail queue", () => {
  it("keeps a message queued while the mail service is down and delivers it when it is back", { timeout: 90_000 }, async () => {
    const port = await freePort();
    process.env.POSTMARK_API_HOST = `127.0.0.1:${port}`;
    process.env.JOB_QUEUE_SCHEMA = schema;
    const queue = await import("~/modules/jobs/queue.server");
    const mail = await import("~/modules/mail/mail.server");
    stopQueue = queue.stopQueue;
    mail.declareMailWorker();
    await queue.startWorkers();

    const to = `outage-${randomUUID().slice(0, 8)}@example.test`;
    const started = Date.now();
    await mail.queueEmail({ to, subject: "Your inspection is booked", html: "<p>Booked.</p>", text: "Booked.", tag: "test" });
    // Queuing returns at once: it does not wait for (or notice) the service being down.
    expect(Date.now() - started).toBeLessThan(2_000);

    // Let the worker fail at least once against the closed port.
    const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
    await client.connect();
    let state = "";
    for (let waited = 0; waited < 20_000 && state !== "retry"; waited += 250) {
      await new Promise((resolve) => setTimeout(resolve, 250));
      const { rows } = await client.query(`select state from "${schema}".job where name = $1 and data->>'to' = $2`, [mail.MAIL_QUEUE, to]);
      state = rows[0]?.state ?? "";
    }
    expect(state).toBe("retry");

    standIn = await startMailStandIn({ port, dataDir, token: process.env.POSTMARK_SERVER_TOKEN });
    let delivered: { subject: string; text: string; html: string } | undefined;
    for (let waited = 0; waited < 60_000 && !delivered; waited += 500) {
      await new Promise((resolve) => setTimeout(resolve, 500));
      const response = await fetch(`${standIn.env.MAILBOX_URL}/api/messages/latest?to=${encodeURIComponent(to)}`);
      if (response.ok) delivered = await response.json();
    }
    expect(delivered).toMatchObject({ subject: "Your inspection is booked", text: "Booked.", html: "<p>Booked.</p>" });
    const { rows } = await client.query(`select state from "${schema}".job where name = $1 and data->>'to' = $2`, [mail.MAIL_QUEUE, to]);
    expect(rows[0]?.state).toBe("completed");
    await client.end();
  });
});
