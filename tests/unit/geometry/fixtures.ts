import type { ReportMeasurements, TestMeasurement } from "~/geometry";

// An invented, well-kept lathe (demo data): every test of the normal-class profile, each ratio ≤ 0.5.
const points = (stations: number[], readings: number[]) => stations.map((station, i) => ({ station, reading: readings[i]! }));

export const WELL_KEPT_LATHE: Record<string, TestMeasurement> = {
  "L-BED-V": {
    kind: "profile",
    points: points([0, 125, 250, 375, 500, 625, 750, 875, 1000], [0, 4, 7, 9, 10, 9, 7, 4, 0]),
    resolution: 0.5,
  }, // 10 µm of 20: r = 0.5
  "L-BED-X": { kind: "level", points: points([0, 500, 1000], [10, -5, 5]), resolution: 2 }, // 15 µm/m of 40
  "L-CAR-H": { kind: "profile", points: points([0, 250, 500, 750, 1000], [0, 3, 5, 4, 2]), resolution: 1 }, // 4 of 20
  "L-TS-TRAV-V": { kind: "profile", points: points([0, 500, 1000], [0, 5, 8]), resolution: 1 }, // 8 of 30
  "L-TS-TRAV-H": { kind: "profile", points: points([0, 500, 1000], [0, -4, -6]), resolution: 1 }, // 6 of 30
  "L-SP-SLIP": { kind: "extremes", max: 3, min: 0, resolution: 1 }, // 3 of 10
  "L-FP-CAM": { kind: "sweep", readings: [0, 4, 8, 3], resolution: 1 }, // 8 of 20
  "L-SP-NOSE": { kind: "sweep", readings: [0, 2, 4, 1], resolution: 1 }, // 4 of 10
  "L-SP-TAP-N": { kind: "extremes", max: 4, min: 0, resolution: 1 }, // 4 of 10
  "L-SP-TAP-F": { kind: "extremes", max: 8, min: 0, resolution: 1 }, // 8 of 20
  "L-SP-PAR-V": { kind: "mandrel", near: { at0: 0, at180: 0 }, far: { at0: 12, at180: 4 }, resolution: 1 }, // +8 of 20
  "L-SP-PAR-H": { kind: "mandrel", near: { at0: 1, at180: -1 }, far: { at0: 6, at180: 4 }, resolution: 1 }, // +5 of 15
  "L-SP-CTR": { kind: "sweep", readings: [0, 5, 3], resolution: 1 }, // 5 of 15
  "L-TS-SLV-V": { kind: "near-far", near: 0, far: 6, resolution: 1 }, // +6 of 15
  "L-TS-SLV-H": { kind: "near-far", near: 0, far: 4, resolution: 1 }, // +4 of 10
  "L-TS-TAP-V": { kind: "near-far", near: 0, far: 12, resolution: 1 }, // +12 of 30
  "L-TS-TAP-H": { kind: "near-far", near: 0, far: 10, resolution: 1 }, // +10 of 30
  "L-CTR-HT": { kind: "centre-height", headstockEnd: 0, tailstockEnd: 15, resolution: 1 }, // +15 of 40
  "L-TOP-PAR": { kind: "profile", points: points([0, 150, 300], [0, 6, 10]), resolution: 1 }, // 10 of 40
  "L-XS-SQ": { kind: "profile", points: points([0, 150, 300], [0, 3, 6]), resolution: 1 }, // +6 of 20
  "L-LS-SLIP": { kind: "extremes", max: 5, min: 0, resolution: 1 }, // 5 of 15
  "L-LS-PITCH": {
    kind: "profile",
    points: points([0, 60, 120, 180, 240, 300, 360, 420, 480, 540, 600], [0, 2, 4, 5, 7, 9, 10, 8, 12, 13, 14]),
    resolution: 1,
  }, // 9 of 40 over any 300 mm, 4 of 15 over any 60 mm
  "L-P-ROUND": { kind: "sweep", readings: [0, 2, 4, 3], resolution: 1 }, // 4 of 10
  "L-P-DIA": { kind: "profile", points: points([0, 150, 300], [0, 6, 10]), resolution: 1 }, // 10 of 40
  "L-P-FLAT": { kind: "profile", points: points([0, 75, 150, 225, 300], [0, -3, -5, -3, 0]), resolution: 1 }, // 5 of 25, concave
};

export function wellKeptReport(overrides: Record<string, TestMeasurement | undefined> = {}): ReportMeasurements {
  const tests: Record<string, TestMeasurement> = { ...WELL_KEPT_LATHE };
  for (const [code, measurement] of Object.entries(overrides)) {
    if (measurement === undefined) delete tests[code];
    else tests[code] = measurement;
  }
  return {
    measuredOn: "2025-03-14",
    conditions: { ambientTemperatureC: 20.5, warmUpMinutes: 30, levelled: true },
    tests,
  };
}
