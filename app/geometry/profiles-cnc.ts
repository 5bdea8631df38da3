// Built-in profiles for numerically controlled machines: a CNC lathe (X and Z axes) and a vertical machining
// centre (X, Y and Z). Each axis is graded on the three ISO 230-2 figures of one set of interferometer runs:
// positioning accuracy A, repeatability R and the reversal value B, each with its tolerance by the travel the
// targets span. The acceptance standards' tables (ISO 13041-2 for turning centres, ISO 10791-4 for machining
// centres) were not at hand, so every value is recalled and labelled `from memory`; staff correct them in the
// profile editor, and a maker's stated positioning specification becomes a maker's chart profile copied from
// these. Data only: the engine scores whatever profile it is passed.
//
// The tests of one axis share their readings: their codes are the axis's prefix and one letter (V-X-A, V-X-R,
// V-X-B), and the report form enters the runs once per prefix (positioningGroups).
import type { ProfileTest, ToleranceProfile, ToleranceSpec, ValueSource } from "./types";

const LATHE_FROM_MEMORY: ValueSource = { confidence: "from-memory", document: "ISO 13041-2 / ISO 230-2 (turning centres, positioning of linear axes)" };
const CENTRE_FROM_MEMORY: ValueSource = { confidence: "from-memory", document: "ISO 10791-4 / ISO 230-2 (machining centres, positioning of linear axes)" };
const CIRCULAR_FROM_MEMORY: ValueSource = { confidence: "from-memory", document: "ISO 10791-6 / ISO 230-4 (circular test)" };
const SPINDLE_FROM_MEMORY: ValueSource = { confidence: "from-memory", document: "ISO 10791-2 / ISO 13041-1 (spindle)" };
const COMMON_PRACTICE: ValueSource = { confidence: "common-practice" };
const MINIMUM = 5; // µm, from memory

const UNSIGNED = "no sign: a range or spread of the readings";
const UNSIGNED_DIRECTION = { allowed: "any", positive: UNSIGNED, source: COMMON_PRACTICE } as const;

/** Tolerances of A, R and B per band of travel (µm), recalled. */
type Bands = readonly { upTo: number; accuracy: number; repeatability: number; reversal: number }[];

const stepped = (bands: Bands, figure: "accuracy" | "repeatability" | "reversal", source: ValueSource): ToleranceSpec => ({
  type: "stepped",
  steps: bands.map((band) => ({ upTo: band.upTo, tolerance: band[figure] })),
  source,
});

const SAFETY_NOTE = "keep clear of the moving axes while the program runs: the machine moves on its own; guards closed as the manual says";

function axisTests(prefix: string, axis: string, travel: string, bands: Bands, source: ValueSource): ProfileTest[] {
  const common = {
    instrument: `Laser interferometer along the ${axis} axis (or another length instrument of the same class); targets over the travel, at least 5 runs each way; ${SAFETY_NOTE}. Import the instrument's table.`,
    measuringLength: { nominal: null, description: `${travel} (first to last target)` },
    direction: UNSIGNED_DIRECTION,
    unit: "µm" as const,
    required: true,
  };
  return [
    {
      ...common,
      code: `${prefix}-A`,
      title: `${axis} axis, positioning accuracy`,
      measures: `Bidirectional accuracy of positioning A of the ${axis} axis: the spread of mean ± 2s over both directions (ISO 230-2)`,
      tolerance: stepped(bands, "accuracy", source),
      method: "positioning-accuracy",
    },
    {
      ...common,
      code: `${prefix}-R`,
      title: `${axis} axis, repeatability`,
      measures: `Bidirectional repeatability of positioning R of the ${axis} axis (ISO 230-2), from the same runs`,
      tolerance: stepped(bands, "repeatability", source),
      method: "positioning-repeatability",
    },
    {
      ...common,
      code: `${prefix}-B`,
      title: `${axis} axis, reversal value`,
      measures: `Reversal value B of the ${axis} axis: the largest difference between the mean deviations approaching from each direction (ISO 230-2), from the same runs`,
      tolerance: stepped(bands, "reversal", source),
      method: "positioning-reversal",
    },
  ];
}

const LATHE_X: Bands = [
  { upTo: 250, accuracy: 16, repeatability: 10, reversal: 8 },
  { upTo: 500, accuracy: 20, repeatability: 12, reversal: 10 },
];
const LATHE_Z: Bands = [
  { upTo: 500, accuracy: 20, repeatability: 12, reversal: 10 },
  { upTo: 1000, accuracy: 25, repeatability: 15, reversal: 12 },
  { upTo: 2000, accuracy: 32, repeatability: 18, reversal: 15 },
];
const CENTRE_AXIS: Bands = [
  { upTo: 500, accuracy: 22, repeatability: 12, reversal: 10 },
  { upTo: 800, accuracy: 25, repeatability: 15, reversal: 10 },
  { upTo: 1250, accuracy: 32, repeatability: 18, reversal: 12 },
  { upTo: 2000, accuracy: 42, repeatability: 24, reversal: 15 },
];

const spindleRunOut = (code: string, what: string): ProfileTest => ({
  code,
  title: "Spindle run-out at the nose",
  measures: `Run-out of the ${what}, read close to the nose`,
  instrument: "Dial indicator against the spindle's locating surface (or a test mandrel close to the nose), spindle turned slowly by hand with the drive locked out",
  measuringLength: { nominal: null, description: "At the spindle nose" },
  tolerance: { type: "fixed", tolerance: 5, source: SPINDLE_FROM_MEMORY },
  method: "run-out",
  direction: UNSIGNED_DIRECTION,
  unit: "µm",
  required: false,
});

export const CNC_LATHE_NORMAL: ToleranceProfile = {
  key: "cnc-lathe-normal",
  version: 1,
  title: "CNC lathe, positioning of X and Z (travel ≤ 500 mm in X, ≤ 2000 mm in Z)",
  category: "cnc-lathe",
  accuracyClass: "normal",
  scope: { limits: [], source: LATHE_FROM_MEMORY },
  rules: { minimumTolerance: { value: MINIMUM, source: LATHE_FROM_MEMORY } },
  keyFigures: { xPositioningAccuracy: "C-X-A", xRepeatability: "C-X-R", zPositioningAccuracy: "C-Z-A", zRepeatability: "C-Z-R", spindleRunOut: "C-SP-NOSE" },
  tests: [
    ...axisTests("C-X", "X", "Cross-slide travel", LATHE_X, LATHE_FROM_MEMORY),
    ...axisTests("C-Z", "Z", "Carriage travel", LATHE_Z, LATHE_FROM_MEMORY),
    spindleRunOut("C-SP-NOSE", "work spindle's nose (centring diameter)"),
  ],
};

export const MACHINING_CENTRE_NORMAL: ToleranceProfile = {
  key: "vertical-machining-centre-normal",
  version: 1,
  title: "Vertical machining centre, positioning of X, Y and Z (travel ≤ 2000 mm per axis)",
  category: "machining-centre",
  accuracyClass: "normal",
  scope: { limits: [], source: CENTRE_FROM_MEMORY },
  rules: { minimumTolerance: { value: MINIMUM, source: CENTRE_FROM_MEMORY } },
  keyFigures: {
    xPositioningAccuracy: "V-X-A",
    xRepeatability: "V-X-R",
    yPositioningAccuracy: "V-Y-A",
    yRepeatability: "V-Y-R",
    zPositioningAccuracy: "V-Z-A",
    zRepeatability: "V-Z-R",
    spindleRunOut: "V-SP-NOSE",
  },
  tests: [
    ...axisTests("V-X", "X", "Table travel, longitudinal", CENTRE_AXIS, CENTRE_FROM_MEMORY),
    ...axisTests("V-Y", "Y", "Saddle travel, cross", CENTRE_AXIS, CENTRE_FROM_MEMORY),
    ...axisTests("V-Z", "Z", "Spindle head travel, vertical", CENTRE_AXIS, CENTRE_FROM_MEMORY),
    {
      code: "V-XY-CIRC",
      title: "Circular test in the XY plane",
      measures: "Circular deviation of X and Y interpolating a circle, clockwise and counter-clockwise about one least-squares circle (ISO 230-4)",
      instrument: `Telescoping ball bar (or a circle test of the same class) on a radius of about 150 mm, read around the circle both ways at a stated feed; ${SAFETY_NOTE}. Import the instrument's table.`,
      measuringLength: { nominal: null, description: "Radius about 150 mm" },
      tolerance: { type: "fixed", tolerance: 30, source: CIRCULAR_FROM_MEMORY },
      method: "circular-deviation",
      direction: UNSIGNED_DIRECTION,
      unit: "µm",
      required: false,
    },
    spindleRunOut("V-SP-NOSE", "spindle taper"),
  ],
};

/** Codes of positioning tests grouped by axis: the tests that share one set of runs. */
export function positioningGroups(tests: readonly Pick<ProfileTest, "code" | "method">[]): Map<string, string[]> {
  const groups = new Map<string, string[]>();
  for (const test of tests) {
    if (!test.method.startsWith("positioning-")) continue;
    const prefix = test.code.replace(/-[^-]*$/, "");
    groups.set(prefix, [...(groups.get(prefix) ?? []), test.code]);
  }
  return groups;
}
