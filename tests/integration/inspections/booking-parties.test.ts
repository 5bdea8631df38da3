// Each party to a booking loads only its part: the page's HTML and its loader data (the `.data` request a
// browser makes on navigation) are read as the buyer, the inspector, the listing's seller and staff, and
// searched for what that party must not receive.
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { bookings } from "~/modules/inspections/schema";
import { createTestUser, signInCookie, testAppOrigin, type TestUser } from "../../support/accounts";
import { heldBooking } from "../../support/inspections";
import { acceptedBooking } from "../../support/reports";

const db = getDatabase();

type Party = "buyer" | "inspector" | "seller" | "admin";
let paid: Awaited<ReturnType<typeof acceptedBooking>>;
let held: Awaited<ReturnType<typeof heldBooking>>;
let paidRow: typeof bookings.$inferSelect;
let heldRow: typeof bookings.$inferSelect;
let admin: TestUser;
const cookies = new Map<string, string>();

async function cookieOf(person: TestUser) {
  if (!cookies.has(person.id)) cookies.set(person.id, await signInCookie(person.email, person.password));
  return cookies.get(person.id)!;
}

/** The page and its loader data, as one text to search. */
async function whatLoads(path: string, person: TestUser) {
  const cookie = await cookieOf(person);
  const page = await fetch(`${testAppOrigin}${path}`, { headers: { cookie }, redirect: "manual" });
  const loaderData = await fetch(`${testAppOrigin}${path}.data`, { headers: { cookie }, redirect: "manual" });
  expect(page.status, path).toBe(200);
  expect(loaderData.status, `${path}.data`).toBe(200);
  return `${await page.text()}\n${await loaderData.text()}`;
}

beforeAll(async () => {
  paid = await acceptedBooking();
  held = await heldBooking();
  admin = await createTestUser({ roles: ["admin"] });
  // A paid booking carries the payment's references; give it one we can look for.
  await db.update(bookings).set({ paymentIntentId: `pi_test_${randomUUID().replace(/-/g, "")}` }).where(eq(bookings.id, paid.bookingId));
  [paidRow] = await db.select().from(bookings).where(eq(bookings.id, paid.bookingId));
  [heldRow] = await db.select().from(bookings).where(eq(bookings.id, held.bookingId));
  expect(heldRow!.checkoutUrl).toBeTruthy();
  expect(paidRow!.paymentIntentId).toBeTruthy();
}, 60_000);

describe("the paid booking's page", () => {
  const people = (): Record<Party, TestUser> => ({ buyer: paid.buyer, inspector: paid.inspector, seller: paid.seller, admin });
  const pathFor = (party: Party) => (party === "inspector" ? `/inspector/bookings/${paid.bookingId}` : `/bookings/${paid.bookingId}`);

  it.each<Party>(["buyer", "inspector", "seller"])("the %s receives no payment reference and no account id", async (party) => {
    const loaded = await whatLoads(pathFor(party), people()[party]);
    expect(loaded).toContain(paidRow.reference);
    expect(loaded).not.toContain(paidRow.paymentIntentId!);
    for (const person of [paid.buyer, paid.inspector, paid.seller]) expect(loaded).not.toContain(person.id);
    expect(loaded).not.toContain(paid.listing.id);
  });

  it.each<Party>(["inspector", "seller"])("the %s does not receive the buyer's e-mail address", async (party) => {
    const loaded = await whatLoads(pathFor(party), people()[party]);
    expect(loaded).not.toContain(paid.buyer.email);
  });

  it("the seller sees that an inspection is booked, when and by whom, but not the money or the buyer", async () => {
    const loaded = await whatLoads(pathFor("seller"), paid.seller);
    expect(loaded).toContain(paid.inspector.name);
    expect(loaded).not.toContain(paid.buyer.name);
    expect(loaded).not.toMatch(/feeMinor|platformFeeMinor|inspectorShareMinor|refundedMinor/);
  });

  it("the inspector sees the fee and their share", async () => {
    const loaded = await whatLoads(pathFor("inspector"), paid.inspector);
    expect(loaded).toMatch(/inspectorShareMinor/);
    expect(loaded).toContain(paid.buyer.name);
  });

  it("staff see the payment reference and the buyer's address, to answer questions", async () => {
    const loaded = await whatLoads(pathFor("admin"), admin);
    expect(loaded).toContain(paidRow.paymentIntentId!);
    expect(loaded).toContain(paid.buyer.email);
  });
});

describe("a booking awaiting payment", () => {
  it("only the buyer receives the live checkout address", async () => {
    const url = heldRow.checkoutUrl!;
    expect(await whatLoads(`/bookings/${held.bookingId}`, held.buyer)).toContain(url);
    expect(await whatLoads(`/bookings/${held.bookingId}`, held.listing.seller)).not.toContain(url);
    expect(await whatLoads(`/bookings/${held.bookingId}`, admin)).not.toContain(url);
  });
});

describe("the dashboards' lists", () => {
  it("the inspector's list carries no buyer address, payment reference or checkout address", async () => {
    const loaded = await whatLoads("/inspector/bookings", paid.inspector);
    expect(loaded).toContain(paidRow.reference);
    expect(loaded).not.toContain(paid.buyer.email);
    expect(loaded).not.toContain(paidRow.paymentIntentId!);
    expect(loaded).not.toContain(paid.buyer.id);
  });

  it("the buyer's list carries no payment reference or account ids", async () => {
    const loaded = await whatLoads("/bookings", paid.buyer);
    expect(loaded).toContain(paidRow.reference);
    expect(loaded).not.toContain(paidRow.paymentIntentId!);
    expect(loaded).not.toContain(paid.inspector.id);
    expect(loaded).not.toContain(paid.buyer.id);
  });
});
