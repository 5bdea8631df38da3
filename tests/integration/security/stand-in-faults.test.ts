// Each hosted service down, slow or failing while someone works: an app server of this test's own talks to
// the stand-ins through fault proxies (tests/support/fault-proxy.ts). Each case asserts what the person is
// told, that nothing half-written is left, and that the work completes once the service is back.
import { spawn, type ChildProcess } from "node:child_process";
import { randomUUID } from "node:crypto";
import { mkdtempSync, openSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, eq, inArray } from "drizzle-orm";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { acceptBooking } from "~/modules/inspections/bookings.server";
import { startPayoutOnboarding } from "~/modules/inspections/payouts.server";
import { bookings, payoutAccounts, payouts } from "~/modules/inspections/schema";
import { listingPhotos, listings } from "~/modules/listings/schema";
import { startSearchStandIn } from "../../../search/stand-in/index.ts";
import { freePort } from "../../../scripts/lib/ports.ts";
import { waitForHttp } from "../../../scripts/lib/processes.ts";
import { createTestUser, type TestUser } from "../../support/accounts";
import { startFaultProxy, type FaultProxy } from "../../support/fault-proxy";
import { jpegWithGps } from "../../support/images";
import { certifiedInspector, paidBooking, publishedLathe } from "../../support/inspections";
import { validListingFields } from "../../support/listings";
import { emailsTo, latestEmailTo } from "../../support/mailbox";

const db = getDatabase();
const root = path.resolve(import.meta.dirname, "../../..");
const queueSchema = `pgboss_faults_${randomUUID().slice(0, 8)}`;

let app: ChildProcess | undefined;
let origin: string;
let proxies: Record<"files" | "payments" | "search" | "mail", FaultProxy>;
// A search stand-in of this test's own: this server's start-up re-index and index updates must not race the
// shared index that other tests (saved-search alerts) watch.
const searchDataDir = mkdtempSync(path.join(os.tmpdir(), "faults-search-"));
let search: Awaited<ReturnType<typeof startSearchStandIn>> | undefined;
const appLog = path.join(os.tmpdir(), `tenthmark-faults-app-${randomUUID().slice(0, 8)}.log`);

beforeAll(async () => {
  search = await startSearchStandIn({ port: await freePort(), dataDir: searchDataDir, masterKey: process.env.MEILISEARCH_API_KEY });
  proxies = {
    files: await startFaultProxy(process.env.S3_ENDPOINT!),
    payments: await startFaultProxy(`http://127.0.0.1:${process.env.STRIPE_API_PORT}`),
    search: await startFaultProxy(search.env.MEILISEARCH_HOST),
    mail: await startFaultProxy(`http://${process.env.POSTMARK_API_HOST}`),
  };
  const port = await freePort();
  origin = `http://localhost:${port}`;
  app = spawn(process.execPath, [path.join(root, "server/index.mjs"), process.env.TEST_SERVER_BUILD!], {
    cwd: root,
    env: {
      ...process.env,
      NODE_ENV: "production",
      PORT: String(port),
      HOST: "127.0.0.1",
      APP_ORIGIN: origin,
      S3_ENDPOINT: proxies.files.url,
      STRIPE_API_PORT: String(proxies.payments.port),
      STRIPE_TIMEOUT_MS: "1000",
      MEILISEARCH_HOST: proxies.search.url,
      MEILISEARCH_SEARCH_TIMEOUT_MS: "300",
      POSTMARK_API_HOST: `127.0.0.1:${proxies.mail.port}`,
      // A queue of its own, so that the main app server's workers (which reach the stand-ins directly) take none of its jobs.
      JOB_QUEUE_SCHEMA: queueSchema,
    },
    // Its log, to read when a case fails: in the test run's work folder.
    stdio: ["ignore", openSync(appLog, "a"), openSync(appLog, "a")],
  });
  await waitForHttp(`http://127.0.0.1:${port}/api/health`);
}, 60_000);

afterAll(async () => {
  app?.kill("SIGTERM");
  await Promise.all(Object.values(proxies ?? {}).map((proxy) => proxy.stop()));
  await search?.stop();
  rmSync(searchDataDir, { recursive: true, force: true });
  const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
  await client.connect();
  await client.query(`drop schema if exists "${queueSchema}" cascade`);
  await client.end();
});

async function signIn(person: TestUser) {
  const response = await fetch(`${origin}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin },
    body: JSON.stringify({ email: person.email, password: person.password }),
  });
  expect(response.status).toBe(200);
  return response.headers.getSetCookie().map((line) => line.split(";")[0]).join("; ");
}

function post(pathname: string, cookie: string | undefined, fields: Record<string, string>, accept = "text/html") {
  const body = new FormData();
  for (const [name, value] of Object.entries(fields)) body.set(name, value);
  return fetch(`${origin}${pathname}`, { method: "POST", body, headers: { origin, accept, ...(cookie ? { cookie } : {}) }, redirect: "manual" });
}

async function until<T>(what: string, probe: () => Promise<T | undefined | null | false>, waitMs = 60_000): Promise<T> {
  const deadline = Date.now() + waitMs;
  for (;;) {
    const found = await probe();
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`${what} did not happen within ${waitMs} ms`);
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
}

describe("payments down, slow or failing while a buyer books", () => {
  it("says the payment service is unavailable, holds no slot, and books once it is back", async () => {
    const inspector = await certifiedInspector();
    const lathe = await publishedLathe(inspector.region);
    const buyer = await createTestUser();
    const cookie = await signIn(buyer);
    const book = () => post(`/machines/${lathe.slug}/book`, cookie, { inspectorId: inspector.publicId, slotId: inspector.slot.id, acceptTerms: "on" });
    const activeBookings = () =>
      db.select().from(bookings).where(and(eq(bookings.inspectorId, inspector.id), inArray(bookings.status, ["awaiting_payment", "paid", "accepted"])));

    for (const fault of [{ kind: "error" } as const, { kind: "down" } as const, { kind: "slow", delayMs: 2_500 } as const]) {
      proxies.payments.set(fault);
      const refused = await book();
      expect(refused.status, fault.kind).toBe(503);
      const page = await refused.text();
      expect(page).toContain("Payments are unavailable right now");
      expect(page).toContain("Your slot was not held; nothing was charged.");
      expect(await activeBookings(), `no slot held after ${fault.kind}`).toEqual([]);
    }

    proxies.payments.set({ kind: "pass" });
    const booked = await book();
    expect(booked.status).toBe(302);
    expect(booked.headers.get("location")).toMatch(/\/pay\//);
    expect(await activeBookings()).toHaveLength(1);
  });
});

describe("payments down while an inspector sets up payouts or is paid", () => {
  it("says so when set-up cannot start, keeps nothing half-made, and starts it once the service is back", async () => {
    const inspector = await createTestUser({ roles: ["inspector"], inspectorStatus: "certified" });
    const cookie = await signIn(inspector);
    for (const fault of [{ kind: "down" } as const, { kind: "error" } as const]) {
      proxies.payments.set(fault);
      const refused = await post("/inspector/profile", cookie, { intent: "payouts" });
      expect(refused.status, fault.kind).toBe(503);
      expect(await refused.text()).toContain("The payment provider is not answering, so payout set-up could not start. Nothing was lost");
      expect(await db.select().from(payoutAccounts).where(eq(payoutAccounts.userId, inspector.id))).toEqual([]);
    }
    proxies.payments.set({ kind: "pass" });
    const started = await post("/inspector/profile", cookie, { intent: "payouts" });
    expect(started.status).toBe(302);
    expect(started.headers.get("location")).toMatch(/\/connect\/onboarding\//);
    expect(await db.select().from(payoutAccounts).where(eq(payoutAccounts.userId, inspector.id))).toHaveLength(1);
  });

  it("a transfer that cannot reach the service is retried by the queue and made once it is back", async () => {
    const held = await paidBooking();
    await acceptBooking(db, held.inspector, held.bookingId);
    // The inspector's account is ready; the share's first transfer attempt failed earlier and staff retry it here.
    const url = await startPayoutOnboarding(db, held.inspector);
    await fetch(url, { method: "POST", body: new URLSearchParams({ choice: "complete" }), redirect: "manual" });
    const account = await until("account ready", async () => {
      const [row] = await db.select().from(payoutAccounts).where(eq(payoutAccounts.userId, held.inspector.id));
      return row?.payoutsEnabled ? row : undefined;
    });
    await db.update(bookings).set({ status: "report_filed" }).where(eq(bookings.id, held.bookingId));
    await db.insert(payouts).values({ bookingId: held.bookingId, inspectorId: held.inspector.id, amountMinor: held.booking.inspectorShareMinor, currency: "EUR", status: "failed", destination: account.stripeAccountId, transferredMinor: held.booking.inspectorShareMinor });
    const admin = await createTestUser({ roles: ["admin"] });
    const adminCookie = await signIn(admin);

    proxies.payments.set({ kind: "down" });
    const retried = await post("/admin/payments", adminCookie, { intent: "retry-payout", bookingId: held.bookingId });
    expect(retried.status).toBe(200);
    const waiting = await until("a failed attempt recorded", async () => {
      const [row] = await db.select().from(payouts).where(eq(payouts.bookingId, held.bookingId));
      return row?.lastError ? row : undefined;
    });
    expect(waiting).toMatchObject({ status: "due", stripeTransferId: null });
    expect(waiting.lastError).toMatch(/unavailable/);

    proxies.payments.set({ kind: "pass" });
    const paid = await until("the transfer made on a retry", async () => {
      const [row] = await db.select().from(payouts).where(eq(payouts.bookingId, held.bookingId));
      return row?.status === "transferred" ? row : undefined;
    });
    expect(paid.stripeTransferId).toMatch(/^tr_/);
    const [booking] = await db.select().from(bookings).where(eq(bookings.id, held.bookingId));
    expect(booking!.status).toBe("closed");
  });
});

describe("file storage down or failing while a seller uploads a photo", () => {
  it("says nothing was saved, leaves no photo row, and takes the same upload when storage is back", async () => {
    const seller = await createTestUser({ roles: ["seller"] });
    const cookie = await signIn(seller);
    const created = await post("/sell/new", cookie, validListingFields());
    expect(created.status).toBe(302);
    const listingId = /\/sell\/listings\/([0-9a-f-]{36})/.exec(created.headers.get("location") ?? "")![1]!;
    const photo = await jpegWithGps();
    const endpoint = `/sell/listings/${listingId}/photos`;

    const presign = await post(endpoint, cookie, { intent: "presign", fileName: "front.jpg", size: String(photo.length), contentType: "image/jpeg" }, "application/json");
    expect(presign.status).toBe(200);
    const ticket = (await presign.json()) as { uploadUrl: string; uploadKey: string };
    expect(ticket.uploadUrl.startsWith(proxies.files.url)).toBe(true);

    // The browser's PUT fails while storage is down; the page's confirm step is told so in words.
    proxies.files.set({ kind: "down" });
    await expect(fetch(ticket.uploadUrl, { method: "PUT", body: new Uint8Array(photo), headers: { "content-type": "image/jpeg" } })).rejects.toThrow();
    for (const fault of [{ kind: "down" } as const, { kind: "error" } as const]) {
      proxies.files.set(fault);
      const confirm = await post(endpoint, cookie, { intent: "confirm", fileName: "front.jpg", uploadKey: ticket.uploadKey }, "application/json");
      expect(confirm.status, fault.kind).toBe(503);
      expect(await confirm.json()).toEqual({ error: "File storage is not answering. Nothing was saved; try again in a moment." });
      expect(await db.select().from(listingPhotos).where(eq(listingPhotos.listingId, listingId))).toEqual([]);
    }

    // Back: the same ticket is still good; the retried PUT and confirm store one photo.
    proxies.files.set({ kind: "pass" });
    const put = await fetch(ticket.uploadUrl, { method: "PUT", body: new Uint8Array(photo), headers: { "content-type": "image/jpeg" } });
    expect(put.status).toBe(200);
    const confirmed = await post(endpoint, cookie, { intent: "confirm", fileName: "front.jpg", uploadKey: ticket.uploadKey }, "application/json");
    expect(confirmed.status).toBe(200);
    expect(await db.select().from(listingPhotos).where(eq(listingPhotos.listingId, listingId))).toHaveLength(1);
  });
});

describe("search down or slow while a buyer searches and a seller publishes", () => {
  it("answers from PostgreSQL and says so, and the index catches up with what was published meanwhile", async () => {
    const seller = await createTestUser({ roles: ["seller"] });
    const cookie = await signIn(seller);
    const word = `Quarzwerk${randomUUID().slice(0, 6).replace(/-/g, "")}`;
    const created = await post("/sell/new", cookie, validListingFields({ make: word }));
    const listingId = /\/sell\/listings\/([0-9a-f-]{36})/.exec(created.headers.get("location") ?? "")![1]!;
    const photo = await jpegWithGps();
    const ticket = (await (await post(`/sell/listings/${listingId}/photos`, cookie, { intent: "presign", fileName: "a.jpg", size: String(photo.length), contentType: "image/jpeg" }, "application/json")).json()) as {
      uploadUrl: string;
      uploadKey: string;
    };
    await fetch(ticket.uploadUrl, { method: "PUT", body: new Uint8Array(photo), headers: { "content-type": "image/jpeg" } });
    expect((await post(`/sell/listings/${listingId}/photos`, cookie, { intent: "confirm", fileName: "a.jpg", uploadKey: ticket.uploadKey }, "application/json")).status).toBe(200);

    const search = async () => {
      const response = await fetch(`${origin}/api/v1/listings?q=${word}`);
      expect(response.status).toBe(200);
      return (await response.json()) as { source: string; notice: string | null; hits: Array<{ id: string }> };
    };

    proxies.search.set({ kind: "down" });
    const published = await post(`/sell/listings/${listingId}`, cookie, { intent: "publish" });
    expect(published.status, "publishing does not wait for the index").toBe(302);
    expect((await db.select().from(listings).where(eq(listings.id, listingId)))[0]!.status).toBe("published");

    for (const fault of [{ kind: "down" } as const, { kind: "slow", delayMs: 2_000 } as const, { kind: "error" } as const]) {
      proxies.search.set(fault);
      const answer = await search();
      expect(answer.source, fault.kind).toBe("database");
      expect(answer.notice).toMatch(/the search service is not answering/);
      // Nothing is lost: the database answers with the listing the index has not seen yet.
      expect(answer.hits.map((hit) => hit.id)).toContain(listingId);
    }

    proxies.search.set({ kind: "pass" });
    const caughtUp = await until("the index catching up", async () => {
      const answer = await search();
      return answer.source === "index" && answer.hits.some((hit) => hit.id === listingId) && answer;
    });
    expect(caughtUp.notice).toBeNull();
  }, 90_000);
});

describe("e-mail failing while someone asks for a password reset", () => {
  it("answers at once, keeps the message queued, and delivers it when the mail service is back", async () => {
    const person = await createTestUser();
    proxies.mail.set({ kind: "error" });
    const asked = await post("/forgot-password", undefined, { email: person.email });
    expect(asked.status).toBe(200);
    expect(await asked.text()).toContain(person.email);
    await until("a failed delivery attempt", async () => proxies.mail.seen > 0, 20_000);
    expect(await emailsTo(person.email)).toEqual([]);

    proxies.mail.set({ kind: "pass" });
    const message = await latestEmailTo(person.email, { waitMs: 60_000 });
    expect(message.subject).toMatch(/password/i);
  }, 90_000);
});
