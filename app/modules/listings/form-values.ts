// A stored listing as the form's starting values, in the reader's units. Pure: the edit page uses it.
import { fromMinorUnits, lengthFromMillimetres, type DisplayUnits } from "~/modules/units/format";
import { powerFromKilowatts, weightFromKilograms } from "~/modules/units/weight-power";

type StoredListing = {
  category: string;
  make: string;
  model: string;
  year: number | null;
  serialNumber: string | null;
  swingOverBedMm: number | null;
  distanceBetweenCentresMm: number | null;
  spindleBoreMm: number | null;
  tableLengthMm?: number | null;
  tableWidthMm?: number | null;
  spindleNose: string | null;
  supplyVoltage?: number | null;
  supplyPhases?: number | null;
  supplyFrequencyHz?: number | null;
  spindleSpeedMinRpm?: number | null;
  spindleSpeedMaxRpm?: number | null;
  tailstockTaper?: string | null;
  threadPitchMinMm?: number | null;
  threadPitchMaxMm?: number | null;
  threadTpiMin?: number | null;
  threadTpiMax?: number | null;
  swingOverCrossSlideMm?: number | null;
  footprintLengthMm?: number | null;
  footprintWidthMm?: number | null;
  motorPowerKw: number | null;
  weightKg: number | null;
  city: string;
  region: string | null;
  country: string;
  priceMinor: number;
  currency: string;
  condition: string;
  toolingIncluded: string | null;
  description: string;
};

const text = (value: number | null | undefined) => (value === null || value === undefined ? "" : String(value));

export function formValuesOf(listing: StoredListing, units: DisplayUnits): Record<string, string> {
  const length = (mm: number | null) => (mm === null ? "" : String(lengthFromMillimetres(mm, units)));
  return {
    units,
    category: listing.category,
    make: listing.make,
    model: listing.model,
    year: text(listing.year),
    serialNumber: listing.serialNumber ?? "",
    swingOverBed: length(listing.swingOverBedMm),
    distanceBetweenCentres: length(listing.distanceBetweenCentresMm),
    spindleBore: length(listing.spindleBoreMm),
    tableLength: length(listing.tableLengthMm ?? null),
    tableWidth: length(listing.tableWidthMm ?? null),
    spindleNose: listing.spindleNose ?? "",
    supplyVoltage: text(listing.supplyVoltage),
    supplyPhases: text(listing.supplyPhases),
    supplyFrequency: text(listing.supplyFrequencyHz),
    spindleSpeedMin: text(listing.spindleSpeedMinRpm),
    spindleSpeedMax: text(listing.spindleSpeedMaxRpm),
    tailstockTaper: listing.tailstockTaper ?? "",
    threadPitchMin: text(listing.threadPitchMinMm),
    threadPitchMax: text(listing.threadPitchMaxMm),
    threadTpiMin: text(listing.threadTpiMin),
    threadTpiMax: text(listing.threadTpiMax),
    swingOverCrossSlide: length(listing.swingOverCrossSlideMm ?? null),
    footprintLength: length(listing.footprintLengthMm ?? null),
    footprintWidth: length(listing.footprintWidthMm ?? null),
    motorPower: listing.motorPowerKw === null ? "" : String(powerFromKilowatts(listing.motorPowerKw, units)),
    weight: listing.weightKg === null ? "" : String(weightFromKilograms(listing.weightKg, units)),
    city: listing.city,
    region: listing.region ?? "",
    country: listing.country,
    price: String(fromMinorUnits(listing.priceMinor)),
    currency: listing.currency,
    condition: listing.condition,
    toolingIncluded: listing.toolingIncluded ?? "",
    description: listing.description,
  };
}
