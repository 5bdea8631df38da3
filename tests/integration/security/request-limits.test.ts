// No request can stall the server: every API and report route caps its body before anything reads it, the
// measurement schema caps counts and magnitudes with a message that names the limit, and the health check
// keeps answering while oversized scoring requests are refused.
import { describe, expect, it } from "vitest";
import { BODY_LIMITS, bodyLimitFor, MAX_BODY_BYTES } from "~/modules/security/middleware.server";
import { testAppOrigin } from "../../support/accounts";

const evaluations = `${testAppOrigin}/api/v1/evaluations`;

function evaluationOf(points: Array<{ station: number; reading: number }>) {
  return JSON.stringify({
    profile: { key: "centre-lathe-normal", version: 1 },
    units: "mm",
    measurements: { tests: { "L-CAR-H": { kind: "profile", reference: "minimum-zone", points } } },
  });
}

const stations = (count: number) => Array.from({ length: count }, (_, i) => ({ station: (i * 1000) / count, reading: (i * 7919) % 13 }));

function post(url: string, body: BodyInit, contentType = "application/json") {
  return fetch(url, { method: "POST", headers: { "content-type": contentType }, body });
}

describe("scoring requests", () => {
  it("with 50 000 stations are refused with the size limit's message, and the health check answers meanwhile", async () => {
    const body = evaluationOf(stations(50_000));
    expect(Buffer.byteLength(body)).toBeGreaterThan(bodyLimitFor("/api/v1/evaluations"));
    const big = Array.from({ length: 6 }, () => post(evaluations, body));
    const health = fetch(`${testAppOrigin}/api/health`);
    const [healthResponse, ...refused] = await Promise.all([health, ...big]);
    expect(healthResponse.status).toBe(200);
    for (const response of refused) {
      expect(response.status).toBe(413);
      expect(await response.json()).toEqual({ error: "body_too_large", message: "This request is larger than the 1 MB this address accepts." });
    }
  });

  it("with 1 001 stations under the size limit get a 422 naming the 1 000-station limit at the field", async () => {
    const response = await post(evaluations, evaluationOf(stations(1001)));
    expect(response.status).toBe(422);
    const { errors } = (await response.json()) as { errors: Record<string, string[]> };
    expect(errors["measurements.tests.L-CAR-H.points"]![0]).toMatch(/At most 1 000 stations per test/);
  });

  it("with 1 000 stations are scored", async () => {
    const response = await post(evaluations, evaluationOf(stations(1000)));
    expect(response.status).toBe(200);
    expect((await response.json()).results[0].code).toBe("L-CAR-H");
  });

  it("with ±1e308, or a number that overflows to Infinity, get a 422 at the reading's field", async () => {
    const points = [
      { station: 0, reading: 0 },
      { station: 500, reading: 1e308 },
      { station: 1000, reading: -1e308 },
    ];
    const response = await post(evaluations, evaluationOf(points));
    expect(response.status).toBe(422);
    const { errors } = (await response.json()) as { errors: Record<string, string[]> };
    expect(errors["measurements.tests.L-CAR-H.points.1.reading"]![0]).toMatch(/within ±100 000 µm \(100 mm\)/);
    expect(errors["measurements.tests.L-CAR-H.points.2.reading"]).toBeDefined();

    // JSON.parse reads 1e999 as Infinity.
    const overflowing = await post(evaluations, evaluationOf(points).replace("-1e+308", "-1e999"));
    expect(overflowing.status).toBe(422);
    const overflow = (await overflowing.json()) as { errors: Record<string, string[]> };
    expect(overflow.errors["measurements.tests.L-CAR-H.points.2.reading"]![0]).toMatch(/must be a number/);
  });
});

describe("body caps", () => {
  const routes: Array<[string, string]> = [
    ["/api/v1/evaluations", "application/json"],
    ["/api/v1/listings", "application/json"],
    ["/api/v1/reports/verify", "application/json"],
    ["/api/v1/reports/00000000-0000-4000-8000-000000000000", "application/json"],
    ["/api/auth/sign-in/email", "application/json"],
    ["/api/webhooks/stripe", "application/json"],
    ["/api/health", "application/json"],
    ["/inspector/bookings/00000000-0000-4000-8000-000000000000/report/draft", "application/json"],
    ["/inspector/bookings/00000000-0000-4000-8000-000000000000/report", "multipart/form-data; boundary=x"],
    ["/inspector/bookings/00000000-0000-4000-8000-000000000000/report.data", "multipart/form-data; boundary=x"],
    ["/inspector/bookings/00000000-0000-4000-8000-000000000000/report/review", "application/x-www-form-urlencoded"],
  ];

  it("cover every API route and the report's draft, submit and sign, each well below the upload limit", () => {
    for (const [path] of routes) expect(bodyLimitFor(path), path).toBeLessThanOrEqual(2 * 1024 * 1024);
    expect(BODY_LIMITS.every((limit) => limit.bytes < MAX_BODY_BYTES)).toBe(true);
  });

  it.each(routes)("%s refuses one byte over its cap with a 413 that names the cap, before anything reads it", async (path, contentType) => {
    const limit = bodyLimitFor(path);
    const response = await fetch(`${testAppOrigin}${path}`, {
      method: "POST",
      headers: { origin: testAppOrigin, "content-type": contentType, accept: "application/json" },
      body: new Uint8Array(limit + 1),
    });
    expect(response.status).toBe(413);
    const text = await response.text();
    expect(text).toMatch(/larger than the \d+ (KB|MB) this address accepts/);
  });
});
