import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { CENTRE_LATHE_NORMAL, scoreReport } from "~/geometry";
import type { ReportContent } from "~/modules/reports/content";
import { reports } from "~/modules/reports/schema";
import { acceptedBooking, completeForm, db, inspectorCookie, reportRows, submitOverHttp } from "../../support/reports";

describe("submitting a report", () => {
  it("scores on the server and ignores any grade, score or result the browser sends", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const form = completeForm({
      // Spindle run-out 14 µm against the 10 µm tolerance (ISO 1708:1989, from memory, as in the profile): out.
      "L-SP-NOSE": { kind: "sweep", readings: ["0", "7", "14", "6"], instrumentId: "i1", result: { pass: true, value: 1 } },
    });
    const tampered = {
      ...form,
      score: { grade: "A", keyFigures: { spindleRunOut: 1 }, results: [] },
      grade: "A",
      preview: { grade: "A" },
    };
    const response = await submitOverHttp(cookie, booked.bookingId, tampered);
    expect(response.status).toBe(302);
    const [row] = await reportRows(booked.bookingId);
    expect(row!.status).toBe("draft");
    const content = row!.content as ReportContent;

    // The same readings scored here by the engine directly: the server's result must be that, not the browser's.
    const expected = scoreReport(CENTRE_LATHE_NORMAL, content.measurements);
    expect(content.score).toEqual(expected);
    expect(row!.grade).toBe("C");
    expect(content.score.keyFigures.spindleRunOut).toBe(14);
    const nose = content.score.results.find((result) => result.code === "L-SP-NOSE")!;
    expect(nose.pass).toBe(false);
    expect(nose.tolerance).toBe(10);
    // GEOMETRY.md worked example: mandrel far +30/+10, near 0/0 → +20 µm over 300 mm, passes the 20 µm test at the limit.
    const vertical = content.score.results.find((result) => result.code === "L-SP-PAR-V")!;
    expect(vertical.value).toBe(20);
    expect(vertical.pass).toBe(true);
    expect(JSON.stringify(content)).not.toContain('"preview"');
  });

  it("converts inch readings exactly (1 in = 25.4 mm, NIST SP 811) before scoring", async () => {
    const booked = await acceptedBooking({ inspectorUnits: "inch" });
    const cookie = await inspectorCookie(booked.inspector);
    const form = completeForm();
    form.units = "inch";
    form.instruments[0]!.resolution = "0.0001";
    // 0.0002 in = 5.08 µm of run-out (GEOMETRY.md: 0.0001 in = 2.54 µm).
    form.tests = { "L-SP-NOSE": { kind: "extremes", max: "0.0002", min: "0", instrumentId: "i1" } };
    expect((await submitOverHttp(cookie, booked.bookingId, form)).status).toBe(302);
    const [row] = await db.select().from(reports).where(eq(reports.bookingId, booked.bookingId));
    const content = row!.content as ReportContent;
    expect(content.score.keyFigures.spindleRunOut).toBeCloseTo(5.08, 9);
    expect(content.instruments[0]!.resolution).toBeCloseTo(2.54, 9);
    expect(row!.grade).toBe("incomplete");
  });

  it("refuses incomplete readings and a missing safety acknowledgement with 422, keeping the typed draft", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const form = completeForm({ "L-SP-PAR-H": { kind: "mandrel", near0: "0", near180: "0", far0: "6", far180: "", instrumentId: "i1" } });
    form.safetyAcknowledged = false;
    const response = await submitOverHttp(cookie, booked.bookingId, form);
    expect(response.status).toBe(422);
    const text = await response.text();
    expect(text).toContain("Give all four readings");
    expect(text).toContain("Read the safety cautions");
    expect(await reportRows(booked.bookingId)).toHaveLength(0);
  });
});
