// Tolerance profiles as reviewed data in PostgreSQL: four-eyes publishing, immutability after publishing
// (the database's trigger, not only the code), and reports that keep the version they were scored with.
import { and, eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { scoreReport } from "~/geometry";
import { toleranceProfiles } from "~/modules/profiles/schema";
import {
  draftNewVersion,
  ProfileRuleError,
  profilesForNewReports,
  publishDraftVersion,
  retireVersion,
  saveDraftVersion,
  scorableProfile,
} from "~/modules/profiles/service.server";
import type { ReportContent } from "~/modules/reports/content";
import { currentReportForListing, getReportEntry } from "~/modules/reports/service.server";
import { definitionOf, publishedMakersChart, twoStaff, db } from "../../support/profiles";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie, submitOverHttp } from "../../support/reports";

/** The database's own refusal (Drizzle wraps PostgreSQL's error as its cause). */
async function refusedByDatabase(attempt: Promise<unknown>, pattern: RegExp) {
  const error = await attempt.then(
    () => null,
    (caught: unknown) => caught as Error & { cause?: Error },
  );
  expect(error, "the database accepted the change").not.toBeNull();
  expect(String(error!.cause?.message ?? error!.message)).toMatch(pattern);
}

async function rowOf(key: string, version: number) {
  const [row] = await db.select().from(toleranceProfiles).where(and(eq(toleranceProfiles.key, key), eq(toleranceProfiles.version, version)));
  return row!;
}

describe("tolerance profiles in the database", () => {
  it("holds the built-in versions, published by the seed that runs with the migrations", async () => {
    const offered = await profilesForNewReports(db);
    const keys = offered.map((profile) => `${profile.key} v${profile.version}`);
    expect(keys).toEqual(expect.arrayContaining(["centre-lathe-normal v1", "centre-lathe-precision v1", "centre-lathe-precision v2"]));
    const v2 = offered.find((profile) => profile.key === "centre-lathe-precision" && profile.version === 2)!;
    expect(v2.rules.rounding).toMatchObject({ step: 2 }); // IS 6040:1993, clause 3.5
  });

  it("needs a second staff member to publish: the author cannot, in code or in the database", async () => {
    const staff = await twoStaff();
    const { key } = await publishedMakersChart(staff);
    const { version } = await draftNewVersion(db, staff.author, key, 1);
    expect(version).toBe(2);
    const draft = await rowOf(key, 2);
    await expect(publishDraftVersion(db, staff.author, key, 2, draft.revision)).rejects.toMatchObject({ status: 403 });
    // The database's check refuses it too, whatever the code does.
    await refusedByDatabase(db.update(toleranceProfiles).set({ status: "published", approverId: staff.author.id, publishedAt: new Date() }).where(eq(toleranceProfiles.id, draft.id)), /four_eyes/);
    // A reviewer publishes exactly the revision they read.
    await expect(publishDraftVersion(db, staff.reviewer, key, 2, draft.revision + 1)).rejects.toMatchObject({ status: 409 });
    await publishDraftVersion(db, staff.reviewer, key, 2, draft.revision);
    const published = await rowOf(key, 2);
    expect(published).toMatchObject({ status: "published", authorId: staff.author.id, approverId: staff.reviewer.id });
  });

  it("cannot change a published version: the trigger refuses updates and deletes", async () => {
    const staff = await twoStaff();
    const { key } = await publishedMakersChart(staff);
    const row = await rowOf(key, 1);
    const loosened = { ...(row.definition as object), title: "loosened" };
    await refusedByDatabase(db.update(toleranceProfiles).set({ definition: loosened }).where(eq(toleranceProfiles.id, row.id)), /cannot be changed/);
    await refusedByDatabase(db.execute(sql`UPDATE tolerance_profiles SET approver_id = author_id WHERE id = ${row.id}`), /cannot be changed/);
    await refusedByDatabase(db.delete(toleranceProfiles).where(eq(toleranceProfiles.id, row.id)), /cannot be deleted/);
    // Nor through the editor's own function.
    await expect(saveDraftVersion(db, staff.author, key, 1, { definition: row.definition, revision: row.revision })).rejects.toBeInstanceOf(ProfileRuleError);
    // Retiring is the one change allowed; the definition stays as it was.
    await retireVersion(db, staff.reviewer, key, 1, "Superseded by the maker's revised chart.");
    const retired = await rowOf(key, 1);
    expect(retired.status).toBe("retired");
    expect(retired.definition).toEqual(row.definition);
    await refusedByDatabase(db.update(toleranceProfiles).set({ status: "published" }).where(eq(toleranceProfiles.id, row.id)), /cannot be changed/);
  });

  it("refuses a bad value at its field and saves nothing", async () => {
    const staff = await twoStaff();
    const { key } = await publishedMakersChart(staff);
    await draftNewVersion(db, staff.author, key, 1);
    const draft = await definitionOf(key, 2);
    const nose = draft.tests.findIndex((test) => test.code === "L-SP-NOSE");
    const bad = structuredClone(draft) as unknown as { tests: Array<{ tolerance: Record<string, unknown> }>; title: string };
    bad.tests[nose]!.tolerance.tolerance = -3;
    bad.tests[1]!.tolerance.tolerance = Number.POSITIVE_INFINITY;
    bad.title = "\u200B\u200B"; // invisible only
    const refused = await saveDraftVersion(db, staff.author, key, 2, { definition: bad, revision: 1 }).catch((error) => error);
    expect(refused).toBeInstanceOf(ProfileRuleError);
    expect(Object.keys(refused.errors)).toEqual(expect.arrayContaining(["title", `tests.${nose}.tolerance.tolerance`, "tests.1.tolerance.tolerance"]));
    expect((await rowOf(key, 2)).revision).toBe(1);
    // Another staff member may not edit the author's draft.
    await expect(saveDraftVersion(db, staff.reviewer, key, 2, { definition: draft, revision: 1 })).rejects.toMatchObject({ status: 403 });
  });

  it("keeps a signed report on the version it was scored with after a newer one is published, and the next report uses the newer", async () => {
    const staff = await twoStaff();
    const chart = await publishedMakersChart(staff);
    const booked = await acceptedBooking({ make: chart.make, model: chart.model });
    const cookie = await inspectorCookie(booked.inspector);
    const form = { ...completeForm(), profile: { key: chart.key, version: 1, reason: "" } };
    const signed = await fileAndSign(cookie, booked.bookingId, form);
    expect(signed).toMatchObject({ profileKey: chart.key, profileVersion: 1, status: "signed" });

    // Staff tighten the spindle nose from 10 to 6 µm in version 2; a second staff member publishes it.
    await draftNewVersion(db, staff.author, chart.key, 1);
    const v2 = await definitionOf(chart.key, 2);
    const tightened = { ...v2, tests: v2.tests.map((test) => (test.code === "L-SP-NOSE" ? { ...test, tolerance: { ...test.tolerance, tolerance: 6 } as typeof test.tolerance } : test)) };
    const { revision } = await saveDraftVersion(db, staff.author, chart.key, 2, { definition: tightened, revision: 1 });
    await publishDraftVersion(db, staff.reviewer, chart.key, 2, revision);

    // The listing's report says it was scored against the maker's chart.
    const onListing = await currentReportForListing(db, booked.listing.id);
    expect(onListing?.profile).toMatchObject({ key: chart.key, version: 1, makersChart: chart.chart });

    // The signed report still names v1 and re-scores identically with the stored v1.
    const content = JSON.parse(signed.canonicalJson!) as ReportContent;
    expect(content.profile).toMatchObject({ key: chart.key, version: 1, makersChart: chart.chart });
    const v1 = await scorableProfile(db, chart.key, 1);
    expect(scoreReport(v1!.profile, content.measurements)).toEqual(content.score);

    // The next report on a machine of that make is offered v2 first.
    const next = await acceptedBooking({ make: chart.make, model: chart.model });
    const entry = await getReportEntry(db, { ...next.inspector, emailVerified: true, roles: ["inspector"], displayUnits: "mm", inspectorStatus: "certified" } as never, next.bookingId);
    expect(entry.suggestion.profile).toMatchObject({ key: chart.key, version: 2, makersChart: chart.chart });
    expect(entry.form.profile).toMatchObject({ key: chart.key, version: 2 });
  });

  it("tells the inspector of a lathe beyond every profile's scope that none covers it yet, instead of a dead end", async () => {
    // Normal class up to 800 mm swing (ISO 1708:1989, from memory): a 900 mm lathe is not covered.
    const booked = await acceptedBooking({ swingOverBedMm: 900 });
    const entry = await getReportEntry(db, { ...booked.inspector, emailVerified: true, roles: ["inspector"], displayUnits: "mm", inspectorStatus: "certified" } as never, booked.bookingId);
    expect(entry.suggestion).toMatchObject({ profile: null, uncovered: true });
    expect(entry.suggestion.reason).toMatch(/No profile covers this machine yet; staff can add one/);
    // The form still opens, on the nearest class, so the inspector can file with a reason.
    expect(entry.form.profile.key).toBe("centre-lathe-normal");
  });

  it("takes no new report on a retired version; a report already signed with it keeps it", async () => {
    const staff = await twoStaff();
    const chart = await publishedMakersChart(staff);
    const first = await acceptedBooking({ make: chart.make, model: chart.model });
    const signed = await fileAndSign(await inspectorCookie(first.inspector), first.bookingId, { ...completeForm(), profile: { key: chart.key, version: 1, reason: "" } });
    await retireVersion(db, staff.reviewer, chart.key, 1, "The maker withdrew this chart.");

    const next = await acceptedBooking({ make: chart.make, model: chart.model });
    const refused = await submitOverHttp(await inspectorCookie(next.inspector), next.bookingId, { ...completeForm(), profile: { key: chart.key, version: 1, reason: "" } });
    expect(refused.status).toBe(422);
    expect(await refused.text()).toMatch(/has been retired by staff; choose a current profile/);
    // No longer suggested: the machine falls back to the general class.
    const entry = await getReportEntry(db, { ...next.inspector, emailVerified: true, roles: ["inspector"], displayUnits: "mm", inspectorStatus: "certified" } as never, next.bookingId);
    expect(entry.suggestion.profile?.key).toBe("centre-lathe-normal");
    // The signed report is untouched and still re-scores the same with the retired version.
    const content = JSON.parse(signed.canonicalJson!) as ReportContent;
    const retired = await scorableProfile(db, chart.key, 1);
    expect(retired?.status).toBe("retired");
    expect(scoreReport(retired!.profile, content.measurements)).toEqual(content.score);
  });
});
