// Public pages and public JSON carry no account ids: an inspector is named by the public id of their profile,
// a machine by its slug. Each page is read as HTML and as its loader data (`.data`), by a visitor and by a
// signed-in buyer, and searched for the account ids of everyone involved.
import { beforeAll, describe, expect, it } from "vitest";
import { signInCookie, testAppOrigin } from "../../support/accounts";
import { publicIdOf } from "../../support/inspections";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";

let filed: Awaited<ReturnType<typeof acceptedBooking>>;
let reportId: string;
let inspectorPublicId: string;
let buyerCookie: string;

beforeAll(async () => {
  filed = await acceptedBooking();
  reportId = (await fileAndSign(await inspectorCookie(filed.inspector), filed.bookingId, completeForm())).id;
  inspectorPublicId = await publicIdOf(filed.inspector.id);
  buyerCookie = await signInCookie(filed.buyer.email, filed.buyer.password);
}, 60_000);

const accountIds = () => [filed.inspector.id, filed.seller.id, filed.buyer.id];

async function read(path: string, cookie?: string) {
  const response = await fetch(`${testAppOrigin}${path}`, { headers: cookie ? { cookie } : {}, redirect: "manual" });
  expect(response.status, path).toBe(200);
  return response.text();
}

describe("public pages and JSON", () => {
  const pages = () => [
    "/inspectors",
    `/inspectors?region=${encodeURIComponent(filed.listing.region!)}`,
    `/inspectors/${inspectorPublicId}`,
    `/machines/${filed.listing.slug}`,
    `/machines/${filed.listing.slug}/book`,
    `/reports/${reportId}`,
  ];

  it("name the inspector by the profile's public id", async () => {
    expect(await read("/inspectors")).toContain(`/inspectors/${inspectorPublicId}`);
    expect(await read(`/machines/${filed.listing.slug}/book`, buyerCookie)).toContain(inspectorPublicId);
    const report = JSON.parse(await read(`/api/v1/reports/${reportId}`)) as { content: { inspector: { id: string } } };
    expect(report.content.inspector.id).toBe(inspectorPublicId);
  });

  it("carry no account id, as HTML or as loader data, to a visitor or a signed-in buyer", async () => {
    for (const path of pages()) {
      const [base, query = ""] = path.split("?");
      for (const cookie of [undefined, buyerCookie]) {
        const html = await read(path, cookie);
        const loaderData = await read(`${base}.data${query ? `?${query}` : ""}`, cookie);
        for (const id of accountIds()) {
          expect(html, `${path} as ${cookie ? "buyer" : "visitor"}`).not.toContain(id);
          expect(loaderData, `${path}.data as ${cookie ? "buyer" : "visitor"}`).not.toContain(id);
        }
      }
    }
  });

  it("the report's JSON and the listings API carry no account id", async () => {
    for (const path of [`/api/v1/reports/${reportId}`, `/api/v1/listings?q=${encodeURIComponent(filed.listing.make)}`]) {
      const json = await read(path);
      for (const id of accountIds()) expect(json, path).not.toContain(id);
    }
  });

  it("an account id no longer opens an inspector's page", async () => {
    const response = await fetch(`${testAppOrigin}/inspectors/${filed.inspector.id}`);
    expect(response.status).toBe(404);
  });
});
