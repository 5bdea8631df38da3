import { describe, expect, it } from "vitest";
import { BUILT_IN_PROFILES, newestVersions } from "~/geometry";
import { suggestionFor } from "~/modules/reports/service.server";

const offered = newestVersions(BUILT_IN_PROFILES);
const mill = { category: "milling_machine", make: "Rocholt", model: "FK 3", serialNumber: null, swingOverBedMm: null, distanceBetweenCentresMm: null };

describe("the profile suggested for a mill or grinder", () => {
  it("checks the listing's table length against the profile's scope (knee mill up to 2000 mm, from memory)", () => {
    const fits = suggestionFor({ ...mill, tableLengthMm: 1100 } as never, offered);
    expect(fits.profile?.key).toBe("knee-mill-normal");
    expect(fits.reason).toMatch(/1100 mm table is within this profile/);
    const tooLong = suggestionFor({ ...mill, tableLengthMm: 3200 } as never, offered);
    expect(tooLong).toMatchObject({ profile: null, uncovered: true });
    expect(tooLong.reason).toMatch(/covers a 3200 mm table/);
  });

  it("without a table length, suggests by category and asks the inspector to measure", () => {
    const unknown = suggestionFor({ ...mill, category: "surface_grinder", tableLengthMm: null } as never, offered);
    expect(unknown.profile?.key).toBe("surface-grinder-normal");
    expect(unknown.reason).toMatch(/no table length/);
  });
});
