import { describe, expect, it } from "vitest";
import { bestDeviations } from "~/modules/listings/compare";

describe("the better figure of compared machines", () => {
  it("is the smallest deviation by size, whatever its sign", () => {
    expect([...bestDeviations([6, -3, 4])]).toEqual([1]);
  });
  it("marks every machine that ties", () => {
    expect([...bestDeviations([2, 5, 2])]).toEqual([0, 2]);
  });
  it("marks none when every machine reads the same", () => {
    expect(bestDeviations([4, -4, 4]).size).toBe(0);
  });
  it("marks none when fewer than two machines have the figure", () => {
    expect(bestDeviations([null, 4, undefined]).size).toBe(0);
    expect(bestDeviations([]).size).toBe(0);
  });
});
