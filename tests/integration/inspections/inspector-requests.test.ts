// Where no inspector serves a machine's region, buyers can ask for one: the request is kept once per person
// and region, inspectors working in the country hear of the region's first request, staff see the demand,
// and everybody who asked is e-mailed when an inspector adds the region to their profile.
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import type { SessionUser } from "~/modules/accounts/guards.server";
import { inspectorRequests } from "~/modules/demand/schema";
import { InspectorRequestRuleError, openDemandByRegion, requestInspector } from "~/modules/demand/service.server";
import { saveProfile } from "~/modules/inspections/profiles.server";
import { listings } from "~/modules/listings/schema";
import { createTestUser, testAppOrigin, type TestUser } from "../../support/accounts";
import { certifiedInspector, publishedLathe } from "../../support/inspections";
import { emailsTo, latestEmailTo } from "../../support/mailbox";

const db = getDatabase();

function asSessionUser(user: TestUser): SessionUser {
  return { id: user.id, email: user.email, name: user.name, emailVerified: true, roles: ["buyer"], displayUnits: "mm", inspectorStatus: "none" };
}

async function latheIn(region: string, country: string) {
  const lathe = await publishedLathe(region);
  await db.update(listings).set({ country }).where(eq(listings.id, lathe.id));
  return lathe;
}

describe("asking for an inspector where none serves", () => {
  it("records one request per person and region, tells the country's inspectors once, and answers when a region is served", { timeout: 60_000 }, async () => {
    // An inspector who works in Austria (serves a region where a machine is listed there) and one who does not yet.
    const austrian = await certifiedInspector({ region: `Linzberg ${randomUUID().slice(0, 6)}` });
    await latheIn(austrian.region, "AT");
    const wanted = `Kaltmoor ${randomUUID().slice(0, 6)}`;
    const lathe = await latheIn(wanted, "AT");
    const first = await createTestUser({ name: "Alma Reisinger" });
    const second = await createTestUser({ name: "Bruno Sedlak" });

    await expect(requestInspector(db, asSessionUser(first), lathe.slug)).resolves.toEqual({ recorded: true });
    await expect(requestInspector(db, asSessionUser(first), lathe.slug)).resolves.toEqual({ recorded: false });
    await expect(requestInspector(db, asSessionUser(second), lathe.slug)).resolves.toEqual({ recorded: true });
    expect(await db.select().from(inspectorRequests).where(eq(inspectorRequests.listingId, lathe.id))).toHaveLength(2);

    const told = await latestEmailTo(austrian.email, { matching: (message) => message.tag === "inspector-wanted" });
    expect(told.subject).toBe(`Inspector wanted in ${wanted}, Austria`);
    expect(told.text).toContain(`${testAppOrigin}/inspector/profile`);
    await new Promise((resolve) => setTimeout(resolve, 1_000));
    expect((await emailsTo(austrian.email)).filter((message) => message.tag === "inspector-wanted")).toHaveLength(1);

    const demand = (await openDemandByRegion(db)).find((row) => row.region === wanted);
    expect(demand).toMatchObject({ country: "Austria", requests: 2 });

    // The inspector adds the region (in other letter case): both who asked hear of it, once.
    await saveProfile(db, austrian.id, {
      headline: "Lathe rebuilder",
      bio: "Thirty years of rebuilding centre lathes and checking their geometry.",
      qualifications: "Master machinist; calibrated 1 µm indicators",
      baseCity: "Harrowgate",
      regions: [austrian.region, wanted.toLocaleUpperCase()],
      currency: "EUR",
      categories: ["centre_lathe"],
      feeMinorByCategory: { centre_lathe: 42_000 },
    });
    for (const person of [first, second]) {
      const served = await latestEmailTo(person.email, { matching: (message) => message.tag === "inspector-now-serves" });
      expect(served.subject).toBe(`An inspector now serves ${wanted}, Austria`);
      expect(served.text).toContain(`${testAppOrigin}/machines/${lathe.slug}/book`);
    }
    expect((await openDemandByRegion(db)).find((row) => row.region === wanted)).toBeUndefined();

    // Served now: a new request is refused with the way on.
    const third = await createTestUser();
    await expect(requestInspector(db, asSessionUser(third), lathe.slug)).rejects.toBeInstanceOf(InspectorRequestRuleError);
  });
});
