import { beforeAll, describe, expect, it } from "vitest";
import { createTestUser, signInCookie } from "../../support/accounts";
import { listingsOfSeller, postForm, tradeSpecFields, validListingFields } from "../../support/listings";

const decode = (html: string) => html.replace(/&#x27;|&#39;/g, "'").replace(/&quot;/g, '"').replace(/&amp;/g, "&");
const long = (length: number) => "x".repeat(length);
const thisYear = new Date().getFullYear();

// Each field with a bad value and the message the seller must read at that field.
const badValues: Array<[field: string, value: string, message: string]> = [
  ["category", "spaceship", "Choose the kind of machine."],
  ["condition", "", "Choose the condition."],
  ["make", "", "Enter the make, e.g. the name cast on the headstock."],
  ["make", long(81), "Keep the make to 80 characters."],
  ["model", "  ", "Enter the model."],
  ["year", "19x7", "Enter the year of manufacture as four digits, e.g. 1987."],
  ["year", "1700", "The year of manufacture must be 1850 or later."],
  ["year", String(thisYear + 1), `The year of manufacture cannot be later than ${thisYear}.`],
  ["serialNumber", long(61), "Keep the serial number to 60 characters."],
  ["swingOverBed", "abc", "Enter the swing over bed as a number in mm."],
  ["swingOverBed", "", "Enter the swing over bed in mm; buyers size a lathe by it."],
  ["distanceBetweenCentres", "99999", "The distance between centres must be at most 25,000 mm."],
  ["distanceBetweenCentres", "", "Enter the distance between centres in mm."],
  ["spindleBore", "-4", "The spindle bore must be at least 5 mm."],
  ["spindleNose", long(61), "Keep the spindle nose to 60 characters."],
  ["motorPower", "lots", "Enter the motor power as a number in kW."],
  ["weight", "3", "The weight must be at least 10 kg."],
  ["city", "", "Enter the town or city where the machine stands."],
  ["region", long(81), "Keep the region to 80 characters."],
  ["country", "XX", "Choose the country where the machine stands."],
  ["price", "", "Enter the asking price as a number, e.g. 18500."],
  ["price", "0", "The asking price must be more than zero."],
  ["price", "12.345", "Give the price to at most two decimals."],
  ["price", "90000000", "The asking price must be at most 50,000,000."],
  ["currency", "DOGE", "Choose the currency of the price."],
  ["toolingIncluded", long(2001), "Keep the list of tooling to 2000 characters."],
  ["description", "Runs.", "Describe the machine in at least 30 characters."],
  ["units", "inch", "The form's units changed; reload the page and try again."],
];

let seller: { id: string; cookie: string };
let inchSeller: { id: string; cookie: string };

beforeAll(async () => {
  const made = await createTestUser({ roles: ["seller"] });
  seller = { id: made.id, cookie: await signInCookie(made.email, made.password) };
  const inch = await createTestUser({ roles: ["seller"], displayUnits: "inch" });
  inchSeller = { id: inch.id, cookie: await signInCookie(inch.email, inch.password) };
});

describe("the listing form rejects every field's bad value with its message and writes nothing", () => {
  it.each(badValues)("%s = %j → %s", async (field, value, message) => {
    const response = await postForm("/sell/new", seller.cookie, validListingFields({ [field]: value }));
    expect(response.status).toBe(422);
    expect(decode(await response.text())).toContain(message);
    expect(await listingsOfSeller(seller.id)).toEqual([]);
  });

  it("states the limits in inches to a seller who reads inches, and stores inches as millimetres", async () => {
    const tooBig = await postForm("/sell/new", inchSeller.cookie, validListingFields({ units: "inch", swingOverBed: "500" }));
    expect(tooBig.status).toBe(422);
    expect(decode(await tooBig.text())).toContain("The swing over bed must be at most 196.9 in.");
    expect(await listingsOfSeller(inchSeller.id)).toEqual([]);

    const saved = await postForm(
      "/sell/new",
      inchSeller.cookie,
      validListingFields({ units: "inch", swingOverBed: "13", distanceBetweenCentres: "40", spindleBore: "1.5", weight: "1720", motorPower: "3" }),
    );
    expect(saved.status).toBe(302);
    const [row] = await listingsOfSeller(inchSeller.id);
    // 1 in = 25.4 mm, 1 lb = 0.45359237 kg, 1 hp = 0.745699872 kW (NIST SP 811).
    expect([row.swingOverBedMm, row.distanceBetweenCentresMm, row.spindleBoreMm]).toEqual([330.2, 1016, 38.1]);
    expect(row.weightKg).toBe(780);
    expect(row.motorPowerKw).toBe(2.237);
  });

  it("stores the trade's figures, and a lathe's own ones only for lathes", async () => {
    const millSeller = await createTestUser({ roles: ["seller"] });
    const cookie = await signInCookie(millSeller.email, millSeller.password);
    const lathe = await postForm("/sell/new", cookie, validListingFields({ ...tradeSpecFields }));
    expect(lathe.status).toBe(302);
    const mill = await postForm("/sell/new", cookie, validListingFields({ ...tradeSpecFields, category: "milling_machine", make: "Rocholt" }));
    expect(mill.status).toBe(302);
    const rows = await listingsOfSeller(millSeller.id);
    const latheRow = rows.find((row) => row.category === "centre_lathe")!;
    const millRow = rows.find((row) => row.category === "milling_machine")!;
    expect(latheRow).toMatchObject({ supplyVoltage: 400, supplyPhases: 3, supplyFrequencyHz: 50, spindleSpeedMinRpm: 40, spindleSpeedMaxRpm: 2000, tailstockTaper: "Morse taper 3", threadPitchMinMm: 0.25, threadPitchMaxMm: 7, threadTpiMin: 4, threadTpiMax: 56, swingOverCrossSlideMm: 170, footprintLengthMm: 1800, footprintWidthMm: 800 });
    // A mill keeps its supply, speeds and footprint, and no tailstock, cross-slide or screw-cutting figures.
    expect(millRow).toMatchObject({ supplyVoltage: 400, spindleSpeedMaxRpm: 2000, footprintWidthMm: 800, tailstockTaper: null, threadPitchMinMm: null, threadTpiMax: null, swingOverCrossSlideMm: null });
  });
});
