// A report signed through the reports pages makes the app queue an index update; its worker indexes the
// listing and e-mails saved searches that match the newly verified machine, and only those, once.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import type { SessionUser } from "~/modules/accounts/guards.server";
import { queueListingIndexUpdate } from "~/modules/search/indexing.server";
import { savedSearchAlerts, savedSearches } from "~/modules/search/saved-searches/schema";
import { saveSearch } from "~/modules/search/saved-searches/service.server";
import { createTestUser, testAppOrigin, type TestUser } from "../../support/accounts";
import { emailsTo, latestEmailTo, linkIn } from "../../support/mailbox";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";

const db = getDatabase();

function asSessionUser(user: TestUser, displayUnits: "mm" | "inch" = "mm"): SessionUser {
  return { id: user.id, email: user.email, name: user.name, emailVerified: true, roles: ["buyer"], displayUnits, inspectorStatus: "none" };
}

const alertsTo = async (address: string) => (await emailsTo(address)).filter((message) => message.tag === "saved-search-alert");

describe("saved-search alerts", () => {
  it("e-mails the saved search a newly verified listing matches, not the one it misses, and only once", { timeout: 90_000 }, async () => {
    const booking = await acceptedBooking();
    const region = booking.listing.region!;
    const matching = await createTestUser({ name: "Ines Calloway", displayUnits: "inch" });
    const missing = await createTestUser({ name: "Petr Danek" });
    const wanted = await saveSearch(db, asSessionUser(matching, "inch"), {
      name: "Verified lathes, run-out to a fifth of a thou",
      queryString: new URLSearchParams({ region, category: "centre_lathe", verified: "1", runoutMaxIn: "0.0002" }).toString(),
    });
    const tooTight = await saveSearch(db, asSessionUser(missing), {
      name: "Run-out 2 µm or better",
      queryString: new URLSearchParams({ region, verified: "1", runoutMax: "2" }).toString(),
    });
    // Kept canonical: µm, whatever the form sent.
    expect(wanted.queryString).toBe(`category=centre_lathe&verified=1&region=${encodeURIComponent(region).replace(/%20/g, "+")}&runoutMax=5.08`);

    // Spindle run-out 4 µm, grade B (the reports' complete form).
    await fileAndSign(await inspectorCookie(booking.inspector), booking.bookingId, completeForm());

    const alert = await latestEmailTo(matching.email, { waitMs: 30_000, matching: (message) => message.tag === "saved-search-alert" });
    expect(alert.subject).toBe(`Now verified: Tessmar DL 330 matches “Verified lathes, run-out to a fifth of a thou”`);
    expect(alert.text).toContain(`${testAppOrigin}/machines/${booking.listing.slug}`);
    // The buyer reads inches: 4 µm is 0.00016 in.
    expect(alert.text).toContain("Grade B · spindle run-out 0.00016 in");
    const unsubscribe = linkIn(alert, `${testAppOrigin}/saved-searches/unsubscribe?token=`);
    // Mail clients' own unsubscribe: the same link as a header, with one-click POST (RFC 2369, RFC 8058).
    expect(alert.headers).toEqual(
      expect.arrayContaining([
        { name: "List-Unsubscribe", value: `<${unsubscribe}>` },
        { name: "List-Unsubscribe-Post", value: "List-Unsubscribe=One-Click" },
      ]),
    );

    // The listing is re-indexed again (e.g. an edit): no second e-mail.
    await queueListingIndexUpdate(booking.listing.id);
    await new Promise((resolve) => setTimeout(resolve, 4_000));
    expect(await alertsTo(matching.email)).toHaveLength(1);
    expect(await alertsTo(missing.email)).toHaveLength(0);
    const sent = await db.select().from(savedSearchAlerts).where(eq(savedSearchAlerts.listingId, booking.listing.id));
    expect(sent.filter((row) => row.savedSearchId === tooTight.id)).toEqual([]);
    expect(sent.filter((row) => row.savedSearchId === wanted.id).map((row) => row.occasion).sort()).toEqual(["listed", "verified"]);

    // One-click unsubscribe: the GET only asks, the POST stops the alerts; a forged token does nothing.
    const page = await fetch(unsubscribe);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain("Stop alerts for");
    const [before] = await db.select().from(savedSearches).where(eq(savedSearches.id, wanted.id));
    expect(before!.alertsEnabled).toBe(true);
    const forged = await fetch(`${testAppOrigin}/saved-searches/unsubscribe?token=${wanted.id}.AAAA`, { method: "POST", headers: { origin: testAppOrigin } });
    expect(forged.status).toBe(404);
    expect((await fetch(`${testAppOrigin}/saved-searches/unsubscribe?token=${wanted.id}.AAAA`)).status).toBe(404);
    expect((await db.select().from(savedSearches).where(eq(savedSearches.id, wanted.id)))[0]!.alertsEnabled).toBe(true);
    const body = new FormData();
    body.set("token", new URL(unsubscribe).searchParams.get("token")!);
    const stopped = await fetch(`${testAppOrigin}/saved-searches/unsubscribe`, { method: "POST", body, headers: { origin: testAppOrigin } });
    expect(stopped.status).toBe(200);
    // A mail client's one-click POST: the token in the address, the RFC 8058 body, no Origin header.
    await db.update(savedSearches).set({ alertsEnabled: true }).where(eq(savedSearches.id, wanted.id));
    const oneClick = await fetch(unsubscribe, {
      method: "POST",
      body: new URLSearchParams({ "List-Unsubscribe": "One-Click" }),
    });
    expect(oneClick.status).toBe(200);
    expect((await db.select().from(savedSearches).where(eq(savedSearches.id, wanted.id)))[0]!.alertsEnabled).toBe(false);
  });
});
