// A reading no instrument of these tests can give (±1e308, a number that overflows to Infinity, a travel
// longer than 100 m) is refused at its field when the draft is saved and when it is submitted, and nothing
// is stored: such a report could never be scored, signed or shown.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { reportDrafts } from "~/modules/reports/schema";
import { acceptedBooking, completeForm, db, inspectorCookie, reportRows, saveDraftOverHttp, submitOverHttp } from "../../support/reports";

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
});
