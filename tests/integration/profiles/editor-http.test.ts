// The staff editor over HTTP: staff only; the author edits and cannot publish; a second staff member publishes
// the revision they read; a bad value answers 422 with its field's message and changes nothing.
import { describe, expect, it } from "vitest";
import { createTestUser, signInCookie, testAppOrigin } from "../../support/accounts";
import { definitionOf, publishedMakersChart, twoStaff } from "../../support/profiles";

function post(path: string, cookie: string, fields: Record<string, string>) {
  const body = new FormData();
  for (const [name, value] of Object.entries(fields)) body.set(name, value);
  return fetch(`${testAppOrigin}${path}`, { method: "POST", body, headers: { cookie, origin: testAppOrigin }, redirect: "manual" });
}

describe("the profile editor over HTTP", () => {
  it("is for staff only", async () => {
    const inspector = await createTestUser({ roles: ["inspector"], inspectorStatus: "certified" });
    const cookie = await signInCookie(inspector.email, inspector.password);
    const page = await fetch(`${testAppOrigin}/admin/profiles`, { headers: { cookie }, redirect: "manual" });
    expect(page.status).toBe(403);
    const draft = await post("/admin/profiles", cookie, { key: "centre-lathe-normal", fromVersion: "1" });
    expect(draft.status).toBe(403);
  });

  it("lets the author draft and edit, refuses the author's publishing, and publishes with a second staff member", async () => {
    const staff = await twoStaff();
    const chart = await publishedMakersChart(staff);
    const authorCookie = await signInCookie(staff.author.email, staff.author.password);
    const reviewerCookie = await signInCookie(staff.reviewer.email, staff.reviewer.password);

    const drafted = await post("/admin/profiles", authorCookie, { key: chart.key, fromVersion: "1" });
    expect(drafted.status).toBe(302);
    expect(drafted.headers.get("location")).toBe(`/admin/profiles/${chart.key}/2`);

    // The reviewer may not edit the author's draft.
    const editPage = await fetch(`${testAppOrigin}/admin/profiles/${chart.key}/2/tests/L-SP-NOSE`, { headers: { cookie: reviewerCookie }, redirect: "manual" });
    expect(editPage.status).toBe(403);

    // The author cannot publish their own draft.
    const selfPublished = await post(`/admin/profiles/${chart.key}/2`, authorCookie, { intent: "publish", revision: "1" });
    expect(selfPublished.status).toBe(403);
    expect((await definitionOf(chart.key, 2)).version).toBe(2);

    // The reviewer publishes the revision they read; publishing again is refused (nothing left to publish).
    const published = await post(`/admin/profiles/${chart.key}/2`, reviewerCookie, { intent: "publish", revision: "1" });
    expect(published.status).toBe(200);
    const again = await post(`/admin/profiles/${chart.key}/2`, reviewerCookie, { intent: "publish", revision: "1" });
    expect(again.status).toBe(409);
  });

  it("answers a bad tolerance with 422 and its field's message, and saves nothing", async () => {
    const staff = await twoStaff();
    const chart = await publishedMakersChart(staff);
    const cookie = await signInCookie(staff.author.email, staff.author.password);
    await post("/admin/profiles", cookie, { key: chart.key, fromVersion: "1" });
    const before = await definitionOf(chart.key, 2);
    const response = await post(`/admin/profiles/${chart.key}/2/tests/L-SP-NOSE`, cookie, {
      revision: "1",
      code: "L-SP-NOSE",
      title: "Spindle nose",
      measures: "Run-out of the spindle nose centring diameter",
      instrument: "Indicator",
      "measuringLength.nominal": "",
      "measuringLength.description": "One revolution or more",
      "tolerance.type": "fixed",
      "tolerance.tolerance": "1e400",
      "tolerance.source.confidence": "from-memory",
      method: "run-out",
      "direction.allowed": "any",
      "direction.positive": "no sign",
      "direction.source.confidence": "common-practice",
      unit: "µm",
      required: "on",
    });
    expect(response.status).toBe(422);
    expect(await response.text()).toMatch(/The tolerance must be a number/);
    expect(await definitionOf(chart.key, 2)).toEqual(before);
  });
});
