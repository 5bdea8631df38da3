import { GeometryInputError, requirePositive } from "./errors";
import { compareSerials, MACHINE_CATEGORIES } from "./profile-schema";
import { roundToStep } from "./tolerance";
import { CNC_LATHE_NORMAL as CNC_LATHE_DATA, MACHINING_CENTRE_NORMAL as MACHINING_CENTRE_DATA } from "./profiles-cnc";
import { KNEE_MILL_NORMAL as KNEE_MILL_DATA, SURFACE_GRINDER_NORMAL as SURFACE_GRINDER_DATA } from "./profiles-milling-grinding";
import type { MachineForProfile, ProfileTest, ToleranceProfile, ToleranceSpec, ValueSource } from "./types";
import { deepFreeze } from "../modules/deep-freeze";

// The built-in profiles: the engine's own data, seeded into the database as published versions (the app
// scores against the database's copy; these stay for the seed, the tests and the bench). Labels as in
// GEOMETRY.md; tests and stored reports repeat them beside each value.
const ISO_1708_FROM_MEMORY: ValueSource = { confidence: "from-memory", document: "ISO 1708:1989" };
const PROPORTION_FROM_MEMORY: ValueSource = {
  confidence: "from-memory",
  document: "ISO 1708:1989",
  note: "scaled by the rule of proportionality of ISO 230-1, also from memory",
};
const LOW_CONFIDENCE: ValueSource = { confidence: "from-memory", document: "ISO 1708:1989", note: "low confidence" };
const COMMON_PRACTICE: ValueSource = { confidence: "common-practice" };
const FROM_MEMORY: ValueSource = { confidence: "from-memory" };
const PRECISION_SOURCE: ValueSource = {
  confidence: "from-memory",
  document: "half the normal class (Schlesinger, Testing Machine Tools, as quoted second-hand)",
  note: "never below 5 µm, IS 6040:1993",
};
const IS_6040 = (clause: string, note?: string): ValueSource => ({
  confidence: "published",
  document: "IS 6040",
  edition: "1993",
  clause,
  ...(note ? { note } : {}),
});
const PRECISION_ON_GRID: ValueSource = {
  confidence: "from-memory",
  document: "half the normal class (Schlesinger, Testing Machine Tools, as quoted second-hand)",
  note: "never below 5 µm and on the 2 µm grid, IS 6040:1993, clause 3.5",
};

const NORMAL_MINIMUM = 10; // µm, from memory
const PRECISION_MINIMUM = 5; // µm, IS 6040:1993, clause 3.5

const VERTICAL_PLUS = "+ = free end higher";
const HORIZONTAL_PLUS = "+ = free end toward the tool (front, operator side, on a front-tool-post lathe)";
const UNSIGNED = "no sign: max − min of the readings";

function proportional(tolerance: number, over: number, extra: { maximum?: number; source?: ValueSource } = {}): ToleranceSpec {
  return {
    type: "proportional",
    tolerance,
    over,
    minimum: NORMAL_MINIMUM,
    ...(extra.maximum !== undefined ? { maximum: extra.maximum } : {}),
    source: extra.source ?? PROPORTION_FROM_MEMORY,
  };
}

function fixed(tolerance: number, source = ISO_1708_FROM_MEMORY): ToleranceSpec {
  return { type: "fixed", tolerance, source };
}

/** Centre lathe, normal class: every test of the GEOMETRY.md table, in the order a tester works. */
const NORMAL_CLASS_TESTS: readonly ProfileTest[] = [
  {
    code: "L-BED-V",
    title: "Bed, vertical plane",
    measures: "Straightness of the carriage travel in the vertical plane",
    instrument: "Precision level on the carriage, read at equal steps; enter the height profile (µm) the readings give",
    measuringLength: { nominal: null, description: "Carriage travel over the distance between centres (DC)" },
    tolerance: {
      type: "stepped",
      steps: [
        { upTo: 500, tolerance: 10 },
        { upTo: 1000, tolerance: 20 },
        { upTo: 1500, tolerance: 25 },
      ],
      source: ISO_1708_FROM_MEMORY,
    },
    local: { tolerance: 7.5, window: 250, source: ISO_1708_FROM_MEMORY },
    method: "straightness",
    reference: "end-points",
    direction: { allowed: "convex", positive: "+ = higher; convex = middle above the end-point line", source: FROM_MEMORY },
    unit: "µm",
    required: true,
  },
  {
    code: "L-BED-X",
    title: "Bed, across (twist)",
    measures: "Twist: variation of the level reading across the bed along the carriage travel",
    instrument: "Precision level across the bed on the carriage; readings as tilt in µm/m",
    measuringLength: { nominal: 1000, description: "Per metre: the readings are tilts in µm/m" },
    tolerance: fixed(40),
    method: "level-range",
    direction: { allowed: "either", positive: UNSIGNED, source: ISO_1708_FROM_MEMORY },
    unit: "µm/m",
    required: true,
  },
  {
    code: "L-CAR-H",
    title: "Carriage, horizontal plane",
    measures: "Straightness of the carriage travel in the horizontal plane",
    instrument: "Indicator on the carriage against a mandrel held between centres, or a microscope on a taut wire",
    measuringLength: { nominal: null, description: "Carriage travel over the distance between centres (DC)" },
    tolerance: {
      type: "stepped",
      steps: [
        { upTo: 500, tolerance: 15 },
        { upTo: 1000, tolerance: 20 },
        { upTo: 1500, tolerance: 25 },
      ],
      source: ISO_1708_FROM_MEMORY,
    },
    method: "straightness",
    reference: "end-points",
    direction: { allowed: "either", positive: "+ = toward the tool", source: ISO_1708_FROM_MEMORY },
    unit: "µm",
    required: true,
  },
  {
    code: "L-TS-TRAV-V",
    title: "Tailstock travel, vertical plane",
    measures: "Parallelism of the tailstock travel to the carriage travel, vertical plane",
    instrument: "Indicator on the carriage against the locked tailstock sleeve; carriage and tailstock moved together",
    measuringLength: { nominal: null, description: "Tailstock travel (DC ≤ 1500 mm)" },
    tolerance: { type: "stepped", steps: [{ upTo: 1500, tolerance: 30 }], source: ISO_1708_FROM_MEMORY },
    local: { tolerance: 20, window: 500, source: ISO_1708_FROM_MEMORY },
    method: "range-along",
    direction: { allowed: "either", positive: UNSIGNED, source: ISO_1708_FROM_MEMORY },
    unit: "µm",
    required: false,
  },
  {
    code: "L-TS-TRAV-H",
    title: "Tailstock travel, horizontal plane",
    measures: "Parallelism of the tailstock travel to the carriage travel, horizontal plane",
    instrument: "Indicator on the carriage against the locked tailstock sleeve; carriage and tailstock moved together",
    measuringLength: { nominal: null, description: "Tailstock travel (DC ≤ 1500 mm)" },
    tolerance: { type: "stepped", steps: [{ upTo: 1500, tolerance: 30 }], source: ISO_1708_FROM_MEMORY },
    local: { tolerance: 20, window: 500, source: ISO_1708_FROM_MEMORY },
    method: "range-along",
    direction: { allowed: "either", positive: UNSIGNED, source: ISO_1708_FROM_MEMORY },
    unit: "µm",
    required: false,
  },
  {
    code: "L-SP-SLIP",
    title: "Spindle axial slip",
    measures: "Periodic axial slip of the spindle",
    instrument: "Indicator against a ball held in the spindle's centre hole, light axial thrust on the spindle",
    measuringLength: { nominal: null, description: "One revolution or more" },
    tolerance: fixed(10),
    method: "run-out",
    direction: { allowed: "any", positive: UNSIGNED, source: ISO_1708_FROM_MEMORY },
    unit: "µm",
    required: true,
  },
  {
    code: "L-FP-CAM",
    title: "Faceplate seating face",
    measures: "Camming of the faceplate seating face, axial slip included",
    instrument: "Indicator on the seating face, as far from the axis as it allows",
    measuringLength: { nominal: null, description: "One revolution or more" },
    tolerance: fixed(20),
    method: "run-out",
    direction: { allowed: "any", positive: UNSIGNED, source: ISO_1708_FROM_MEMORY },
    unit: "µm",
    required: false,
  },
  {
    code: "L-SP-NOSE",
    title: "Spindle nose",
    measures: "Run-out of the spindle nose centring diameter",
    instrument: "Indicator square to the centring diameter",
    measuringLength: { nominal: null, description: "One revolution or more" },
    tolerance: fixed(10),
    method: "run-out",
    direction: { allowed: "any", positive: UNSIGNED, source: ISO_1708_FROM_MEMORY },
    unit: "µm",
    required: true,
  },
  {
    code: "L-SP-TAP-N",
    title: "Spindle taper, at the nose",
    measures: "Run-out of a test mandrel in the spindle taper, read next to the spindle nose",
    instrument: "Test mandrel in the spindle taper; indicator on the carriage",
    measuringLength: { nominal: null, description: "At the spindle nose" },
    tolerance: fixed(10),
    method: "run-out",
    direction: { allowed: "any", positive: UNSIGNED, source: ISO_1708_FROM_MEMORY },
    unit: "µm",
    required: true,
  },
  {
    code: "L-SP-TAP-F",
    title: "Spindle taper, at 300 mm",
    measures: "Run-out of a test mandrel in the spindle taper, read 300 mm from the spindle nose",
    instrument: "Test mandrel in the spindle taper; indicator on the carriage",
    measuringLength: { nominal: 300, description: "300 mm from the spindle nose" },
    tolerance: fixed(20),
    method: "run-out",
    direction: { allowed: "any", positive: UNSIGNED, source: ISO_1708_FROM_MEMORY },
    unit: "µm",
    required: true,
  },
  {
    code: "L-SP-PAR-V",
    title: "Spindle axis, vertical plane",
    measures: "Parallelism of the spindle axis to the carriage travel, vertical plane",
    instrument: "Test mandrel in the spindle taper; indicator on the carriage near the nose and at 300 mm, spindle at 0° and 180°",
    measuringLength: { nominal: 300, description: "300 mm between the near and far readings" },
    tolerance: proportional(20, 300),
    method: "mandrel-inclination",
    direction: { allowed: "positive", positive: VERTICAL_PLUS, source: COMMON_PRACTICE },
    unit: "µm",
    required: true,
  },
  {
    code: "L-SP-PAR-H",
    title: "Spindle axis, horizontal plane",
    measures: "Parallelism of the spindle axis to the carriage travel, horizontal plane",
    instrument: "Test mandrel in the spindle taper; indicator on the carriage near the nose and at 300 mm, spindle at 0° and 180°",
    measuringLength: { nominal: 300, description: "300 mm between the near and far readings" },
    tolerance: proportional(15, 300),
    method: "mandrel-inclination",
    direction: { allowed: "positive", positive: HORIZONTAL_PLUS, source: COMMON_PRACTICE },
    unit: "µm",
    required: true,
  },
  {
    code: "L-SP-CTR",
    title: "Spindle centre",
    measures: "Run-out of the centre held in the spindle",
    instrument: "Indicator square to the centre's cone",
    measuringLength: { nominal: null, description: "One revolution or more" },
    tolerance: fixed(15),
    method: "run-out",
    direction: { allowed: "any", positive: UNSIGNED, source: ISO_1708_FROM_MEMORY },
    unit: "µm",
    required: true,
  },
  {
    code: "L-TS-SLV-V",
    title: "Tailstock sleeve, vertical plane",
    measures: "Parallelism of the tailstock sleeve to the carriage travel, vertical plane",
    instrument: "Sleeve extended and locked; indicator on the carriage read at the sleeve's free end and 100 mm back",
    measuringLength: { nominal: 100, description: "100 mm along the sleeve" },
    tolerance: proportional(15, 100),
    method: "near-far",
    direction: { allowed: "positive", positive: VERTICAL_PLUS, source: COMMON_PRACTICE },
    unit: "µm",
    required: true,
  },
  {
    code: "L-TS-SLV-H",
    title: "Tailstock sleeve, horizontal plane",
    measures: "Parallelism of the tailstock sleeve to the carriage travel, horizontal plane",
    instrument: "Sleeve extended and locked; indicator on the carriage read at the sleeve's free end and 100 mm back",
    measuringLength: { nominal: 100, description: "100 mm along the sleeve" },
    tolerance: proportional(10, 100),
    method: "near-far",
    direction: { allowed: "positive", positive: HORIZONTAL_PLUS, source: COMMON_PRACTICE },
    unit: "µm",
    required: true,
  },
  {
    code: "L-TS-TAP-V",
    title: "Tailstock taper, vertical plane",
    measures: "Parallelism of a test mandrel in the sleeve taper to the carriage travel, vertical plane",
    instrument: "Test mandrel in the sleeve taper, sleeve retracted and locked; indicator on the carriage near and at 300 mm",
    measuringLength: { nominal: 300, description: "300 mm between the near and far readings" },
    tolerance: proportional(30, 300),
    method: "near-far",
    direction: { allowed: "positive", positive: VERTICAL_PLUS, source: COMMON_PRACTICE },
    unit: "µm",
    required: true,
  },
  {
    code: "L-TS-TAP-H",
    title: "Tailstock taper, horizontal plane",
    measures: "Parallelism of a test mandrel in the sleeve taper to the carriage travel, horizontal plane",
    instrument: "Test mandrel in the sleeve taper, sleeve retracted and locked; indicator on the carriage near and at 300 mm",
    measuringLength: { nominal: 300, description: "300 mm between the near and far readings" },
    tolerance: proportional(30, 300),
    method: "near-far",
    direction: { allowed: "positive", positive: HORIZONTAL_PLUS, source: COMMON_PRACTICE },
    unit: "µm",
    required: true,
  },
  {
    code: "L-CTR-HT",
    title: "Centre height",
    measures: "Height of the tailstock centre against the headstock centre",
    instrument: "Test mandrel between centres; indicator on the carriage read at both ends in the vertical plane",
    measuringLength: { nominal: null, description: "Between the centres" },
    tolerance: fixed(40),
    method: "centre-height",
    direction: { allowed: "positive", positive: "+ = tailstock centre higher", source: COMMON_PRACTICE },
    unit: "µm",
    required: true,
  },
  {
    code: "L-TOP-PAR",
    title: "Top slide",
    measures: "Parallelism of the top slide travel to the spindle axis",
    instrument: "Test mandrel in the spindle taper; indicator on the top slide, top slide traversed",
    measuringLength: { nominal: 300, description: "300 mm of top slide travel, or its full travel if shorter" },
    tolerance: proportional(40, 300),
    method: "range-along",
    direction: { allowed: "either", positive: UNSIGNED, source: ISO_1708_FROM_MEMORY },
    unit: "µm",
    required: false,
  },
  {
    code: "L-XS-SQ",
    title: "Cross-slide",
    measures: "Squareness of the cross-slide travel to the spindle axis",
    instrument:
      "Indicator on the cross-slide against a face square to the spindle axis; stations increase outward from the axis",
    measuringLength: { nominal: 300, description: "300 mm of cross-slide travel" },
    tolerance: proportional(20, 300),
    method: "squareness",
    direction: {
      allowed: "positive",
      positive: "+ = faced surface concave (the travel moves toward the tailstock as it goes outward)",
      source: { confidence: "common-practice", note: "faced work must not rock" },
    },
    unit: "µm",
    required: true,
  },
  {
    code: "L-LS-SLIP",
    title: "Leadscrew axial slip",
    measures: "Axial slip of the leadscrew",
    instrument: "Indicator against the leadscrew's end, leadscrew turning",
    measuringLength: { nominal: null, description: "One revolution or more" },
    tolerance: fixed(15),
    method: "run-out",
    direction: { allowed: "any", positive: UNSIGNED, source: ISO_1708_FROM_MEMORY },
    unit: "µm",
    required: false,
  },
  {
    code: "L-LS-PITCH",
    title: "Leadscrew cumulative pitch error",
    measures: "Cumulative pitch error of the carriage driven by the leadscrew, over any 300 mm and any 60 mm",
    instrument: "Carriage driven by the leadscrew against a reference length (scale, gauge blocks); readings are position errors",
    measuringLength: { nominal: 300, description: "Any 300 mm (and any 60 mm) of travel" },
    tolerance: proportional(40, 300, { maximum: 40, source: LOW_CONFIDENCE }),
    overAnyWindow: 300,
    local: { tolerance: 15, window: 60, source: LOW_CONFIDENCE },
    method: "range-along",
    direction: { allowed: "any", positive: UNSIGNED, source: ISO_1708_FROM_MEMORY },
    unit: "µm",
    required: false,
  },
  {
    code: "L-P-ROUND",
    title: "Practical test: roundness",
    measures: "Roundness of a test piece turned in the chuck",
    instrument: "Indicator (or roundness instrument) around the turned diameter; readings radial, one revolution",
    measuringLength: { nominal: null, description: "One revolution of the turned diameter" },
    tolerance: fixed(10),
    method: "run-out",
    direction: { allowed: "any", positive: UNSIGNED, source: ISO_1708_FROM_MEMORY },
    unit: "µm",
    required: false,
  },
  {
    code: "L-P-DIA",
    title: "Practical test: diameter variation",
    measures: "Variation of diameter along a turned test piece",
    instrument: "Micrometer at stations along the turned length; readings are diameter deviations",
    measuringLength: { nominal: 300, description: "300 mm of turned length" },
    tolerance: proportional(40, 300),
    method: "range-along",
    direction: { allowed: "any", positive: UNSIGNED, source: ISO_1708_FROM_MEMORY },
    unit: "µm",
    required: false,
  },
  {
    code: "L-P-FLAT",
    title: "Practical test: facing flatness",
    measures: "Flatness of a faced test piece across its diameter",
    instrument: "Indicator on the cross-slide (or straightedge and gauges) across the faced diameter",
    measuringLength: { nominal: 300, description: "300 mm faced diameter" },
    tolerance: proportional(25, 300),
    method: "straightness",
    reference: "end-points",
    direction: {
      allowed: "concave",
      positive: "+ = standing proud of the face (toward the tailstock); concave = centre below the rim",
      source: COMMON_PRACTICE,
    },
    unit: "µm",
    required: false,
  },
];

/** Precision class: half of every normal-class tolerance, never below 5 µm, optionally put on a grid. */
function precisionTest(test: ProfileTest, options: { grid?: number; source: ValueSource }): ProfileTest {
  const halved = (value: number) => {
    const half = value / 2;
    // Only a half that is not a whole micrometre (7.5, 12.5) is moved onto the grid.
    const onGrid = options.grid && !Number.isInteger(half) ? roundToStep(half, options.grid) : half;
    return Math.max(onGrid, PRECISION_MINIMUM);
  };
  const spec = test.tolerance;
  let tolerance: ToleranceSpec;
  switch (spec.type) {
    case "fixed":
      tolerance = { type: "fixed", tolerance: halved(spec.tolerance), source: options.source };
      break;
    case "proportional":
      tolerance = {
        type: "proportional",
        tolerance: halved(spec.tolerance),
        over: spec.over,
        minimum: PRECISION_MINIMUM,
        ...(spec.maximum !== undefined ? { maximum: halved(spec.maximum) } : {}),
        source: options.source,
      };
      break;
    case "stepped":
      tolerance = {
        type: "stepped",
        steps: spec.steps.map((step) => ({ upTo: step.upTo, tolerance: halved(step.tolerance) })),
        source: options.source,
      };
      break;
  }
  return {
    ...test,
    tolerance,
    ...(test.local ? { local: { tolerance: halved(test.local.tolerance), window: test.local.window, source: options.source } } : {}),
  };
}

const KEY_FIGURES = {
  spindleRunOut: "L-SP-NOSE",
  axialSlip: "L-SP-SLIP",
  spindleParallelismVertical: "L-SP-PAR-V",
  spindleParallelismHorizontal: "L-SP-PAR-H",
  centreHeight: "L-CTR-HT",
  bedStraightness: "L-BED-V",
} as const;

const LATHE_SCOPE = {
  limits: [
    { dimension: "swingOverBedMm", maxMm: 800 },
    { dimension: "distanceBetweenCentresMm", maxMm: 1500 },
  ],
  source: ISO_1708_FROM_MEMORY,
} as const;

export const CENTRE_LATHE_NORMAL: ToleranceProfile = deepFreeze({
  key: "centre-lathe-normal",
  version: 1,
  title: "Centre lathe, normal class (swing ≤ 800 mm, between centres ≤ 1500 mm)",
  category: "centre-lathe",
  accuracyClass: "normal",
  scope: LATHE_SCOPE,
  rules: { minimumTolerance: { value: NORMAL_MINIMUM, source: FROM_MEMORY } },
  keyFigures: KEY_FIGURES,
  tests: NORMAL_CLASS_TESTS,
});

/** Version 1 of the precision class: kept as it was for the reports scored with it. */
export const CENTRE_LATHE_PRECISION_V1: ToleranceProfile = deepFreeze({
  key: "centre-lathe-precision",
  version: 1,
  title: "Centre lathe, precision (toolroom) class (swing ≤ 800 mm, between centres ≤ 1500 mm)",
  category: "toolroom-lathe",
  accuracyClass: "precision",
  scope: LATHE_SCOPE,
  rules: { minimumTolerance: { value: PRECISION_MINIMUM, source: IS_6040("clause 3.5") } },
  keyFigures: KEY_FIGURES,
  tests: NORMAL_CLASS_TESTS.map((test) => precisionTest(test, { source: PRECISION_SOURCE })),
});

/**
 * Version 2 follows the published rules of IS 6040:1993 (the precision-lathe chart aligned with
 * ISO 1708:1989): its scope (swing ≤ 500 mm, between centres ≤ 1 500 mm), proportional tolerances rounded
 * to the nearest 0.002 mm and never below 0.005 mm, and instruments that need not read finer than 0.002 mm
 * (clause 3.5). The values themselves are still the halved normal class.
 */
export const CENTRE_LATHE_PRECISION: ToleranceProfile = deepFreeze({
  key: "centre-lathe-precision",
  version: 2,
  title: "Centre lathe, precision (toolroom) class (swing ≤ 500 mm, between centres ≤ 1500 mm)",
  category: "toolroom-lathe",
  accuracyClass: "precision",
  scope: {
    limits: [
      { dimension: "swingOverBedMm", maxMm: 500 },
      { dimension: "distanceBetweenCentresMm", maxMm: 1500 },
    ],
    source: IS_6040("scope"),
  },
  rules: {
    minimumTolerance: { value: PRECISION_MINIMUM, source: IS_6040("clause 3.5") },
    rounding: { step: 2, source: IS_6040("clause 3.5") },
    leastCount: { value: 2, source: IS_6040("clause 3.5") },
  },
  keyFigures: KEY_FIGURES,
  tests: NORMAL_CLASS_TESTS.map((test) => precisionTest(test, { grid: 2, source: PRECISION_ON_GRID })),
});

/** Every built-in profile version, oldest first; the seed publishes each once. */
export const KNEE_MILL_NORMAL: ToleranceProfile = deepFreeze(KNEE_MILL_DATA);
export const SURFACE_GRINDER_NORMAL: ToleranceProfile = deepFreeze(SURFACE_GRINDER_DATA);
export const CNC_LATHE_NORMAL: ToleranceProfile = deepFreeze(CNC_LATHE_DATA);
export const MACHINING_CENTRE_NORMAL: ToleranceProfile = deepFreeze(MACHINING_CENTRE_DATA);

export const BUILT_IN_PROFILES: readonly ToleranceProfile[] = Object.freeze([
  CENTRE_LATHE_NORMAL,
  CENTRE_LATHE_PRECISION_V1,
  CENTRE_LATHE_PRECISION,
  KNEE_MILL_NORMAL,
  SURFACE_GRINDER_NORMAL,
  CNC_LATHE_NORMAL,
  MACHINING_CENTRE_NORMAL,
]);

export function findProfile(profiles: readonly ToleranceProfile[], key: string, version: number): ToleranceProfile | undefined {
  return profiles.find((profile) => profile.key === key && profile.version === version);
}

/** The newest version of each key. */
export function newestVersions(profiles: readonly ToleranceProfile[]): ToleranceProfile[] {
  const newest = new Map<string, ToleranceProfile>();
  for (const profile of profiles) {
    const seen = newest.get(profile.key);
    if (!seen || seen.version < profile.version) newest.set(profile.key, profile);
  }
  return [...newest.values()];
}

const sameName = (a: string, b: string) => a.trim().localeCompare(b.trim(), "en", { sensitivity: "base" }) === 0;

/** Whether a maker's chart is for this machine: same make and model, serial inside the range when one is set. */
export function makerChartFits(profile: ToleranceProfile, machine: MachineForProfile): boolean {
  const maker = profile.scope.maker;
  if (!maker || !machine.make || !machine.model) return false;
  if (!sameName(maker.make, machine.make) || !sameName(maker.model, machine.model)) return false;
  if (!maker.serialFrom && !maker.serialTo) return true;
  const serial = machine.serialNumber?.trim();
  if (!serial) return false;
  return (!maker.serialFrom || compareSerials(maker.serialFrom, serial) <= 0) && (!maker.serialTo || compareSerials(serial, maker.serialTo) <= 0);
}

/** Whether the machine's known sizes are inside the profile's limits (an unknown size is not checked). */
export function sizeFits(profile: ToleranceProfile, machine: MachineForProfile): boolean {
  return profile.scope.limits.every((limit) => {
    const size = machine.dimensions[limit.dimension];
    return size === null || size === undefined || size <= limit.maxMm;
  });
}

/**
 * The profile to suggest for a machine, among the versions offered for new reports: a maker's chart for its
 * make, model (and serial) first, then the general class for its category and size; only the newest version
 * of each profile counts. Null when none covers it (e.g. a lathe with over 800 mm swing: not yet sourced).
 */
export function suggestProfile(profiles: readonly ToleranceProfile[], machine: MachineForProfile): ToleranceProfile | null {
  if (!MACHINE_CATEGORIES.includes(machine?.category)) {
    throw new GeometryInputError(
      `No profiles for machine category "${String(machine?.category)}"; use one of ${MACHINE_CATEGORIES.join(", ")}.`,
      ["category"],
    );
  }
  for (const [dimension, size] of Object.entries(machine.dimensions)) {
    if (size !== null && size !== undefined) requirePositive(size, `The machine's ${dimension}`, ["dimensions", dimension]);
  }
  const candidates = newestVersions(profiles)
    .filter((profile) => profile.category === machine.category && sizeFits(profile, machine))
    .sort((a, b) => a.key.localeCompare(b.key));
  return candidates.find((profile) => makerChartFits(profile, machine)) ?? candidates.find((profile) => !profile.scope.maker) ?? null;
}
