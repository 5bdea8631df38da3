import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { testAppOrigin } from "../../support/accounts";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";

describe("GET /api/v1/reports/verify", () => {
  it("says which signed report a hash belongs to", async () => {
    const booked = await acceptedBooking();
    const signed = await fileAndSign(await inspectorCookie(booked.inspector), booked.bookingId, completeForm());
    const response = await fetch(`${testAppOrigin}/api/v1/reports/verify?hash=${signed.contentHash}`);
    expect(response.status).toBe(200);
    expect(await response.json()).toMatchObject({
      match: true,
      intact: true,
      hash: signed.contentHash,
      report: { id: signed.id, status: "signed", revision: 1, grade: "B", machine: "Tessmar DL 330", url: `${testAppOrigin}/reports/${signed.id}` },
    });
    // Upper case is the same hash.
    const upper = await fetch(`${testAppOrigin}/api/v1/reports/verify?hash=${signed.contentHash!.toUpperCase()}`);
    expect(((await upper.json()) as { match: boolean }).match).toBe(true);
  });

  it("answers no match for a well-formed hash no report has", async () => {
    // SHA-256("abc") = ba7816bf… (FIPS 180-2, appendix B.1): well formed, and no report's.
    const abc = createHash("sha256").update("abc").digest("hex");
    expect(abc).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    const response = await fetch(`${testAppOrigin}/api/v1/reports/verify?hash=${abc}`);
    expect(response.status).toBe(200);
    expect(await response.json()).toEqual({ match: false, hash: abc });
  });

  it("answers 400 with a message for bad input", async () => {
    for (const bad of ["", "abc", "z".repeat(64), "a".repeat(63), "a".repeat(65), "%27%20or%201%3D1"]) {
      const response = await fetch(`${testAppOrigin}/api/v1/reports/verify?hash=${bad}`);
      expect(response.status, bad).toBe(400);
      const body = (await response.json()) as { errors: { hash: string[] } };
      expect(body.errors.hash[0]).toMatch(/64 hexadecimal/);
    }
  });

  it("answers 404 for a report id that is not a signed report", async () => {
    expect((await fetch(`${testAppOrigin}/api/v1/reports/5f2b1b7e-0000-4000-8000-000000000000`)).status).toBe(404);
    expect((await fetch(`${testAppOrigin}/api/v1/reports/not-a-uuid`)).status).toBe(404);
  });
});
