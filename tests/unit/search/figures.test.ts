import { describe, expect, it } from "vitest";
import { accuracyFilters, accuracyParams } from "~/modules/search/figures";

describe("the accuracy limits the browser knows", () => {
  it("are the server's limits, by parameter and in the same order", () => {
    expect([...accuracyParams]).toEqual(accuracyFilters.map((filter) => filter.param));
  });
});
