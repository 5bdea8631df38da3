import { GeometryInputError, requirePositive } from "./errors";
import type { MachineCategory, ProfileTest, ToleranceProfile, ToleranceSpec } from "./types";

// Labels as in GEOMETRY.md; tests and stored reports repeat them beside each value.
const ISO_1708_FROM_MEMORY = "ISO 1708:1989, from memory";
const PROPORTION_FROM_MEMORY = "ISO 1708:1989 values, from memory; rule of proportionality, ISO 230-1, from memory";
const COMMON_PRACTICE = "common practice";
const PRECISION_SOURCE =
  "half the normal class (Schlesinger, Testing Machine Tools, as quoted second-hand), " +
  "never below 5 µm (IS 6040:1993)";

const NORMAL_MINIMUM = 10; // µm, from memory
const PRECISION_MINIMUM = 5; // µm, IS 6040:1993

const VERTICAL_PLUS = "+ = free end higher";
const HORIZONTAL_PLUS = "+ = free end toward the tool (front, operator side, on a front-tool-post lathe)";
const UNSIGNED = "no sign: max − min of the readings";

function proportional(tolerance: number, over: number, extra: { maximum?: number; source?: string } = {}): ToleranceSpec {
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
    direction: { allowed: "convex", positive: "+ = higher; convex = middle above the end-point line", source: "from memory" },
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
      source: "common practice (faced work must not rock)",
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
    tolerance: proportional(40, 300, { maximum: 40, source: "ISO 1708:1989, from memory (low confidence)" }),
    overAnyWindow: 300,
    local: { tolerance: 15, window: 60, source: "ISO 1708:1989, from memory (low confidence)" },
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

function halved(value: number): number {
  return Math.max(value / 2, PRECISION_MINIMUM);
}

/** Precision class: half of every normal-class tolerance, never below 5 µm. */
function precisionTest(test: ProfileTest): ProfileTest {
  const spec = test.tolerance;
  let tolerance: ToleranceSpec;
  switch (spec.type) {
    case "fixed":
      tolerance = { type: "fixed", tolerance: halved(spec.tolerance), source: PRECISION_SOURCE };
      break;
    case "proportional":
      tolerance = {
        type: "proportional",
        tolerance: halved(spec.tolerance),
        over: spec.over,
        minimum: PRECISION_MINIMUM,
        ...(spec.maximum !== undefined ? { maximum: halved(spec.maximum) } : {}),
        source: PRECISION_SOURCE,
      };
      break;
    case "stepped":
      tolerance = {
        type: "stepped",
        steps: spec.steps.map((step) => ({ upTo: step.upTo, tolerance: halved(step.tolerance) })),
        source: PRECISION_SOURCE,
      };
      break;
  }
  return {
    ...test,
    tolerance,
    ...(test.local
      ? { local: { tolerance: halved(test.local.tolerance), window: test.local.window, source: PRECISION_SOURCE } }
      : {}),
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
  swingMaxMm: 800,
  betweenCentresMaxMm: 1500,
  source: ISO_1708_FROM_MEMORY,
};

export const CENTRE_LATHE_NORMAL: ToleranceProfile = deepFreeze({
  key: "centre-lathe-normal",
  version: 1,
  title: "Centre lathe, normal class (swing ≤ 800 mm, between centres ≤ 1500 mm)",
  category: "centre-lathe",
  accuracyClass: "normal",
  scope: LATHE_SCOPE,
  minimumTolerance: { value: NORMAL_MINIMUM, source: "from memory" },
  keyFigures: KEY_FIGURES,
  tests: NORMAL_CLASS_TESTS,
});

export const CENTRE_LATHE_PRECISION: ToleranceProfile = deepFreeze({
  key: "centre-lathe-precision",
  version: 1,
  title: "Centre lathe, precision (toolroom) class (swing ≤ 800 mm, between centres ≤ 1500 mm)",
  category: "toolroom-lathe",
  accuracyClass: "precision",
  scope: LATHE_SCOPE,
  minimumTolerance: { value: PRECISION_MINIMUM, source: "IS 6040:1993" },
  keyFigures: KEY_FIGURES,
  tests: NORMAL_CLASS_TESTS.map(precisionTest),
});

/** Every profile the engine knows, each version kept so that old reports re-score the same way. */
export const PROFILES: readonly ToleranceProfile[] = Object.freeze([CENTRE_LATHE_NORMAL, CENTRE_LATHE_PRECISION]);

export function getProfile(key: string, version: number): ToleranceProfile | undefined {
  return PROFILES.find((profile) => profile.key === key && profile.version === version);
}

export function latestProfile(key: string): ToleranceProfile | undefined {
  return PROFILES.filter((profile) => profile.key === key).sort((a, b) => b.version - a.version)[0];
}

/**
 * The newest profile for a machine of this category, swing and distance between centres, or null when
 * no profile covers it (e.g. swing over 800 mm: not yet sourced).
 */
export function suggestProfile(machine: {
  category: MachineCategory;
  swingMm: number;
  betweenCentresMm: number;
}): ToleranceProfile | null {
  requirePositive(machine?.swingMm, "The swing over the bed (mm)", ["swingMm"]);
  requirePositive(machine.betweenCentresMm, "The distance between centres (mm)", ["betweenCentresMm"]);
  const categories: readonly MachineCategory[] = ["centre-lathe", "toolroom-lathe"];
  if (!categories.includes(machine.category)) {
    throw new GeometryInputError(
      `No profiles for machine category "${String(machine.category)}"; use one of ${categories.join(", ")}.`,
      ["category"],
    );
  }
  const candidates = PROFILES.filter(
    (profile) =>
      profile.category === machine.category &&
      machine.swingMm <= profile.scope.swingMaxMm &&
      machine.betweenCentresMm <= profile.scope.betweenCentresMaxMm,
  ).sort((a, b) => b.version - a.version);
  return candidates[0] ?? null;
}

function deepFreeze<T>(value: T): T {
  if (value && typeof value === "object" && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const inner of Object.values(value)) deepFreeze(inner);
  }
  return value;
}
