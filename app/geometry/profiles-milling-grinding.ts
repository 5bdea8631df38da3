// Built-in profiles for knee-type milling machines and surface grinders with a reciprocating table. The
// standards' texts (ISO 1701-1 and ISO 1984-1 for knee-type milling machines, ISO 1986-1 for surface grinders)
// are not at hand, so every value here is recalled and labelled `from memory`; staff correct them in the
// profile editor. Data only: the engine scores whatever profile it is passed.
import type { ProfileTest, ToleranceProfile, ToleranceSpec, ValueSource } from "./types";

const MILL_FROM_MEMORY: ValueSource = { confidence: "from-memory", document: "ISO 1701-1 / ISO 1984-1 (knee-type milling machines)" };
const GRINDER_FROM_MEMORY: ValueSource = { confidence: "from-memory", document: "ISO 1986-1 (surface grinders with reciprocating table)" };
const COMMON_PRACTICE: ValueSource = { confidence: "common-practice" };
const MILL_MINIMUM = 10; // µm, from memory
const GRINDER_MINIMUM = 5; // µm, from memory

const UNSIGNED = "no sign: max − min of the readings";
const SQUARE_PLUS = "+ = the angle between the travels is more than 90°";

function proportional(tolerance: number, over: number, minimum: number, source: ValueSource, maximum?: number): ToleranceSpec {
  return { type: "proportional", tolerance, over, minimum, ...(maximum !== undefined ? { maximum } : {}), source };
}
const fixed = (tolerance: number, source: ValueSource): ToleranceSpec => ({ type: "fixed", tolerance, source });

interface TestShape {
  code: string;
  title: string;
  measures: string;
  instrument: string;
  length: { nominal: number | null; description: string };
  tolerance: ToleranceSpec;
  method: ProfileTest["method"];
  direction?: ProfileTest["direction"];
  required?: boolean;
  reference?: ProfileTest["reference"];
}

function test(shape: TestShape): ProfileTest {
  return {
    code: shape.code,
    title: shape.title,
    measures: shape.measures,
    instrument: shape.instrument,
    measuringLength: shape.length,
    tolerance: shape.tolerance,
    method: shape.method,
    ...(shape.reference ? { reference: shape.reference } : {}),
    direction: shape.direction ?? { allowed: "any", positive: UNSIGNED, source: COMMON_PRACTICE },
    unit: "µm",
    required: shape.required ?? true,
  };
}

const squareDirection = (source: ValueSource): ProfileTest["direction"] => ({ allowed: "either", positive: SQUARE_PLUS, source });

const MILL_TESTS: readonly ProfileTest[] = [
  test({
    code: "M-TABLE-FLAT",
    title: "Table, flatness",
    measures: "Flatness of the work table's surface",
    instrument: "Precision level read along rows and columns (or the diagonal layout), or a straightedge and gauge blocks; enter the heights",
    length: { nominal: null, description: "Longer side of the area read (table length)" },
    tolerance: { type: "stepped", steps: [{ upTo: 1000, tolerance: 40 }, { upTo: 2000, tolerance: 50 }], source: MILL_FROM_MEMORY },
    method: "flatness",
  }),
  test({
    code: "M-TABLE-X",
    title: "Table parallel to longitudinal travel",
    measures: "Parallelism of the table surface to the longitudinal (X) travel",
    instrument: "Dial indicator on the spindle head, stylus on the table (or a straightedge on it), table traversed",
    length: { nominal: 500, description: "Longitudinal travel" },
    tolerance: proportional(25, 500, MILL_MINIMUM, MILL_FROM_MEMORY, 40),
    method: "range-along",
  }),
  test({
    code: "M-TABLE-Y",
    title: "Table parallel to cross travel",
    measures: "Parallelism of the table surface to the cross (Y) travel",
    instrument: "Dial indicator on the spindle head, stylus on the table, saddle traversed",
    length: { nominal: 300, description: "Cross travel" },
    tolerance: proportional(25, 300, MILL_MINIMUM, MILL_FROM_MEMORY),
    method: "range-along",
  }),
  test({
    code: "M-X-STR",
    title: "Longitudinal travel, horizontal plane",
    measures: "Straightness of the longitudinal (X) travel in the horizontal plane",
    instrument: "Dial indicator on the spindle head against a straightedge on the table, set parallel at its ends",
    length: { nominal: null, description: "Longitudinal travel" },
    tolerance: { type: "stepped", steps: [{ upTo: 500, tolerance: 15 }, { upTo: 1000, tolerance: 20 }, { upTo: 2000, tolerance: 30 }], source: MILL_FROM_MEMORY },
    method: "straightness",
    reference: "end-points",
    direction: { allowed: "any", positive: "+ = toward the column", source: COMMON_PRACTICE },
  }),
  test({
    code: "M-XY-SQ",
    title: "Cross travel square to longitudinal travel",
    measures: "Squareness of the cross (Y) travel to the longitudinal (X) travel",
    instrument: "Square set on the table with one arm along X; dial indicator on the spindle head read along the other arm while the saddle moves",
    length: { nominal: 300, description: "Cross travel read along the square" },
    tolerance: proportional(20, 300, MILL_MINIMUM, MILL_FROM_MEMORY),
    method: "squareness",
    direction: squareDirection(COMMON_PRACTICE),
  }),
  test({
    code: "M-Z-SQ",
    title: "Vertical travel square to the table",
    measures: "Squareness of the knee's vertical (Z) travel to the table surface, in the longitudinal and cross planes (the worse)",
    instrument: "Square standing on the table; dial indicator on the spindle head read along it while the knee is raised",
    length: { nominal: 300, description: "Vertical travel read along the square" },
    tolerance: proportional(25, 300, MILL_MINIMUM, MILL_FROM_MEMORY),
    method: "squareness",
    direction: squareDirection(COMMON_PRACTICE),
  }),
  test({
    code: "M-SLOT",
    title: "Central T-slot parallel to longitudinal travel",
    measures: "Parallelism of the central T-slot's reference side to the longitudinal (X) travel",
    instrument: "Dial indicator on the spindle head against the slot's side (or a block held to it), table traversed",
    length: { nominal: 500, description: "Longitudinal travel" },
    tolerance: proportional(25, 500, MILL_MINIMUM, MILL_FROM_MEMORY, 40),
    method: "range-along",
  }),
  test({
    code: "M-SP-NOSE",
    title: "Spindle taper run-out at the nose",
    measures: "Run-out of the spindle taper, read on a test mandrel close to the nose",
    instrument: "Test mandrel in the taper, dial indicator at the nose, spindle turned slowly by hand",
    length: { nominal: null, description: "At the spindle nose" },
    tolerance: fixed(10, MILL_FROM_MEMORY),
    method: "run-out",
  }),
  test({
    code: "M-SP-300",
    title: "Spindle taper run-out at 300 mm",
    measures: "Run-out of the spindle taper, read on a test mandrel 300 mm from the nose",
    instrument: "Test mandrel in the taper, dial indicator 300 mm out, spindle turned slowly by hand",
    length: { nominal: 300, description: "300 mm from the nose" },
    tolerance: fixed(20, MILL_FROM_MEMORY),
    method: "run-out",
  }),
  test({
    code: "M-SP-SLIP",
    title: "Spindle periodic axial slip",
    measures: "Periodic axial slip of the spindle",
    instrument: "Dial indicator on a ball held in the spindle's centre, along the axis, spindle turned slowly by hand",
    length: { nominal: null, description: "On the spindle axis" },
    tolerance: fixed(10, MILL_FROM_MEMORY),
    method: "run-out",
  }),
  test({
    code: "M-SP-TABLE",
    title: "Spindle axis to the table",
    measures: "Vertical spindle: axis square to the table (indicator swung on a 300 mm circle, readings on opposite sides); horizontal spindle: axis parallel to the table (mandrel, near and far)",
    instrument: "Vertical: dial indicator on an arm in the spindle, read at front and back, then left and right; horizontal: test mandrel, indicator on the table near and 300 mm out",
    length: { nominal: 300, description: "Swing diameter, or mandrel length" },
    tolerance: proportional(25, 300, MILL_MINIMUM, MILL_FROM_MEMORY),
    method: "near-far",
    direction: { allowed: "either", positive: "+ = far side (back, or free end) higher", source: COMMON_PRACTICE },
  }),
];

const GRINDER_TESTS: readonly ProfileTest[] = [
  test({
    code: "G-TRAVEL-V",
    title: "Table travel, vertical plane",
    measures: "Straightness of the table's longitudinal travel in the vertical plane",
    instrument: "Precision level on the table, read at equal steps; enter the height profile (µm) the readings give",
    length: { nominal: null, description: "Table travel" },
    tolerance: { type: "stepped", steps: [{ upTo: 500, tolerance: 8 }, { upTo: 1000, tolerance: 10 }, { upTo: 2000, tolerance: 15 }], source: GRINDER_FROM_MEMORY },
    method: "straightness",
    reference: "end-points",
    direction: { allowed: "any", positive: "+ = higher", source: COMMON_PRACTICE },
  }),
  test({
    code: "G-TRAVEL-H",
    title: "Table travel, horizontal plane",
    measures: "Straightness of the table's longitudinal travel in the horizontal plane",
    instrument: "Dial indicator on the wheelhead against a straightedge on the table, set parallel at its ends",
    length: { nominal: null, description: "Table travel" },
    tolerance: { type: "stepped", steps: [{ upTo: 500, tolerance: 8 }, { upTo: 1000, tolerance: 10 }, { upTo: 2000, tolerance: 15 }], source: GRINDER_FROM_MEMORY },
    method: "straightness",
    reference: "end-points",
    direction: { allowed: "any", positive: "+ = toward the column", source: COMMON_PRACTICE },
  }),
  test({
    code: "G-TABLE-PAR",
    title: "Table parallel to its travel",
    measures: "Parallelism of the table (or chuck) surface to the longitudinal travel",
    instrument: "Dial indicator on the wheelhead, stylus on the table surface, table traversed",
    length: { nominal: null, description: "Table travel" },
    tolerance: { type: "stepped", steps: [{ upTo: 500, tolerance: 10 }, { upTo: 1000, tolerance: 15 }, { upTo: 2000, tolerance: 20 }], source: GRINDER_FROM_MEMORY },
    method: "range-along",
  }),
  test({
    code: "G-CROSS-PAR",
    title: "Cross travel parallel to the table",
    measures: "Parallelism of the cross travel (wheelhead or saddle) to the table surface",
    instrument: "Dial indicator on the wheelhead, stylus on the table, cross travel traversed",
    length: { nominal: 300, description: "Cross travel" },
    tolerance: proportional(10, 300, GRINDER_MINIMUM, GRINDER_FROM_MEMORY),
    method: "range-along",
  }),
  test({
    code: "G-HEAD-SQ",
    title: "Wheelhead vertical travel square to the table",
    measures: "Squareness of the wheelhead's vertical travel to the table surface",
    instrument: "Square standing on the table; dial indicator on the wheelhead read along it while the head is lowered",
    length: { nominal: 300, description: "Vertical travel read along the square" },
    tolerance: proportional(15, 300, GRINDER_MINIMUM, GRINDER_FROM_MEMORY),
    method: "squareness",
    direction: squareDirection(COMMON_PRACTICE),
  }),
  test({
    code: "G-SP-RUN",
    title: "Wheel spindle run-out",
    measures: "Radial run-out of the wheel spindle's seating",
    instrument: "Dial indicator on the spindle's seating (wheel off, guard off, isolated), spindle turned by hand",
    length: { nominal: null, description: "On the seating" },
    tolerance: fixed(5, GRINDER_FROM_MEMORY),
    method: "run-out",
  }),
  test({
    code: "G-SP-SLIP",
    title: "Wheel spindle axial slip",
    measures: "Periodic axial slip of the wheel spindle",
    instrument: "Dial indicator on the spindle's end face along the axis, spindle turned by hand",
    length: { nominal: null, description: "On the spindle axis" },
    tolerance: fixed(5, GRINDER_FROM_MEMORY),
    method: "run-out",
  }),
  test({
    code: "G-PRACTICAL",
    title: "Practical test: ground block",
    measures: "Thickness of a steel block ground on the machine, read along its length: parallelism of the ground face to the face on the chuck",
    instrument: "Block ground with a light finishing pass; micrometer or indicator on a surface plate read at equal steps along it",
    length: { nominal: null, description: "Length of the ground block" },
    tolerance: proportional(5, 300, GRINDER_MINIMUM, GRINDER_FROM_MEMORY),
    method: "range-along",
  }),
  test({
    code: "G-CHUCK-FLAT",
    title: "Table or chuck, flatness",
    measures: "Flatness of the table (or magnetic chuck) surface",
    instrument: "Precision level read along rows and columns, or an indicator on the wheelhead over a grid; enter the heights",
    length: { nominal: null, description: "Longer side of the area read" },
    tolerance: { type: "stepped", steps: [{ upTo: 500, tolerance: 10 }, { upTo: 1000, tolerance: 15 }, { upTo: 2000, tolerance: 20 }], source: GRINDER_FROM_MEMORY },
    method: "flatness",
    required: false,
  }),
];

export const KNEE_MILL_NORMAL: ToleranceProfile = {
  key: "knee-mill-normal",
  version: 1,
  title: "Knee-type milling machine, normal class (table ≤ 2000 mm)",
  category: "milling-machine",
  accuracyClass: "normal",
  scope: { limits: [{ dimension: "tableLengthMm", maxMm: 2000 }], source: MILL_FROM_MEMORY },
  rules: { minimumTolerance: { value: MILL_MINIMUM, source: MILL_FROM_MEMORY } },
  keyFigures: { tableFlatness: "M-TABLE-FLAT", travelSquareness: "M-XY-SQ", spindleRunOut: "M-SP-NOSE", axialSlip: "M-SP-SLIP" },
  tests: MILL_TESTS,
};

export const SURFACE_GRINDER_NORMAL: ToleranceProfile = {
  key: "surface-grinder-normal",
  version: 1,
  title: "Surface grinder, reciprocating table, normal class (table ≤ 2000 mm)",
  category: "surface-grinder",
  accuracyClass: "normal",
  scope: { limits: [{ dimension: "tableLengthMm", maxMm: 2000 }], source: GRINDER_FROM_MEMORY },
  rules: { minimumTolerance: { value: GRINDER_MINIMUM, source: GRINDER_FROM_MEMORY } },
  keyFigures: { tableFlatness: "G-CHUCK-FLAT", travelSquareness: "G-HEAD-SQ", spindleRunOut: "G-SP-RUN", axialSlip: "G-SP-SLIP" },
  tests: GRINDER_TESTS,
};
