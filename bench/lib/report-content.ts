// Signed accuracy reports for the bench's lathes: readings drawn from the seed, scored by the geometry
// engine exactly as the reports module does on submit, and sealed with the reports module's own
// RFC 8785 canonical JSON and SHA-256. The readings are invented demo data.
import { CENTRE_LATHE_NORMAL, CENTRE_LATHE_PRECISION, scoreReport, type ReportMeasurements, type TestMeasurement } from "../../app/geometry/index.ts";
import { REPORT_FORMAT, type ReportContent } from "../../app/modules/reports/content.ts";
import { SAFETY_CAUTIONS } from "../../app/modules/reports/safety.ts";
import { canonicalJson, sealContent } from "../../app/modules/reports/seal.server.ts";
import { buildReportCredential, didWebOf } from "../../app/modules/reports/credential.ts";
import { keyFragment, signCredential, signingKeyFromMultibase } from "../../app/modules/reports/signing.server.ts";
import type { SeededRandom } from "./random.ts";

export type ReportedMachine = {
  listingId: string;
  slug: string;
  category: "centre_lathe" | "toolroom_lathe";
  make: string;
  model: string;
  year: number | null;
  serialNumber: string | null;
  swingOverBedMm: number;
  distanceBetweenCentresMm: number;
  location: string;
};

/** A travel of `stations` readings (µm) with a gentle crown and some scatter, `scale` times the usual size. */
function travel(random: SeededRandom, length: number, stations: number, crown: number, scale: number) {
  return Array.from({ length: stations }, (_, i) => {
    const station = Math.round((length * i) / (stations - 1));
    const reading = scale * (crown * Math.sin((Math.PI * station) / length) + random.between(-0.6, 0.6));
    return { station, reading: Math.round(reading * 10) / 10 };
  });
}

const round = (value: number) => Math.round(value * 10) / 10;

/**
 * Every test of the lathe profiles, each reading `scale` times a typical good machine's: about 0.3 gives
 * grade A, 1 around B or C, 2 a D. Bed straightness over the distance between centres with 11 stations.
 */
export function latheMeasurements(random: SeededRandom, machine: ReportedMachine, scale: number, measuredOn: string): ReportMeasurements {
  const s = (value: number) => round(value * scale * random.between(0.7, 1.3));
  const small = (stations: number[], readings: number[]) => stations.map((station, i) => ({ station, reading: s(readings[i]!) }));
  const bed = Math.min(1000, machine.distanceBetweenCentresMm);
  const tests: Record<string, TestMeasurement> = {
    "L-BED-V": { kind: "profile", points: travel(random, bed, 11, 8, scale), resolution: 0.5 },
    "L-BED-X": { kind: "level", points: small([0, 250, 500, 750, 1000].map((x) => Math.round((x * bed) / 1000)), [10, -5, 5, 0, 8]), resolution: 2 },
    "L-CAR-H": { kind: "profile", points: travel(random, bed, 11, 5, scale), reference: "minimum-zone", resolution: 0.5 },
    "L-TS-TRAV-V": { kind: "profile", points: small([0, 250, 500, 750, 1000], [0, 3, 5, 7, 8]), resolution: 1 },
    "L-TS-TRAV-H": { kind: "profile", points: small([0, 250, 500, 750, 1000], [0, -2, -4, -5, -6]), resolution: 1 },
    "L-SP-SLIP": { kind: "extremes", max: s(3), min: 0, resolution: 1 },
    "L-FP-CAM": { kind: "sweep", readings: [0, 4, 8, 3, 1, 2, 5, 6].map(s), resolution: 1 },
    "L-SP-NOSE": { kind: "sweep", readings: [0, 2, 4, 1, 3, 2, 1, 0].map(s), resolution: 1 },
    "L-SP-TAP-N": { kind: "extremes", max: s(4), min: 0, resolution: 1 },
    "L-SP-TAP-F": { kind: "extremes", max: s(8), min: 0, resolution: 1 },
    "L-SP-PAR-V": { kind: "mandrel", near: { at0: 0, at180: 0 }, far: { at0: s(12), at180: s(4) }, resolution: 1 },
    "L-SP-PAR-H": { kind: "mandrel", near: { at0: s(1), at180: -s(1) }, far: { at0: s(6), at180: s(4) }, resolution: 1 },
    "L-SP-CTR": { kind: "sweep", readings: [0, 5, 3, 2].map(s), resolution: 1 },
    "L-TS-SLV-V": { kind: "near-far", near: 0, far: s(6), resolution: 1 },
    "L-TS-SLV-H": { kind: "near-far", near: 0, far: s(4), resolution: 1 },
    "L-TS-TAP-V": { kind: "near-far", near: 0, far: s(12), resolution: 1 },
    "L-TS-TAP-H": { kind: "near-far", near: 0, far: s(10), resolution: 1 },
    "L-CTR-HT": { kind: "centre-height", headstockEnd: 0, tailstockEnd: s(15), resolution: 1 },
    "L-TOP-PAR": { kind: "profile", points: small([0, 100, 200, 300], [0, 3, 6, 10]), resolution: 1 },
    "L-XS-SQ": { kind: "profile", points: small([0, 100, 200, 300], [0, 2, 4, 6]), resolution: 1 },
    "L-LS-SLIP": { kind: "extremes", max: s(5), min: 0, resolution: 1 },
    "L-LS-PITCH": {
      kind: "profile",
      points: small([0, 60, 120, 180, 240, 300, 360, 420, 480, 540, 600], [0, 2, 4, 5, 7, 9, 10, 8, 12, 13, 14]),
      resolution: 1,
    },
    "L-P-ROUND": { kind: "sweep", readings: [0, 2, 4, 3, 1].map(s), resolution: 1 },
    "L-P-DIA": { kind: "profile", points: small([0, 100, 200, 300], [0, 4, 7, 10]), resolution: 1 },
    "L-P-FLAT": { kind: "profile", points: small([0, 75, 150, 225, 300], [0, -3, -5, -3, 0]), resolution: 1 },
  };
  return { measuredOn, conditions: { ambientTemperatureC: round(random.between(18.5, 22)), warmUpMinutes: random.pick([20, 30, 45, 60]), levelled: true }, tests };
}

export type SignedReportRow = {
  id: string;
  bookingId: string;
  listingId: string;
  inspectorId: string;
  profileKey: string;
  profileVersion: number;
  grade: string;
  keyFigures: unknown;
  measuredOn: string;
  content: ReportContent;
  canonicalJson: string;
  contentHash: string;
  signedAt: Date;
};

/** One signed report of `machine`, as the reports module would have written it after signing. */
export function signedReport(
  random: SeededRandom,
  input: { reportId: string; booking: { id: string; reference: string }; machine: ReportedMachine; inspector: { id: string; name: string }; measuredOn: string; signedAt: Date },
): SignedReportRow {
  const profile = input.machine.category === "toolroom_lathe" ? CENTRE_LATHE_PRECISION : CENTRE_LATHE_NORMAL;
  // Mostly good machines (a dealer orders a report on a machine worth showing), a tail of worn ones.
  const scale = random.chance(0.7) ? random.between(0.15, 0.9) : random.between(0.9, 2.4);
  const measurements = latheMeasurements(random, input.machine, scale, input.measuredOn);
  const score = scoreReport(profile, measurements);
  const instruments: ReportContent["instruments"] = [
    { id: "dti", kind: "lever-indicator", kindLabel: "Lever (test) indicator", description: "Lever indicator, 1 µm graduation", resolution: 1, resolutionUnit: "µm", calibrationDue: null, calibrationOverdue: false },
    { id: "level", kind: "precision-level", kindLabel: "Precision spirit level", description: "200 mm level, 0.02 mm/m", resolution: 2, resolutionUnit: "µm/m", calibrationDue: null, calibrationOverdue: false },
    { id: "mandrel", kind: "test-mandrel", kindLabel: "Test mandrel", description: "300 mm test mandrel, MT5", resolution: null, resolutionUnit: null, calibrationDue: null, calibrationOverdue: false },
  ];
  const tests: ReportContent["tests"] = Object.fromEntries(
    Object.entries(measurements.tests).map(([code, measurement]) => [
      code,
      { instrumentId: measurement.kind === "level" ? "level" : "dti", notes: "", photo: null },
    ]),
  );
  const content: ReportContent = {
    format: REPORT_FORMAT,
    reportId: input.reportId,
    revision: 1,
    supersedes: null,
    booking: input.booking,
    machine: {
      listingId: input.machine.listingId,
      slug: input.machine.slug,
      title: `${input.machine.make} ${input.machine.model}`,
      category: input.machine.category,
      make: input.machine.make,
      model: input.machine.model,
      year: input.machine.year,
      serialNumber: input.machine.serialNumber,
      swingOverBedMm: input.machine.swingOverBedMm,
      distanceBetweenCentresMm: input.machine.distanceBetweenCentresMm,
      location: input.machine.location,
    },
    inspector: input.inspector,
    measuredOn: input.measuredOn,
    profile: { key: profile.key, version: profile.version, title: profile.title, suggested: { key: profile.key, version: profile.version }, reason: "Suggested for the machine's category and size." },
    entryUnits: "mm",
    conditions: {
      ambientTemperatureC: measurements.conditions?.ambientTemperatureC ?? null,
      warmUpMinutes: measurements.conditions?.warmUpMinutes ?? null,
      levelled: true,
      notes: "Machine levelled on its own feet before the checks.",
    },
    instruments,
    tests,
    measurementsAsEntered: measurements,
    measurements,
    score,
    notes: "",
    safety: { acknowledged: true, cautions: SAFETY_CAUTIONS },
    submittedAt: new Date(input.signedAt.getTime() - 3_600_000).toISOString(),
    signedAt: input.signedAt.toISOString(),
  };
  const { canonical, hash } = sealContent(content);
  return {
    id: input.reportId,
    bookingId: input.booking.id,
    listingId: input.machine.listingId,
    inspectorId: input.inspector.id,
    profileKey: profile.key,
    profileVersion: profile.version,
    grade: score.grade,
    keyFigures: score.keyFigures,
    measuredOn: input.measuredOn,
    content: JSON.parse(canonical) as ReportContent,
    canonicalJson: canonical,
    contentHash: hash,
    signedAt: input.signedAt,
  };
}

/** The report's signed credential, as signing issues it, with the run's key (REPORT_SIGNING_KEY, APP_ORIGIN). */
export async function credentialFor(report: SignedReportRow): Promise<string> {
  const origin = process.env.APP_ORIGIN!;
  const key = signingKeyFromMultibase(process.env.REPORT_SIGNING_KEY!);
  const credential = buildReportCredential(report.content, report.contentHash, origin);
  return canonicalJson(await signCredential(credential, key, `${didWebOf(origin)}#${keyFragment(key.publicKeyMultibase)}`, report.content.signedAt!));
}
