import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { reportDrafts } from "~/modules/reports/schema";
import { testAppOrigin } from "../../support/accounts";
import { acceptedBooking, completeForm, db, inspectorCookie, saveDraftOverHttp } from "../../support/reports";

describe("report drafts", () => {
  it("survive a reload: a half-typed draft saved over HTTP comes back in the entry page as typed", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const form = completeForm();
    // Half typed: one far reading of the mandrel missing, an odd number typed as the inspector typed it.
    form.tests["L-SP-PAR-H"] = { kind: "mandrel", near0: "0", near180: "0", far0: "6", far180: "", instrumentId: "i1" };
    form.tests["L-SP-NOSE"] = { kind: "sweep", readings: ["0", "2,5", "4", "2"], instrumentId: "i1" };
    form.notes = "Tailstock sleeve lock is stiff — note 7731";
    const saved = await saveDraftOverHttp(cookie, booked.bookingId, form);
    expect(saved.status).toBe(200);
    const body = (await saved.json()) as { version: number; issues: Record<string, string[]> };
    expect(body.version).toBe(1);
    expect(body.issues).toEqual({});

    // A second save bumps the version; nothing else is lost.
    const again = await saveDraftOverHttp(cookie, booked.bookingId, form);
    expect(((await again.json()) as { version: number }).version).toBe(2);

    const page = await fetch(`${testAppOrigin}/inspector/bookings/${booked.bookingId}/report`, { headers: { cookie } });
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("Tailstock sleeve lock is stiff — note 7731");
    expect(html).toContain("2,5");

    const [row] = await db.select().from(reportDrafts).where(eq(reportDrafts.bookingId, booked.bookingId));
    const stored = row!.form as ReturnType<typeof completeForm>;
    expect(stored.tests["L-SP-PAR-H"]).toMatchObject({ far0: "6", far180: "" });
    expect(row!.version).toBe(2);
  });

  it("keeps readings the engine would refuse, and names the problem at the field", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const form = completeForm();
    form.tests["L-BED-V"] = { kind: "profile", points: [{ station: "0", reading: "0" }, { station: "0", reading: "3" }, { station: "500", reading: "x" }], instrumentId: "i1" };
    const saved = await saveDraftOverHttp(cookie, booked.bookingId, form);
    expect(saved.status).toBe(200);
    const { issues } = (await saved.json()) as { issues: Record<string, string[]> };
    expect(issues["tests.L-BED-V.points.2.reading"]).toEqual(["Not a number."]);
  });

  it("refuses a draft of the wrong shape with 422 and stores nothing", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const form = completeForm({ "L-NO-SUCH": { kind: "sweep", readings: ["1", "2"] } });
    const refused = await saveDraftOverHttp(cookie, booked.bookingId, form);
    expect(refused.status).toBe(422);
    const wrongKind = completeForm({ "L-SP-NOSE": { kind: "mandrel", near0: "1", near180: "1", far0: "1", far180: "1" } });
    expect((await saveDraftOverHttp(cookie, booked.bookingId, wrongKind)).status).toBe(422);
    const rows = await db.select().from(reportDrafts).where(eq(reportDrafts.bookingId, booked.bookingId));
    expect(rows).toHaveLength(0);
  });

  it("is only the booking's own inspector's to write", async () => {
    const booked = await acceptedBooking();
    const other = await acceptedBooking();
    const cookie = await inspectorCookie(other.inspector);
    const refused = await saveDraftOverHttp(cookie, booked.bookingId, completeForm());
    expect(refused.status).toBe(404);
    const page = await fetch(`${testAppOrigin}/inspector/bookings/${booked.bookingId}/report`, { headers: { cookie } });
    expect(page.status).toBe(404);
  });
});
