// The search's URL parameters, the form's unit conversion and the figures' wording. Inch conversions use
// 1 in = 25.4 mm exactly (international yard and pound agreement, 1959; NIST SP 811).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { draftFromParams, paramsFromDraft } from "~/modules/search/components/search-form";
import { deviationFromInput, formatDeviation, widerLimits } from "~/modules/search/figures";
import { paramsFromQuery, parseListingSearchParams } from "~/modules/search/search-params.server";

const parse = (query: string) => {
  const parsed = parseListingSearchParams(new URLSearchParams(query));
  if (!parsed.success) throw new Error(JSON.stringify(parsed.errors));
  return parsed.query;
};

describe("search parameters", () => {
  it("takes limits in µm, or in inches through the …In twins, and sizes in mm or inches", () => {
    // 0.0002 in × 25 400 µm/in = 5.08 µm; 12 in × 25.4 mm/in = 304.8 mm.
    expect(parse("runoutMaxIn=0.0002&swingMinIn=12&centresMax=1500")).toMatchObject({ maxSpindleRunoutUm: 5.08, swingMm: { min: 304.8 }, betweenCentresMm: { max: 1500 } });
    expect(parse("runoutMax=5")).toMatchObject({ maxSpindleRunoutUm: 5 });
    expect(parse("axialSlipMaxIn=0.0001")).toMatchObject({ maxAxialSlipUm: 2.54 });
  });

  it("reads lists repeated or comma-separated, blanks as no limit, and defaults the sort to newest without words", () => {
    expect(parse("category=centre_lathe,toolroom_lathe&grade=A&grade=B&runoutMax=&verified=1")).toMatchObject({
      categories: ["centre_lathe", "toolroom_lathe"],
      grades: ["A", "B"],
      verifiedOnly: true,
      maxSpindleRunoutUm: undefined,
      sort: "newest",
      page: 1,
    });
    expect(parse("q=halvorsen").sort).toBe("relevance");
  });

  it("writes every query back to parameters that read as the same query", () => {
    const query = fc.record({
      text: fc.option(fc.constantFrom("toolroom", "D1-4 camlock", "Kessling"), { nil: undefined }),
      categories: fc.option(fc.subarray(["centre_lathe", "toolroom_lathe", "cnc_lathe"], { minLength: 1 }), { nil: undefined }),
      verifiedOnly: fc.option(fc.constant(true), { nil: undefined }),
      maxSpindleRunoutUm: fc.option(fc.integer({ min: 1, max: 50_000 }).map((value) => value / 1000), { nil: undefined }),
      maxCentreHeightUm: fc.option(fc.integer({ min: 1, max: 100 }), { nil: undefined }),
      maxReportAgeDays: fc.option(fc.integer({ min: 1, max: 3650 }), { nil: undefined }),
      swingMm: fc.option(fc.record({ min: fc.integer({ min: 0, max: 400 }), max: fc.integer({ min: 400, max: 1200 }) }), { nil: undefined }),
    });
    fc.assert(
      fc.property(query, (generated) => {
        const again = parse(paramsFromQuery({ ...generated, sort: generated.text ? "relevance" : "newest" }).toString());
        for (const [key, value] of Object.entries(generated)) if (value !== undefined) expect(again[key as keyof typeof again]).toEqual(value);
      }),
    );
  });

  it("names each bad parameter", () => {
    const parsed = parseListingSearchParams(new URLSearchParams("runoutMax=-1&grade=E&priceMax=100&centresMin=900&centresMax=500"));
    expect(parsed.success).toBe(false);
    if (parsed.success) return;
    expect(Object.keys(parsed.errors).sort()).toEqual(["centresMax", "currency", "grade", "runoutMax"]);
  });
});

describe("the search form in the reader's units", () => {
  it("shows an inch user 0.0002 in for a 5.08 µm limit and writes it back as µm", () => {
    const draft = draftFromParams(new URLSearchParams("runoutMax=5.08&swingMin=304.8&category=centre_lathe"), "inch");
    expect(draft).toMatchObject({ runoutMax: "0.0002", swingMin: "12", category: ["centre_lathe"] });
    expect(paramsFromDraft(draft, "inch").toString()).toBe("category=centre_lathe&swingMin=304.8&runoutMax=5.08");
  });

  it("reads the …In twins a form without JavaScript sends, for either reader", () => {
    expect(draftFromParams(new URLSearchParams("runoutMaxIn=0.0002"), "mm").runoutMax).toBe("5.08");
    expect(draftFromParams(new URLSearchParams("runoutMaxIn=0.0002"), "inch").runoutMax).toBe("0.0002");
  });

  it("gives a millimetre user µm, leaving blanks out", () => {
    const draft = { ...draftFromParams(new URLSearchParams(), "mm"), runoutMax: "5", verified: true, priceMax: "20000" };
    expect(paramsFromDraft(draft, "mm").toString()).toBe("verified=1&currency=EUR&priceMax=20000&runoutMax=5");
  });

  it("sends a value it cannot use as typed, under the reader's own name, so that the server can say what is wrong", () => {
    const blank = draftFromParams(new URLSearchParams(), "mm");
    expect(paramsFromDraft({ ...blank, swingMin: "-5", runoutMax: "0" }, "mm").toString()).toBe("swingMin=-5&runoutMax=0");
    expect(paramsFromDraft({ ...blank, centresMax: "long", runoutMax: "-0.0001" }, "inch").toString()).toBe("centresMaxIn=long&runoutMaxIn=-0.0001");
    // Read back from the address, they stay as typed, next to the message.
    expect(draftFromParams(new URLSearchParams("swingMin=-5&runoutMaxIn=0"), "inch")).toMatchObject({ swingMin: "-5", runoutMax: "0" });
    // And the server does refuse them, each at its field.
    const refused = parseListingSearchParams(new URLSearchParams("swingMin=-5&runoutMax=0&centresMaxIn=long"));
    expect(refused.success).toBe(false);
    if (!refused.success) expect(Object.keys(refused.errors).sort()).toEqual(["centresMaxIn", "runoutMax", "swingMin"]);
  });
});

describe("accuracy figures", () => {
  it("converts and words deviations in µm and inches", () => {
    expect(deviationFromInput("0.0002", "inch")).toBe(5.08);
    expect(deviationFromInput("5", "mm")).toBe(5);
    expect(deviationFromInput("", "mm")).toBeUndefined();
    expect(deviationFromInput("-3", "mm")).toBeUndefined();
    // 4 µm ÷ 25 400 µm/in = 0.000157… in, shown to five places as an indicator reading in inches would be.
    expect(formatDeviation(4, "inch")).toBe("0.00016 in");
    expect(formatDeviation(4, "mm")).toBe("4 µm");
  });

  it("offers the next round limits above the current one", () => {
    expect(widerLimits(2, "mm")).toEqual([3, 4, 5, 6]);
    expect(widerLimits(5, "mm", 2)).toEqual([6, 8]);
    expect(widerLimits(2, "inch", 2)).toEqual([2.54, 5.08]);
  });
});
