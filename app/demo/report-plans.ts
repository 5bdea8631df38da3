// The demo reports' plans: which machine, grade, inspector, booker, date and readings. Pure, so that a unit
// test can check that every plan scores to its grade without a database; demo.server.ts files them.
import { addDays } from "date-fns";
import type { Grade } from "~/geometry";
import { demoReadings, entryOf, scoreDemoReadings, type DemoMachine } from "./report-readings";
import type { EntryUnits } from "~/modules/reports/form";

/** The inspectors of the demo, by the key the seed knows their accounts by. */
export type DemoInspectorKey = "renner" | "mirelle" | "beckstrand";

export type DemoBookerKey = "buyer" | "rafe" | "greta" | "dealer" | "brandmoor" | "vernois" | "hollerbeck" | "rietmolen";

type InstrumentSet = "metric" | "precision" | "inch" | "interferometer";

export type DemoReportPlan = {
  model: string;
  grade: Grade;
  inspector: DemoInspectorKey;
  booker: DemoBookerKey;
  /** Days before the scenario's today that the machine was measured. */
  measuredDaysAgo: number;
  instruments: InstrumentSet;
  machine: Omit<DemoMachine, "profileKey" | "units" | "indicatorResolution" | "levelResolution" | "seed">;
  seed: number;
  conditions: { ambientTemperatureC: string; warmUpMinutes: string; levelled: "yes" | "no"; notes: string };
  notes: string;
  /** The profile, when not a centre lathe's (a lathe's class follows its instruments). */
  profileKey?: string;
  /** Why this profile, when none is suggested for the machine's category. */
  profileReason?: string;
  /** Notes on single tests, as the inspector wrote them. */
  testNotes?: Record<string, string>;
  /** A first revision that was signed and later corrected: its own ratios and grade, and when the correction was signed. */
  correction?: { firstRatios: Record<string, number>; firstGrade: Grade; firstNotes: string; daysLater: number };
  /** Signed at the moment of seeding (after the saved searches exist): the report that sends an alert. */
  fresh?: boolean;
};

const instrumentSets: Record<InstrumentSet, { units: EntryUnits; indicator: number; level: number; bed?: number; list: (due: string) => Array<Record<string, string>> }> = {
  metric: {
    units: "mm",
    indicator: 1,
    level: 2,
    // A 1 µm indicator is too coarse for the bed's 7.5 µm local tolerance by the ten-to-one rule; the bed is
    // read with the level, whose 2 µm/m at 100 mm steps gives heights to 0.2 µm, entered to 0.5 µm.
    bed: 0.5,
    list: (due) => [
      { id: "i1", kind: "lever-indicator", description: "Orvik lever indicator, 0.001 mm", resolution: "1", calibrationDue: due },
      { id: "i2", kind: "electronic-level", description: "Quellmark electronic level, 2 µm/m", resolution: "2", calibrationDue: due },
      { id: "i3", kind: "test-mandrel", description: "Test mandrel, 300 mm, in the spindle's taper", resolution: "", calibrationDue: "" },
    ],
  },
  precision: {
    units: "mm",
    indicator: 0.5,
    level: 2,
    list: (due) => [
      { id: "i1", kind: "electronic-probe", description: "Sandvær electronic probe, 0.5 µm", resolution: "0.5", calibrationDue: due },
      { id: "i2", kind: "electronic-level", description: "Quellmark electronic level, 2 µm/m", resolution: "2", calibrationDue: due },
      { id: "i3", kind: "test-mandrel", description: "Hardened test mandrel, 300 mm, ground to 1 µm", resolution: "", calibrationDue: "" },
    ],
  },
  // CNC machines: the axes read with a laser interferometer (its table to 0.1 µm), the spindle with an indicator.
  interferometer: {
    units: "mm",
    indicator: 0.5,
    level: 2,
    list: (due) => [
      { id: "i1", kind: "electronic-probe", description: "Sandvær electronic probe, 0.5 µm", resolution: "0.5", calibrationDue: due },
      { id: "i4", kind: "laser-interferometer", description: "Lumenwerk laser interferometer with air and material sensors, 0.1 µm", resolution: "0.1", calibrationDue: due },
    ],
  },
  inch: {
    units: "inch",
    indicator: 0.00002,
    level: 2,
    list: (due) => [
      { id: "i1", kind: "electronic-probe", description: "Marlow electronic indicator, 0.00002 in", resolution: "0.00002", calibrationDue: due },
      { id: "i2", kind: "electronic-level", description: "Quellmark electronic level, 2 µin/in", resolution: "2", calibrationDue: due },
      { id: "i3", kind: "test-mandrel", description: "Test mandrel, 12 in, MT4", resolution: "", calibrationDue: "" },
    ],
  },
};

const A: [number, number] = [0.12, 0.42];
const B: [number, number] = [0.15, 0.55];
const TAILSTOCK = ["L-TS-SLV-V", "L-TS-SLV-H", "L-TS-TAP-V", "L-TS-TAP-H", "L-CTR-HT"];
const workshop = (temperature: string, warmUp: string, notes: string, levelled: "yes" | "no" = "yes") => ({ ambientTemperatureC: temperature, warmUpMinutes: warmUp, levelled, notes });

export const demoReportPlans: DemoReportPlan[] = [
  {
    model: "KD 320", grade: "A", inspector: "renner", booker: "dealer", measuredDaysAgo: 20, instruments: "metric", seed: 320,
    machine: { travel: 1000, crossTravel: 150, band: A, optional: ["L-P-ROUND", "L-FP-CAM"] },
    conditions: workshop("19.5", "40", "Levelled on its own feet on the shop floor; doors shut, no draught."),
    notes: "Reground bed and new spindle bearings show: every test well inside tolerance, most within a third of it.",
  },
  {
    model: "Series 14 x 40", grade: "B", inspector: "renner", booker: "buyer", measuredDaysAgo: 63, instruments: "inch", seed: 1440,
    machine: { travel: 40, crossTravel: 6, band: B, ratios: { "L-SP-PAR-H": 0.5, "L-BED-V": 0.78, "L-SP-NOSE": 0.7 } },
    conditions: workshop("17.0", "30", "College workshop, heating on since the morning. Readings in inches, as the machine's dials."),
    notes: "Sound machine for its age. Spindle nose run-out and the bed's crown use most of their tolerance; nothing is out.",
    correction: {
      firstRatios: { "L-SP-PAR-H": -0.5, "L-BED-V": 0.78, "L-SP-NOSE": 0.7 },
      firstGrade: "C",
      firstNotes: "Spindle axis leans away from the tool in the horizontal plane.",
      daysLater: 3,
    },
    testNotes: { "L-SP-PAR-H": "Corrected: the indicator was read from the rear of the mandrel, so the first revision had the signs reversed." },
  },
  {
    model: "OL 400", grade: "D", inspector: "renner", booker: "brandmoor", measuredDaysAgo: 430, instruments: "metric", seed: 400,
    machine: { travel: 1500, crossTravel: 200, band: [0.3, 0.9], ratios: { "L-SP-NOSE": 1.8, "L-SP-SLIP": 1.4, "L-BED-V": -0.9, "L-SP-TAP-F": 1.3 } },
    conditions: workshop("14.5", "20", "Standing on timber in the dealer's yard shed; could not be levelled before the tests.", "no"),
    notes: "Worn spindle bearings and a dipped bed near the chuck. Sold as is; priced for a rebuild.",
    testNotes: { "L-BED-V": "The bed dips about 250–600 mm from the chuck: the usual wear where most work is done." },
  },
  {
    model: "L 360 Universal", grade: "A", inspector: "beckstrand", booker: "hollerbeck", measuredDaysAgo: 45, instruments: "metric", seed: 360,
    machine: { travel: 1000, crossTravel: 175, band: A, optional: ["L-TOP-PAR", "L-LS-SLIP"] },
    conditions: workshop("20.5", "45", "Heated workshop; machine on levelling mounts, checked with the level first."),
    notes: "An overhaul done properly. The spindle axis rises and leans toward the tool by a few micrometres, as it should.",
  },
  {
    model: "CL-410 Gap", grade: "B", inspector: "beckstrand", booker: "rafe", measuredDaysAgo: 118, instruments: "metric", seed: 410,
    machine: { travel: 1500, crossTravel: 200, band: B, ratios: { "L-CTR-HT": 0.8, "L-TS-TAP-V": 0.72, "L-SP-NOSE": 0.5 } },
    conditions: workshop("18.0", "60", "Tested with the gap piece fitted."),
    notes: "Good headstock and bed. The tailstock sits high by most of its tolerance; still inside, and it errs the right way.",
  },
  {
    model: "FO 300", grade: "C", inspector: "beckstrand", booker: "buyer", measuredDaysAgo: 24, instruments: "metric", seed: 300,
    machine: { travel: 700, crossTravel: 150, band: B, ratios: { "L-TS-SLV-V": -0.35, "L-SP-NOSE": 0.6 } },
    conditions: workshop("21.0", "35", "Instrument maker's shop, air-conditioned."),
    notes: "Headstock and carriage fine. The tailstock sleeve droops at its free end: small, but the wrong way, so it counts as out.",
    testNotes: { "L-TS-SLV-V": "Sleeve free end lower than the near end; worn sleeve bore. A new sleeve or a sleeved bore would cure it." },
  },
  {
    model: "OL 280", grade: "incomplete", inspector: "beckstrand", booker: "rietmolen", measuredDaysAgo: 10, instruments: "metric", seed: 280,
    machine: { travel: 1000, crossTravel: 125, band: B, omit: TAILSTOCK },
    conditions: workshop("19.0", "30", "Dealer's showroom."),
    notes: "The tailstock sleeve is seized in its bore, so the five tailstock and centre-height tests could not be read. Headstock and bed tests are complete.",
  },
  {
    model: "Series 13 x 30", grade: "B", inspector: "renner", booker: "dealer", measuredDaysAgo: 150, instruments: "metric", seed: 1330,
    machine: { travel: 700, crossTravel: 150, band: B, ratios: { "L-SP-SLIP": 0.7, "L-XS-SQ": 0.8, "L-SP-NOSE": 0.45 } },
    conditions: workshop("18.5", "40", "After the dealer's reconditioning, before delivery to the showroom."),
    notes: "Within tolerance throughout. Axial slip and the cross-slide's squareness are the figures to watch.",
  },
  {
    model: "FO 460", grade: "C", inspector: "mirelle", booker: "greta", measuredDaysAgo: 41, instruments: "metric", seed: 460,
    machine: { travel: 1500, crossTravel: 225, band: [0.2, 0.7], ratios: { "L-BED-V": 1.3, "L-CAR-H": 1.15, "L-SP-NOSE": 0.6 } },
    conditions: workshop("16.5", "30", "Railway workshop, large hall; tests in the morning before the doors were opened."),
    notes: "Spindle and tailstock good. The bed is worn beyond tolerance in both planes, by up to a third: fine for large work, not for fine fits.",
  },
  {
    model: "TR 250 Precision", grade: "A", inspector: "mirelle", booker: "buyer", measuredDaysAgo: 9, instruments: "precision", seed: 250,
    machine: { travel: 500, crossTravel: 125, band: A },
    conditions: workshop("20.0", "60", "Measured to the precision class; room held at 20 ± 0.5 °C during the tests."),
    notes: "A precision lathe that has kept its precision: every test inside half the toolroom tolerance.",
  },
  {
    model: "VH 6 Toolroom", grade: "B", inspector: "beckstrand", booker: "hollerbeck", measuredDaysAgo: 96, instruments: "precision", seed: 6,
    machine: { travel: 600, crossTravel: 125, band: B, ratios: { "L-SP-PAR-V": 0.8, "L-SP-TAP-F": 0.7, "L-SP-NOSE": 0.6 } },
    conditions: workshop("20.5", "50", "Measured to the precision class."),
    notes: "Within the precision-class tolerances on every test; the spindle axis rises a little more than the others would suggest.",
  },
  {
    model: "VH 8 Toolroom", grade: "D", inspector: "beckstrand", booker: "rafe", measuredDaysAgo: 31, instruments: "precision", seed: 8,
    machine: { travel: 700, crossTravel: 140, band: [0.3, 0.8], ratios: { "L-SP-SLIP": 2.2, "L-SP-NOSE": 1.6, "L-SP-CTR": 1.4 } },
    conditions: workshop("19.5", "45", "Measured to the precision class."),
    notes: "Spindle bearings are worn: axial slip twice the precision tolerance, nose and centre run-out out too. Bed and tailstock are still good.",
  },
  {
    model: "TR 200 Gauge", grade: "incomplete", inspector: "mirelle", booker: "vernois", measuredDaysAgo: 16, instruments: "precision", seed: 200,
    machine: { travel: 400, crossTravel: 100, band: A, omit: TAILSTOCK },
    conditions: workshop("20.0", "40", "Measured to the precision class."),
    notes: "The machine has no tailstock, so the tailstock and centre-height tests could not be read. Everything measured is inside half the toolroom tolerance.",
  },
  {
    model: "TC-6 Slant", grade: "B", inspector: "mirelle", booker: "rafe", measuredDaysAgo: 52, instruments: "metric", seed: 6060,
    machine: { travel: 600, crossTravel: 150, band: B, ratios: { "L-SP-PAR-H": 0.7, "L-SP-NOSE": 0.55 } },
    conditions: workshop("21.5", "60", "Spindle warmed at 1500 rpm for an hour; indicator carried on the turret."),
    profileReason: "No profile covers CNC lathes yet. Checked against the centre-lathe normal class as the nearest, with the turret carrying the indicator and the programmable tailstock in place of the manual one.",
    notes: "Inside the centre-lathe normal class throughout. For a CNC lathe that is a floor, not a target.",
  },
  {
    model: "FO 250 Apprentice", grade: "A", inspector: "mirelle", booker: "vernois", measuredDaysAgo: 1, instruments: "metric", seed: 251,
    machine: { travel: 600, crossTravel: 125, band: A, optional: ["L-P-ROUND"] },
    conditions: workshop("19.0", "40", "Tested in the dealer's workshop after the rebuild."),
    notes: "A careful rebuild: run-out, axial slip and alignment all at a fraction of their tolerance.",
    fresh: true,
  },

  // ————— CNC machines: the axes' positioning read with a laser interferometer —————
  {
    model: "OK-26 Compact", grade: "A", inspector: "beckstrand", booker: "rafe", measuredDaysAgo: 18, instruments: "interferometer", seed: 2616, profileKey: "cnc-lathe-normal",
    machine: { travel: 340, crossTravel: 180, band: A, optional: ["C-SP-NOSE"], axes: { "C-X": { travel: 180, targets: 9 }, "C-Z": { travel: 340, targets: 11 } }, ratios: { "C-X": 0.32, "C-Z": 0.41 } },
    conditions: workshop("20.5", "45", "Axes warmed with the maker's warm-up program for 45 minutes; interferometer's air and material sensors on the slide.", "yes"),
    notes: "The new ball screws show: both axes position within half their tolerance, with little lost motion between the directions.",
    testNotes: { "C-X-A": "Five runs each way over 180 mm, nine targets, read on the turret's tool position." },
  },
  {
    model: "VX 850", grade: "B", inspector: "beckstrand", booker: "brandmoor", measuredDaysAgo: 29, instruments: "interferometer", seed: 8505, profileKey: "vertical-machining-centre-normal",
    machine: {
      travel: 850, crossTravel: 500, band: B, optional: ["V-SP-NOSE"],
      axes: { "V-X": { travel: 840, targets: 13 }, "V-Y": { travel: 490, targets: 11 }, "V-Z": { travel: 500, targets: 11 } },
      ratios: { "V-X": 0.72, "V-Y": 0.46, "V-Z": 0.38 },
    },
    conditions: workshop("21.0", "60", "Two-shift shop, machine in its place of work; warmed with the spindle at 6000 rpm and the axes running for an hour.", "yes"),
    notes: "Sound machine. The X axis's lost motion is most of its reversal tolerance: a backlash compensation, or the table nut when the screw is next serviced.",
    testNotes: { "V-X-B": "Reversal largest near the middle of the travel, where the table is used most." },
  },
  {
    model: "KV-600", grade: "A", inspector: "beckstrand", booker: "dealer", measuredDaysAgo: 6, instruments: "interferometer", seed: 6006, profileKey: "vertical-machining-centre-normal",
    machine: {
      travel: 600, crossTravel: 400, band: A, optional: ["V-SP-NOSE"],
      axes: { "V-X": { travel: 590, targets: 11 }, "V-Y": { travel: 390, targets: 9 }, "V-Z": { travel: 440, targets: 9 } },
      ratios: { "V-X": 0.3, "V-Y": 0.27, "V-Z": 0.35 },
    },
    conditions: workshop("20.0", "45", "Dealer's rebuild shop, air-conditioned.", "yes"),
    notes: "Laser-checked after the rebuild: every axis positions and repeats within a third of its tolerance.",
  },

  // ————— Milling machines and surface grinders: tables read as grids —————
  {
    model: "FK 3 Knee Mill", grade: "A", inspector: "beckstrand", booker: "buyer", measuredDaysAgo: 14, instruments: "metric", seed: 3410, profileKey: "knee-mill-normal",
    machine: { travel: 700, crossTravel: 250, table: { length: 1100, width: 260 }, band: A },
    conditions: workshop("19.5", "30", "Dealer's workshop; the mill stands on its levelling pads, checked with the level first."),
    notes: "Reground table and ways show: the table is flat to a third of its tolerance and the travels are square.",
    testNotes: { "M-TABLE-FLAT": "Read with the indicator on the spindle head, 4 rows by 7 columns, clear of the T-slots." },
  },
  {
    model: "FV 5 Vertical", grade: "B", inspector: "mirelle", booker: "rafe", measuredDaysAgo: 52, instruments: "metric", seed: 5085, profileKey: "knee-mill-normal",
    machine: { travel: 600, crossTravel: 250, table: { length: 1000, width: 250 }, band: B, ratios: { "M-XY-SQ": 0.7, "M-TABLE-FLAT": 0.6 } },
    conditions: workshop("18.0", "25", "Seller's own workshop."),
    notes: "Sound machine. The table is worn a little hollow where the vice sits, and the cross travel is off square by most of half its tolerance.",
  },
  {
    model: "UW 4 Universal", grade: "C", inspector: "beckstrand", booker: "greta", measuredDaysAgo: 33, instruments: "metric", seed: 4920, profileKey: "knee-mill-normal",
    machine: { travel: 800, crossTravel: 250, table: { length: 1200, width: 280 }, band: B, ratios: { "M-TABLE-FLAT": 1.25 } },
    conditions: workshop("17.5", "30", "Dealer's showroom; heating on since the morning."),
    notes: "Spindle and travels good. The table is worn hollow in the middle beyond its tolerance: a regrind, or work clear of the middle.",
    testNotes: { "M-TABLE-FLAT": "Hollow of the table centred about 550 mm from the left end; old vice position." },
  },
  {
    model: "SG 618", grade: "A", inspector: "beckstrand", booker: "dealer", measuredDaysAgo: 27, instruments: "precision", seed: 618, profileKey: "surface-grinder-normal",
    machine: { travel: 450, crossTravel: 150, table: { length: 450, width: 150 }, band: A, optional: ["G-CHUCK-FLAT"] },
    conditions: workshop("20.0", "45", "Tested with the magnetic chuck on, after 45 minutes of the spindle and table running."),
    notes: "Rebuilt spindle and scraped ways: every test within half its tolerance; the chuck is flat to a few micrometres.",
  },
  {
    model: "SG 1020 Hydraulic", grade: "B", inspector: "beckstrand", booker: "buyer", measuredDaysAgo: 75, instruments: "precision", seed: 1020, profileKey: "surface-grinder-normal",
    machine: { travel: 500, crossTravel: 250, table: { length: 500, width: 250 }, band: B, ratios: { "G-HEAD-SQ": 0.7, "G-SP-RUN": 0.6 }, optional: ["G-CHUCK-FLAT"] },
    conditions: workshop("18.5", "40", "Die shop, machine in its place of work."),
    notes: "Within tolerance throughout; the wheelhead's travel leans a little off square, within its tolerance.",
  },
];

export function formFor(plan: DemoReportPlan, ratios: Record<string, number> | undefined, measuredOn: Date, notes: string) {
  const set = instrumentSets[plan.instruments];
  const machine: DemoMachine = {
    ...plan.machine,
    ratios: ratios ?? plan.machine.ratios,
    profileKey: plan.profileKey ?? (plan.instruments === "precision" ? "centre-lathe-precision" : "centre-lathe-normal"),
    units: set.units,
    indicatorResolution: set.indicator,
    levelResolution: set.level,
    ...(set.bed ? { bedResolution: set.bed } : {}),
    seed: plan.seed,
  };
  const readings = demoReadings(machine);
  const score = scoreDemoReadings(readings, machine, {
    ambientTemperatureC: Number(plan.conditions.ambientTemperatureC),
    warmUpMinutes: Number(plan.conditions.warmUpMinutes),
    levelled: plan.conditions.levelled === "yes",
  });
  const due = addDays(measuredOn, 240).toISOString().slice(0, 10);
  const tests = Object.fromEntries(
    Object.entries(readings.measurements).map(([code, measurement]) => [
      code,
      {
        ...entryOf(measurement, measurement.kind === "positioning" ? "i4" : measurement.kind === "level" || (code === "L-BED-V" && set.bed) ? "i2" : "i1", ratios ? "" : (plan.testNotes?.[code] ?? "")),
        // A table is read as a grid with the indicator: the grid's own spacing is in the listing's table.
        // The bed's heights come from the level: their step is given on the test, as the form allows.
        ...(code === "L-BED-V" && set.bed ? { resolution: String(set.bed) } : {}),
      },
    ]),
  );
  const form = {
    units: set.units,
    profile: { key: readings.profile.key, version: readings.profile.version, reason: plan.profileReason ?? "" },
    measuredOn: measuredOn.toISOString().slice(0, 10),
    conditions: plan.conditions,
    instruments: set.list(due),
    tests,
    notes,
    safetyAcknowledged: true,
  };
  return { form, score };
}

