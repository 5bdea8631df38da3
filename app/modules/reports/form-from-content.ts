// A correction starts from the signed readings: the signed content turned back into the entry form.
import { micrometresToInches, type TestMeasurement } from "~/geometry";
import type { ReportContent } from "./content";
import { emptyTestEntry, instrumentReads, isEntryKind, reportFormSchema, type ReportForm, type TestEntry } from "./form";
import { gridFromPoints } from "./grid-entry";

const text = (value: number | null | undefined) => (value === null || value === undefined ? "" : String(value));

function entryOf(measurement: TestMeasurement): TestEntry {
  if (!isEntryKind(measurement.kind)) throw new Error(`Readings of kind ${measurement.kind} are not entered through the form.`);
  const entry = emptyTestEntry(measurement.kind);
  switch (measurement.kind) {
    case "sweep":
      entry.readings = measurement.readings.map(text);
      break;
    case "extremes":
      entry.max = text(measurement.max);
      entry.min = text(measurement.min);
      break;
    case "profile":
    case "level":
      entry.points = measurement.points.map((point) => ({ station: text(point.station), reading: text(point.reading) }));
      if (measurement.kind === "profile" && measurement.reference) entry.reference = measurement.reference;
      break;
    case "mandrel":
      entry.near0 = text(measurement.near.at0);
      entry.near180 = text(measurement.near.at180);
      entry.far0 = text(measurement.far.at0);
      entry.far180 = text(measurement.far.at180);
      entry.length = text(measurement.length);
      break;
    case "near-far":
      entry.near = text(measurement.near);
      entry.far = text(measurement.far);
      entry.length = text(measurement.length);
      break;
    case "centre-height":
      entry.headstockEnd = text(measurement.headstockEnd);
      entry.tailstockEnd = text(measurement.tailstockEnd);
      break;
    case "surface": {
      // Level tilts were turned into heights when the report was signed: the correction starts from those heights.
      const grid = gridFromPoints(measurement.points);
      if (!grid) throw new Error("These heights do not form an evenly spaced grid, so they cannot be corrected through the form.");
      entry.grid = { ...grid, reference: measurement.reference ?? "" };
      break;
    }
    case "positioning":
      entry.runs = { targets: measurement.targets, forward: measurement.forward, reverse: measurement.reverse };
      break;
    case "circular":
      entry.radial = { clockwise: measurement.clockwise, counterClockwise: measurement.counterClockwise };
      break;
  }
  // The resolution travels with the test so the correction scores the same unless the inspector changes it.
  entry.resolution = text(measurement.resolution);
  return entry;
}

function keptSuggestion(content: ReportContent) {
  const { suggested, key, version } = content.profile;
  return Boolean(suggested && suggested.key === key && suggested.version === version);
}

export function formFromContent(content: ReportContent): ReportForm {
  const tests: Record<string, TestEntry> = {};
  for (const [code, measurement] of Object.entries(content.measurementsAsEntered.tests)) {
    const meta = content.tests[code];
    tests[code] = { ...entryOf(measurement), instrumentId: meta?.instrumentId ?? "", notes: meta?.notes ?? "", photoId: meta?.photo?.id ?? null };
  }
  return reportFormSchema.parse({
    units: content.entryUnits,
    profile: { key: content.profile.key, version: content.profile.version, reason: keptSuggestion(content) ? "" : content.profile.reason },
    measuredOn: content.measuredOn,
    conditions: {
      ambientTemperatureC: text(content.conditions.ambientTemperatureC),
      warmUpMinutes: text(content.conditions.warmUpMinutes),
      levelled: content.conditions.levelled === null ? "" : content.conditions.levelled ? "yes" : "no",
      notes: content.conditions.notes,
    },
    instruments: content.instruments.map((instrument) => {
      const inInches = content.entryUnits === "inch" && instrumentReads(instrument.kind) === "deviation";
      return {
        id: instrument.id,
        kind: instrument.kind,
        description: instrument.description,
        resolution: instrument.resolution === null ? "" : text(inInches ? micrometresToInches(instrument.resolution) : instrument.resolution),
        calibrationDue: instrument.calibrationDue ?? "",
      };
    }),
    tests,
    notes: content.notes,
    // Safety is acknowledged again for every revision.
    safetyAcknowledged: false,
  });
}
