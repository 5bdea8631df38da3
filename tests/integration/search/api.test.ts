// GET /api/v1/listings through HTTP against the app under test: per-field 400s for bad parameters, and the
// search's JSON for good ones (the app's own indexing worker puts a published listing in the index).
import { describe, expect, it } from "vitest";
import { queueListingIndexUpdate } from "~/modules/search/indexing.server";
import { getListingsApi, insertListings, uniqueWord } from "../../support/search";

describe("GET /api/v1/listings", () => {
  it("answers 400 with a message per bad parameter", async () => {
    const response = await getListingsApi(
      new URLSearchParams([
        ["runoutMax", "a lot"],
        ["category", "steam_hammer"],
        ["priceMin", "5000"],
        ["swingMin", "400"],
        ["swingMax", "300"],
        ["page", "0"],
        ["sort", "cheapest"],
        ["units", "cubits"],
      ]).toString(),
    );
    expect(response.status).toBe(400);
    const body = (await response.json()) as { error: string; errors: Record<string, string[]> };
    expect(body.error).toBe("invalid_query");
    expect(Object.keys(body.errors).sort()).toEqual(["category", "currency", "page", "runoutMax", "sort", "swingMax", "units"]);
    expect(body.errors.runoutMax).toEqual(["Spindle run-out (µm) must be a number."]);
    expect(body.errors.currency![0]).toMatch(/currency/);
    expect(body.errors.swingMax![0]).toMatch(/upper limit is below the lower one/);
  });

  it("refuses a limit of zero or below and an inch limit over half an inch", async () => {
    const response = await getListingsApi("runoutMax=0&axialSlipMaxIn=2&reportAgeMax=1.5");
    expect(response.status).toBe(400);
    const { errors } = (await response.json()) as { errors: Record<string, string[]> };
    expect(errors).toMatchObject({
      runoutMax: ["Spindle run-out (µm) must be more than 0."],
      axialSlipMaxIn: ["Axial slip (in) must be at most 0.5."],
      reportAgeMax: ["Report age (days) must be a whole number."],
    });
  });

  it("returns the search as JSON: hits, totals, facets and the canonical query", async () => {
    const word = uniqueWord();
    const [listing] = await insertListings([{ make: word, model: "CL 310", swingOverBedMm: 310 }]);
    await queueListingIndexUpdate(listing!.id);
    let body: any;
    for (let waited = 0; waited < 20_000; waited += 250) {
      const response = await getListingsApi(`q=${word}&swingMinIn=12&category=centre_lathe`);
      expect(response.status).toBe(200);
      expect(response.headers.get("content-type")).toMatch(/application\/json/);
      body = await response.json();
      if (body.totalHits > 0) break;
      await new Promise((resolve) => setTimeout(resolve, 250));
    }
    expect(body).toMatchObject({ source: "index", notice: null, totalHits: 1, page: 1, totalPages: 1 });
    expect(body.hits[0]).toMatchObject({ id: listing!.id, url: `/machines/${listing!.slug}`, title: `${word} CL 310`, verified: false, grade: null, report: null, swingMm: 310 });
    expect(body.facets.category).toEqual({ centre_lathe: 1 });
    // 12 in is 304.8 mm exactly; the query comes back in mm.
    expect(body.queryString).toBe(`q=${word}&category=centre_lathe&swingMin=304.8`);
  });
});
