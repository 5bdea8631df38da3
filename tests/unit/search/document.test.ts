// The listing-to-document mapping and the translation of a buyer's search into the index's filter and sort.
import { describe, expect, it } from "vitest";
import { listingToSearchDocument, type SearchableListing, type SearchableReport } from "../../../search/document.ts";
import { listingFilter, listingSortRules, quoteFilterValue } from "../../../search/query.ts";
import { listingIndexSettings } from "../../../search/settings.ts";
import { conditionsOf, evaluateFilter, parseFilter, parseFilterExpression } from "../../../search/stand-in/filter.ts";

// An invented dealer's machine.
const listing: SearchableListing = {
  id: "lst_01",
  slug: "orvik-cl-360-centre-lathe-1998-k3f9q2",
  status: "published",
  category: "centre_lathe",
  categoryLabel: "Centre lathe",
  condition: "reconditioned",
  make: "Orvik",
  model: "CL-360",
  year: 1998,
  description: "Reconditioned, new spindle bearings.",
  swingMm: 360,
  betweenCentresMm: 1000,
  spindleBoreMm: 52,
  priceMinor: 1_450_000,
  currency: "EUR",
  city: "Aldmoor",
  region: "North Brae",
  country: "DE",
  sellerName: "Aldmoor Machine Exchange",
  publishedAt: new Date("2026-03-01T10:00:00.900Z"),
  photoUrl: "/files/lst_01/thumb.webp",
};

const report: SearchableReport = {
  id: "rep_07",
  grade: "B",
  measuredOn: new Date("2026-02-20T00:00:00Z"),
  keyFigures: {
    spindleRunOut: 4,
    axialSlip: 2.5,
    spindleParallelismVertical: -7,
    spindleParallelismHorizontal: 3,
    centreHeight: 11,
    bedStraightness: null,
    tableFlatness: null,
    travelSquareness: null,
    xPositioningAccuracy: null,
    xRepeatability: null,
    yPositioningAccuracy: null,
    yRepeatability: null,
    zPositioningAccuracy: null,
    zRepeatability: null,
  },
};

describe("listingToSearchDocument", () => {
  it("carries the report's grade, date and key figures as magnitudes in µm", () => {
    const document = listingToSearchDocument(listing, report);
    expect(document).toMatchObject({
      id: "lst_01",
      title: "Orvik CL-360",
      verified: true,
      reportId: "rep_07",
      grade: "B",
      gradeRank: 2,
      // 2026-02-20T00:00:00Z and 2026-03-01T10:00:00Z in epoch seconds (whole seconds, rounded down).
      reportDate: 1_771_545_600,
      publishedAt: 1_772_359_200,
      spindleRunoutUm: 4,
      axialSlipUm: 2.5,
      spindleParallelismVerticalUm: 7,
      spindleParallelismHorizontalUm: 3,
      centreHeightUm: 11,
      bedStraightnessUm: null,
    });
  });

  it("marks a listing without a report as not verified, with empty figures", () => {
    const document = listingToSearchDocument({ ...listing, publishedAt: null }, null);
    expect(document).toMatchObject({ verified: false, grade: null, gradeRank: null, reportDate: null, spindleRunoutUm: null, publishedAt: null });
  });

  it("does not call a listing verified when its current report is incomplete, but keeps its figures", () => {
    const document = listingToSearchDocument(listing, { ...report, grade: "incomplete" });
    expect(document).toMatchObject({ verified: false, grade: "incomplete", gradeRank: 5, spindleRunoutUm: 4 });
  });

  it("holds every attribute the index settings name", () => {
    const document = listingToSearchDocument(listing, report);
    const named = [...listingIndexSettings.searchableAttributes, ...listingIndexSettings.filterableAttributes, ...listingIndexSettings.sortableAttributes];
    for (const attribute of named) expect(document, attribute).toHaveProperty(attribute);
  });
});

describe("listingFilter", () => {
  const now = new Date("2026-03-10T00:00:00Z");

  it("shows published listings only by default", () => {
    expect(listingFilter({}, now)).toEqual(['status IN ["published"]']);
  });

  it("writes the buyer's limits as conditions the stand-in parses, on filterable attributes only", () => {
    const filter = listingFilter(
      {
        categories: ["centre_lathe", "toolroom_lathe"],
        grades: ["A", "B"],
        verifiedOnly: true,
        currency: "EUR",
        priceMinor: { min: 500_000, max: 2_000_000 },
        swingMm: { min: 300 },
        betweenCentresMm: { max: 1500 },
        maxSpindleRunoutUm: 5,
        maxAxialSlipUm: 4,
        maxSpindleParallelismUm: 10,
        maxCentreHeightUm: 20,
        maxBedStraightnessUm: 15,
        maxReportAgeDays: 365,
        countries: ["DE"],
        region: 'North "Brae"',
      },
      now,
    );
    const parsed = parseFilter(filter)!;
    const filterable = new Set<string>(listingIndexSettings.filterableAttributes);
    for (const condition of conditionsOf(parsed)) expect(filterable.has(condition.attribute), condition.attribute).toBe(true);
    // 365 days before 2026-03-10T00:00:00Z, in epoch seconds.
    expect(filter).toContain("reportDate >= 1741564800");
    expect(filter).toContain("spindleParallelismVerticalUm <= 10");
    expect(filter).toContain("spindleParallelismHorizontalUm <= 10");

    const matching = { ...listingToSearchDocument(listing, report), region: 'North "Brae"' };
    expect(evaluateFilter(parsed, matching)).toBe(false); // bedStraightnessUm is null: an “at most” limit needs the figure
    expect(evaluateFilter(parsed, { ...matching, bedStraightnessUm: 12 })).toBe(true);
    expect(evaluateFilter(parsed, { ...matching, bedStraightnessUm: 12, spindleRunoutUm: 6 })).toBe(false);
  });

  it("narrows to given listings, as a saved search asks about one listing", () => {
    const filter = listingFilter({ ids: ["lst_01"], maxSpindleRunoutUm: 5 }, now);
    expect(filter[0]).toBe('id IN ["lst_01"]');
    const parsed = parseFilter(filter)!;
    expect(evaluateFilter(parsed, listingToSearchDocument(listing, report))).toBe(true);
    expect(evaluateFilter(parsed, { ...listingToSearchDocument(listing, report), id: "lst_02" })).toBe(false);
  });

  it("quotes any text so that it cannot change the expression", () => {
    const hostile = `x" OR status = "draft`;
    expect(parseFilterExpression(`region = ${quoteFilterValue(hostile)}`)).toEqual({ kind: "comparison", attribute: "region", operator: "=", value: hostile });
    expect(quoteFilterValue(12.5)).toBe("12.5");
  });
});

describe("listingSortRules", () => {
  it("uses sortable attributes only, none for relevance with words, and breaks ties as the fallback does", () => {
    expect(listingSortRules("relevance", true)).toBeUndefined();
    expect(listingSortRules(undefined, true)).toBeUndefined();
    expect(listingSortRules("relevance")).toEqual(["publishedAt:desc", "id:desc"]);
    const sortable = new Set<string>(listingIndexSettings.sortableAttributes);
    for (const sort of ["newest", "price-ascending", "price-descending", "best-accuracy"] as const) {
      for (const rule of listingSortRules(sort)!) expect(sortable.has(rule.split(":")[0]!), rule).toBe(true);
    }
    expect(listingSortRules("best-accuracy")).toEqual(["gradeRank:asc", "spindleRunoutUm:asc", "publishedAt:desc", "id:desc"]);
    expect(listingIndexSettings.rankingRules[0]).toBe("sort");
  });
});

describe("a mill's or grinder's figures", () => {
  it("are indexed as magnitudes and filtered by an upper limit", async () => {
    const { listingFilter } = await import("../../../search/query");
    const document = listingToSearchDocument(listing, { ...report, keyFigures: { ...report.keyFigures, tableFlatness: 9.5, travelSquareness: -6 } });
    expect(document).toMatchObject({ tableFlatnessUm: 9.5, travelSquarenessUm: 6 });
    expect(listingFilter({ maxTableFlatnessUm: 10, maxTravelSquarenessUm: 8 })).toEqual(expect.arrayContaining(["tableFlatnessUm <= 10", "travelSquarenessUm <= 8"]));
  });
});

describe("a CNC machine's axes", () => {
  it("index positioning accuracy and repeatability per axis and filter each by an upper limit", async () => {
    const { listingFilter } = await import("../../../search/query");
    const document = listingToSearchDocument(listing, { ...report, keyFigures: { ...report.keyFigures, xPositioningAccuracy: 14.2, xRepeatability: 6.1, zPositioningAccuracy: 18 } });
    expect(document).toMatchObject({ xPositioningAccuracyUm: 14.2, xRepeatabilityUm: 6.1, yPositioningAccuracyUm: null, zPositioningAccuracyUm: 18 });
    expect(listingFilter({ maxXPositioningAccuracyUm: 15, maxZRepeatabilityUm: 8 })).toEqual(expect.arrayContaining(["xPositioningAccuracyUm <= 15", "zRepeatabilityUm <= 8"]));
  });
});

describe("the supply a machine runs on", () => {
  it("is indexed as volts and phases and filtered by the band of its class (IEC 60038 nominal voltages)", async () => {
    const { listingFilter } = await import("../../../search/query");
    expect(listingToSearchDocument({ ...listing, supplyVoltage: 415, supplyPhases: 3 }, null)).toMatchObject({ supplyVoltage: 415, supplyPhases: 3 });
    expect(listingFilter({ supply: "3x400" })).toEqual(expect.arrayContaining(["supplyPhases = 3", "supplyVoltage >= 380", "supplyVoltage <= 415"]));
  });
  it("is a search parameter that round-trips and refuses unknown classes", async () => {
    const { parseListingSearchParams, paramsFromQuery } = await import("~/modules/search/search-params.server");
    const parsed = parseListingSearchParams(new URLSearchParams("supply=3x400"));
    expect(parsed.success && parsed.query.supply).toBe("3x400");
    if (parsed.success) expect(paramsFromQuery(parsed.query).get("supply")).toBe("3x400");
    const refused = parseListingSearchParams(new URLSearchParams("supply=3x999"));
    expect(refused.success).toBe(false);
  });
});
