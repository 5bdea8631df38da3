// One event, one e-mail per person: a buyer whose three saved searches all match a newly verified machine
// hears of it once, in a message naming the three; the buyer who booked the inspection (told by the report
// notice) gets no alert on top; a saved search that repeats another one, in other units too, is refused.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import type { SessionUser } from "~/modules/accounts/guards.server";
import { savedSearchAlerts, savedSearches } from "~/modules/search/saved-searches/schema";
import { saveSearch, SavedSearchRuleError } from "~/modules/search/saved-searches/service.server";
import { createTestUser, testAppOrigin, type TestUser } from "../../support/accounts";
import { emailsTo, latestEmailTo, linkIn } from "../../support/mailbox";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";

const db = getDatabase();

function asSessionUser(user: TestUser, displayUnits: "mm" | "inch" = "mm"): SessionUser {
  return { id: user.id, email: user.email, name: user.name, emailVerified: true, roles: ["buyer"], displayUnits, inspectorStatus: "none" };
}

describe("one e-mail per event per person", () => {
  it("refuses a saved search that repeats one already kept, in other units too", async () => {
    const buyer = asSessionUser(await createTestUser({ name: "Oda Brenner" }), "inch");
    await saveSearch(db, buyer, { name: "Big swing, tight spindle", queryString: "swingMin=400&runoutMax=5.08&category=centre_lathe&country=DE&country=AT" });
    // The same filters from an inch form, with the lists in another order.
    const again = saveSearch(db, buyer, { name: "Same again", queryString: "country=AT&country=DE&category=centre_lathe&swingMinIn=15.748031496&runoutMaxIn=0.0002" });
    await expect(again).rejects.toBeInstanceOf(SavedSearchRuleError);
    await expect(again).rejects.toThrow("You already keep this search as “Big swing, tight spindle”");
    // A different limit is a different search.
    await expect(saveSearch(db, buyer, { name: "Looser", queryString: "swingMin=400&runoutMax=6&category=centre_lathe&country=DE&country=AT" })).resolves.toBeTruthy();
    expect(await db.select().from(savedSearches).where(eq(savedSearches.userId, buyer.id))).toHaveLength(2);
  });

  it("merges every matching search into one message and adds nothing to the report notice", { timeout: 90_000 }, async () => {
    const booking = await acceptedBooking();
    const region = booking.listing.region!;
    const watcher = await createTestUser({ name: "Tomas Quell" });
    const names = ["Lathes near Oderland", "Verified, run-out 5 µm", "Any verified lathe"];
    await saveSearch(db, asSessionUser(watcher), { name: names[0]!, queryString: new URLSearchParams({ region }).toString() });
    await saveSearch(db, asSessionUser(watcher), { name: names[1]!, queryString: new URLSearchParams({ region, verified: "1", runoutMax: "5" }).toString() });
    await saveSearch(db, asSessionUser(watcher), { name: names[2]!, queryString: new URLSearchParams({ region, verified: "1", category: "centre_lathe" }).toString() });
    // The buyer who booked also keeps a matching search: the report notice is their one message.
    const booker = await saveSearch(db, asSessionUser(booking.buyer), { name: "My lathe", queryString: new URLSearchParams({ region, verified: "1" }).toString() });

    await fileAndSign(await inspectorCookie(booking.inspector), booking.bookingId, completeForm());

    const alert = await latestEmailTo(watcher.email, { waitMs: 30_000, matching: (message) => message.tag === "saved-search-alert" });
    expect(alert.subject).toBe("Now verified: Tessmar DL 330 matches 3 of your saved searches");
    for (const name of names) expect(alert.text).toContain(`“${name}”`);
    await latestEmailTo(booking.buyer.email, { waitMs: 30_000, matching: (message) => message.tag === "report-signed" });
    // Give the index worker time to have sent anything it was going to.
    await expect.poll(async () => (await db.select().from(savedSearchAlerts).where(eq(savedSearchAlerts.savedSearchId, booker.id))).length, { timeout: 20_000 }).toBe(2);
    await new Promise((resolve) => setTimeout(resolve, 1_500));
    expect((await emailsTo(watcher.email)).filter((message) => message.tag === "saved-search-alert")).toHaveLength(1);
    expect((await emailsTo(booking.buyer.email)).map((message) => message.tag).filter((tag) => tag === "saved-search-alert")).toEqual([]);

    // The one-click link stops all three searches the message named.
    const unsubscribe = linkIn(alert, `${testAppOrigin}/saved-searches/unsubscribe?token=`);
    const page = await fetch(unsubscribe);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("Stop alerts for");
    const oneClick = await fetch(unsubscribe, { method: "POST", body: new URLSearchParams({ "List-Unsubscribe": "One-Click" }) });
    expect(oneClick.status).toBe(200);
    const after = await db.select().from(savedSearches).where(eq(savedSearches.userId, watcher.id));
    expect(after.map((row) => row.alertsEnabled)).toEqual([false, false, false]);
    // A token naming one more search than was signed does nothing.
    const token = new URL(unsubscribe).searchParams.get("token")!;
    const [ids, mac] = token.split(".");
    const tampered = `${ids}~${booker.id}.${mac}`;
    expect((await fetch(`${testAppOrigin}/saved-searches/unsubscribe?token=${encodeURIComponent(tampered)}`, { method: "POST", body: new URLSearchParams({ "List-Unsubscribe": "One-Click" }) })).status).toBe(404);
    expect((await db.select().from(savedSearches).where(eq(savedSearches.id, booker.id)))[0]!.alertsEnabled).toBe(true);
  });
});
