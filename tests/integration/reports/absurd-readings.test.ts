// A reading no instrument of these tests can give (±1e308, a number that overflows to Infinity, a travel
// longer than 100 m) is refused at its field when the draft is saved and when it is submitted, and nothing
// is stored: such a report could never be scored, signed or shown.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import type { ReportContent } from "~/modules/reports/content";
import { reportDrafts, reports } from "~/modules/reports/schema";
import { testAppOrigin } from "../../support/accounts";
import {
  acceptedBooking,
  asStoredBeforeTheLimits,
  completeForm,
  db,
  inspectorCookie,
  reportRows,
  saveDraftOverHttp,
  signOverHttp,
  submitOverHttp,
} from "../../support/reports";

const absurd = completeForm({
  "L-BED-V": { kind: "profile", points: [{ station: "0", reading: "0" }, { station: "500", reading: "1e308" }, { station: "1000", reading: "0" }], instrumentId: "i1" },
  "L-SP-NOSE": { kind: "sweep", readings: ["0", "-1e999"], instrumentId: "i1" },
});

describe("absurd readings", () => {
  it("are refused at their fields when a draft is saved, and nothing is saved", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const response = await saveDraftOverHttp(cookie, booked.bookingId, absurd);
    expect(response.status).toBe(422);
    const body = (await response.json()) as { error: string; errors: Record<string, string[]> };
    expect(body.error).toMatch(/nothing was saved/);
    expect(body.errors["tests.L-BED-V.points.1.reading"]![0]).toMatch(/within ±100 000 µm \(100 mm\)/);
    expect(body.errors["tests.L-SP-NOSE.readings.1"]![0]).toMatch(/within ±100 000 µm/);
    expect(await db.select().from(reportDrafts).where(eq(reportDrafts.bookingId, booked.bookingId))).toEqual([]);
  });

  it("are refused at their fields on submit, so no report is scored or can be signed", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const response = await submitOverHttp(cookie, booked.bookingId, absurd);
    expect(response.status).toBe(422);
    const text = await response.text();
    expect(text).toContain("tests.L-BED-V.points.1.reading");
    expect(text).toMatch(/within ±100 000 µm \(100 mm\)/);
    expect(await reportRows(booked.bookingId)).toEqual([]);
  });

  it("in inches are judged in inches: 5 in is beyond the 3.937 in an indicator reads", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const form = { ...completeForm({ "L-SP-SLIP": { kind: "extremes", max: "5", min: "0", instrumentId: "i1" } }), units: "inch" };
    const response = await saveDraftOverHttp(cookie, booked.bookingId, form);
    expect(response.status).toBe(422);
    const body = (await response.json()) as { errors: Record<string, string[]> };
    expect(body.errors["tests.L-SP-SLIP.max"]![0]).toMatch(/±3.937 in \(100 mm\)/);
  });

  it("scored into a result before they were refused cannot be signed; the review shows the readings and a notice", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    expect((await submitOverHttp(cookie, booked.bookingId, completeForm())).status).toBe(302);
    const [scored] = await reportRows(booked.bookingId);
    // What the code before the limits scored and stored for ±1e308 readings.
    const content = asStoredBeforeTheLimits(scored!.content as ReportContent, scored!.id, booked.bookingId);
    await db.update(reports).set({ content }).where(eq(reports.id, scored!.id));

    const review = await fetch(`${testAppOrigin}/inspector/bookings/${booked.bookingId}/report/review`, { headers: { cookie } });
    expect(review.status).toBe(200);
    expect(await review.text()).toContain("cannot be scored or drawn");

    const signing = await signOverHttp(cookie, booked.bookingId, scored!.id);
    expect(signing.status).toBe(422);
    expect(await signing.text()).toContain("This result cannot be signed");
    const [after] = await reportRows(booked.bookingId);
    expect(after!.status).toBe("draft");
    expect(after!.canonicalJson).toBeNull();
  });
});
