// The watchlist digest: a watcher hears at most once a day, in one message, that a watched machine dropped in
// price, was verified, or was sold; a price rise is no news; one click (RFC 8058) stops the digests.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import type { SessionUser } from "~/modules/accounts/guards.server";
import { listings, listingWatches, watchDigests } from "~/modules/listings/schema";
import { setWatch } from "~/modules/listings/service.server";
import { sendWatchDigests } from "~/modules/listings/watchlist.server";
import { createTestUser, testAppOrigin, type TestUser } from "../../support/accounts";
import { emailsTo, latestEmailTo, linkIn } from "../../support/mailbox";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";
import { insertPublishedLathe } from "../../support/listings";

const db = getDatabase();
const day = 24 * 60 * 60 * 1000;

function asSessionUser(user: TestUser): SessionUser {
  return { id: user.id, email: user.email, name: user.name, emailVerified: true, roles: ["buyer"], displayUnits: "mm", inspectorStatus: "none" };
}

const lathe = (sellerId: string, priceMinor: number) => insertPublishedLathe(sellerId, { slugPrefix: "watched-lathe", description: "Test lathe for the watchlist", priceMinor });

const digestsTo = async (address: string) => (await emailsTo(address)).filter((message) => message.tag === "watch-digest");

describe("the watchlist digest", () => {
  it("tells of a price drop, a verification and a sale, one message a day at most, until unsubscribed", { timeout: 90_000 }, async () => {
    const booking = await acceptedBooking();
    const watcher = await createTestUser({ name: "Jonte Ravell" });
    const viewer = asSessionUser(watcher);
    const cheaper = await lathe(booking.seller.id, 1_500_000);
    const dearer = await lathe(booking.seller.id, 900_000);
    for (const id of [cheaper.id, dearer.id, booking.listing.id]) await setWatch(db, viewer, id, true);

    // Nothing changed yet: no e-mail.
    const start = Date.now() + 40 * day;
    await sendWatchDigests(db, new Date(start));
    expect(await digestsTo(watcher.email)).toHaveLength(0);

    // A drop and a rise: only the drop is news; and the booked lathe is verified.
    await db.update(listings).set({ priceMinor: 1_350_000 }).where(eq(listings.id, cheaper.id));
    await db.update(listings).set({ priceMinor: 950_000 }).where(eq(listings.id, dearer.id));
    await fileAndSign(await inspectorCookie(booking.inspector), booking.bookingId, completeForm());
    await sendWatchDigests(db, new Date(start + day));
    const first = await latestEmailTo(watcher.email, { matching: (message) => message.tag === "watch-digest" });
    expect(first.subject).toBe("2 of your watched machines changed");
    expect(first.text).toContain(`${cheaper.make} ${cheaper.model}`);
    expect(first.text).toMatch(/Price down from €15,000 to €13,500/);
    expect(first.text).toContain("Now verified: an inspector signed an accuracy report, grade B.");
    expect(first.text).not.toContain(dearer.model);
    const unsubscribe = linkIn(first, `${testAppOrigin}/watched/unsubscribe?token=`);
    expect(first.headers).toEqual(
      expect.arrayContaining([
        { name: "List-Unsubscribe", value: `<${unsubscribe}>` },
        { name: "List-Unsubscribe-Post", value: "List-Unsubscribe=One-Click" },
      ]),
    );

    // Sold the same day: it waits for the next day's digest.
    await db.update(listings).set({ status: "sold", soldAt: new Date() }).where(eq(listings.id, dearer.id));
    await sendWatchDigests(db, new Date(start + day + 60_000));
    expect(await digestsTo(watcher.email)).toHaveLength(1);
    await sendWatchDigests(db, new Date(start + 2 * day));
    const second = await latestEmailTo(watcher.email, { matching: (message) => message.tag === "watch-digest" && message.text.includes("Sold.") });
    expect(second.subject).toBe(`Watched machine: ${dearer.make} ${dearer.model} — Sold.`);
    expect(await digestsTo(watcher.email)).toHaveLength(2);
    // Told once: the marks moved on.
    const [mark] = await db.select().from(listingWatches).where(eq(listingWatches.listingId, dearer.id));
    expect(mark!.seenStatus).toBe("sold");

    // One click from a mail client (no Origin): the digests stop; a forged token changes nothing.
    const forged = await fetch(`${testAppOrigin}/watched/unsubscribe?token=${watcher.id}.AAAA`, { method: "POST", body: new URLSearchParams({ "List-Unsubscribe": "One-Click" }) });
    expect(forged.status).toBe(404);
    const page = await fetch(unsubscribe);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain("Stop the watched-machines e-mail?");
    const oneClick = await fetch(unsubscribe, { method: "POST", body: new URLSearchParams({ "List-Unsubscribe": "One-Click" }) });
    expect(oneClick.status).toBe(200);
    expect((await db.select().from(watchDigests).where(eq(watchDigests.userId, watcher.id)))[0]!.digestsOff).toBe(true);
    await db.update(listings).set({ priceMinor: 1_200_000 }).where(eq(listings.id, cheaper.id));
    await sendWatchDigests(db, new Date(start + 4 * day));
    await new Promise((resolve) => setTimeout(resolve, 1_000));
    expect(await digestsTo(watcher.email)).toHaveLength(2);
  });
});
