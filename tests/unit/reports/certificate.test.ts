// The PDF certificate: page 1 (grade, key figures, machine, inspector, date, QR code), vector plots drawn from
// the engine's results, the reader's units, and the structure PDF/A-3b asks for (ISO 19005-3), checked with
// pdf-lib since no PDF/A validator installs from npm or Debian (docs/certificate.md says what is and is not).
import { writeFileSync } from "node:fs";
import { inflateSync } from "node:zlib";
import PDFDocument from "pdfkit";
import { PDFArray, PDFDict, PDFDocument as PdfLibDocument, PDFName, PDFRawStream, PDFRef, PDFStream, decodePDFRawStream } from "pdf-lib";
import { PDFParse } from "pdf-parse";
import { describe, expect, it } from "vitest";
import { CENTRE_LATHE_NORMAL, SURFACE_GRINDER_NORMAL, positioningAccuracy, scoreReport, type ReportMeasurements, type ToleranceProfile } from "~/geometry";
import { heightColour, plotsOfReport, positioningPlot, ticks } from "~/modules/reports/certificate-plots.server";
import { renderCertificate } from "~/modules/reports/certificate.server";
import type { ReportContent } from "~/modules/reports/content";
import { CREDENTIAL_ATTACHMENT_NAME } from "~/modules/reports/credential-file";
import type { PublicReport } from "~/modules/reports/service.server";
import { WELL_KEPT_LATHE } from "../geometry/fixtures";

const origin = "https://tenthmark.example.test";
const hash = "ab".repeat(32);

function contentFor(profile: ToleranceProfile, tests: ReportMeasurements["tests"]): ReportContent {
  const measurements: ReportMeasurements = { measuredOn: "2026-03-04", conditions: { ambientTemperatureC: 20.5, warmUpMinutes: 30, levelled: true }, tests };
  const score = scoreReport(profile, measurements);
  return {
    format: "tenthmark.accuracy-report/1",
    reportId: "0b7f3c8e-3f43-4d4e-9a47-5f0b2d1c9e10",
    revision: 1,
    supersedes: null,
    booking: { id: "b1", reference: "TM-4821" },
    machine: {
      listingId: "5d1f0c3a-8b2e-4f6a-9c1d-2e3f4a5b6c7d",
      slug: "tessmar-dl-330",
      title: "Tessmar DL 330",
      category: "centre_lathe",
      make: "Tessmar",
      model: "DL 330",
      year: 1991,
      serialNumber: "DL330-1187",
      swingOverBedMm: 330,
      distanceBetweenCentresMm: 1000,
      location: "Brennach, Velmark",
    },
    inspector: { id: "i1", name: "Aldo Verrin" },
    measuredOn: "2026-03-04",
    profile: { key: profile.key, version: profile.version, title: profile.title, suggested: null, reason: "Suggested by the machine's size." },
    entryUnits: "mm",
    conditions: { ambientTemperatureC: 20.5, warmUpMinutes: 30, levelled: true, notes: "" },
    instruments: [],
    tests: {},
    measurementsAsEntered: measurements,
    measurements,
    score,
    notes: "",
    safety: { acknowledged: true, cautions: [] },
    submittedAt: "2026-03-04T15:00:00.000Z",
    signedAt: "2026-03-04T16:20:00.000Z",
  };
}

function publicReport(content: ReportContent): PublicReport {
  return {
    kind: "published",
    id: content.reportId,
    status: "signed",
    content,
    contentHash: hash,
    intact: true,
    signedAt: content.signedAt!,
    keyId: "key-2026-01",
    reissuedOn: null,
    supersededBy: null,
    revisions: [],
    isInspector: false,
    hasCredential: true,
    credential: JSON.stringify({ credentialSubject: { reportId: content.reportId }, proof: { type: "DataIntegrityProof" } }),
    notice: null,
    photoUrls: {},
    verificationUrl: `${origin}/reports/verify?hash=${hash}`,
  } as PublicReport;
}

async function pagesText(pdf: Buffer): Promise<string[]> {
  const parser = new PDFParse({ data: new Uint8Array(pdf) });
  const result = await parser.getText();
  await parser.destroy();
  return result.pages.map((page) => page.text.replace(/\s+/g, " "));
}

const lathe = contentFor(CENTRE_LATHE_NORMAL, WELL_KEPT_LATHE);

// A 5 × 4 grid on a magnetic chuck, 400 × 300 mm, gently domed, with one low corner (invented).
const chuckGrid = Array.from({ length: 5 * 4 }, (_, i) => {
  const x = (i % 5) * 100;
  const y = Math.floor(i / 5) * 100;
  return { x, y, z: 3 - ((x - 200) ** 2 + (y - 150) ** 2) / 20_000 + (x === 400 && y === 300 ? -2 : 0) + 0.002 * x };
});
const grinder = contentFor(SURFACE_GRINDER_NORMAL, { "G-CHUCK-FLAT": { kind: "surface", points: chuckGrid, reference: "minimum-zone", resolution: 0.5 } });

// To look at them (`pdftoppm -png`), set CERTIFICATE_PDF_DIR and the rendered certificates are kept there.
describe.runIf(process.env.CERTIFICATE_PDF_DIR)("certificates to look at", { timeout: 60_000 }, () => {
  it("writes a lathe's in mm and in inches, and a grinder's", async () => {
    const dir = process.env.CERTIFICATE_PDF_DIR!;
    writeFileSync(`${dir}/lathe-mm.pdf`, await renderCertificate(publicReport(lathe), { units: "mm", origin }));
    writeFileSync(`${dir}/lathe-inch.pdf`, await renderCertificate(publicReport(lathe), { units: "inch", origin }));
    writeFileSync(`${dir}/grinder-mm.pdf`, await renderCertificate(publicReport(grinder), { units: "mm", origin }));
  });
});

describe("page 1 of the certificate", { timeout: 60_000 }, () => {
  it("holds the grade, key figures, machine, inspector, date and the QR code to the verification", async () => {
    const pdf = await renderCertificate(publicReport(lathe), { units: "mm", origin, now: new Date("2026-04-01T00:00:00Z") });
    const [first, ...rest] = await pagesText(pdf);
    expect(first).toContain(`Grade ${lathe.score.grade}`);
    expect(first).toMatch(/Spindle run-out 4\.0 [µμ]m/);
    expect(first).toMatch(/Spindle axis, vertical \+8\.0 [µμ]m/);
    expect(first).toContain("Tessmar DL 330");
    expect(first).toContain("Aldo Verrin");
    expect(first).toContain("4 Mar 2026");
    expect(first).toContain("Check this certificate");
    // The QR code is drawn on page 1 as vector squares (hundreds of them), not on a later page.
    const document = await PdfLibDocument.load(pdf);
    const squares = (index: number) => {
      const contents = document.getPage(index).node.Contents();
      const streams = contents instanceof PDFArray ? contents.asArray().map((ref) => document.context.lookup(ref)) : [contents];
      const text = streams.map((stream) => Buffer.from(decodePDFRawStream(stream as PDFRawStream).decode()).toString("latin1")).join("\n");
      return (text.match(/ re\b/g) ?? []).length;
    };
    expect(squares(0)).toBeGreaterThan(200);
    expect(rest.join(" ")).not.toContain("Check this certificate");
    // "page X of Y" and the signature block.
    const all = [first, ...rest].join(" ");
    expect(first).toContain(`page 1 of ${rest.length + 1}`);
    expect(all).toContain("key-2026-01");
    expect(all).toContain(hash);
  });
});

describe("the machine's sizes", { timeout: 60_000 }, () => {
  it("gives a lathe's swing and distance between centres, and leaves them off a grinder that has none", async () => {
    const latheText = (await pagesText(await renderCertificate(publicReport(lathe), { units: "mm", origin }))).join(" ");
    expect(latheText).toMatch(/Swing over bed 330 mm/);
    const grinderText = (await pagesText(await renderCertificate(publicReport({ ...grinder, machine: { ...grinder.machine, category: "surface_grinder", swingOverBedMm: null, distanceBetweenCentresMm: null } }), { units: "mm", origin }))).join(" ");
    expect(grinderText).not.toMatch(/Swing over bed|Distance between centres/);
  });
});

describe("the results table", { timeout: 60_000 }, () => {
  it("names its columns again on each page it runs onto", async () => {
    const pages = await pagesText(await renderCertificate(publicReport(lathe), { units: "mm", origin }));
    // A results row ends in its ratio, direction and verdict ("0.40 no sign within").
    const withResults = pages.filter((text) => /\d\.\d\d (no sign|either way|[+−-] only|convex only|concave only)/.test(text));
    expect(withResults.length).toBeGreaterThan(1);
    for (const text of withResults) expect(text).toMatch(/Test Value Tolerance \(at length\) Ratio Direction Verdict/);
  });
});

describe("the reader's units", { timeout: 60_000 }, () => {
  it("writes deviations and lengths in µm and mm for a metric reader, with no inch figures beside them", async () => {
    const text = (await pagesText(await renderCertificate(publicReport(lathe), { units: "mm", origin }))).join(" ");
    expect(text).toMatch(/Swing over bed 330 mm/);
    expect(text).not.toMatch(/\d in\b/);
    expect(text).toMatch(/over 1,000 mm/);
  });

  it("writes them in inches for an inch reader, tilts staying in µm/m", async () => {
    const text = (await pagesText(await renderCertificate(publicReport(lathe), { units: "inch", origin }))).join(" ");
    // 4 µm = 0.000157 in; 330 mm = 12.992 in (1 in = 25.4 mm), quoted as the trade does: 13 in.
    expect(text).toMatch(/Spindle run-out 0\.0001[56]\d? in/);
    expect(text).toMatch(/Swing over bed 13 in/);
    expect(text).not.toMatch(/\d [µμ]m(?!\/m)/);
    expect(text).toMatch(/[µμ]m\/m/);
    expect(text).toMatch(/Reading \(in\)/);
    // Test and plot titles carry their lengths ("at 300 mm") in the reader's units too.
    expect(text).not.toMatch(/\d\s?mm\b/);
  });
});

describe("the plots", { timeout: 60_000 }, () => {
  it("draws straightness, mandrel and run-out for a lathe, each with its caption", async () => {
    const plots = plotsOfReport(lathe, "mm");
    const codes = plots.map((plot) => plot.code);
    expect(codes).toEqual(expect.arrayContaining(["L-BED-V", "L-BED-X", "L-SP-PAR-V", "L-SP-PAR-H", "L-SP-NOSE", "L-SP-SLIP"]));
    // Near-far and centre height are two numbers each: no plot.
    expect(codes).not.toContain("L-TS-SLV-V");
    expect(codes).not.toContain("L-CTR-HT");
    const bed = plots.find((plot) => plot.code === "L-BED-V")!;
    expect(bed.caption).toMatch(/Reference line by end points/);
    const text = (await pagesText(await renderCertificate(publicReport(lathe), { units: "mm", origin }))).join(" ");
    expect(text).toContain("Plots");
    expect(text).toContain("L-BED-V");
    expect(text).toContain("Filled: spindle at 0°");
  });

  it("draws a surface as a colour map with the minimum-zone width stated", async () => {
    const result = grinder.score.results.find((candidate) => candidate.code === "G-CHUCK-FLAT")!;
    expect(result.flatness?.reference).toBe("minimum-zone");
    const [plot] = plotsOfReport(grinder, "mm");
    expect(plot!.code).toBe("G-CHUCK-FLAT");
    expect(plot!.caption).toContain(`Minimum-zone width ${result.value.toFixed(1)} µm`);
    const text = (await pagesText(await renderCertificate(publicReport(grinder), { units: "mm", origin }))).join(" ");
    expect(text).toContain(`Zone width ${result.value.toFixed(1)} μm`);
    expect(text).toContain("0 (plane)");
    // The colour scale runs blue (below) through pale (at the plane) to brass (above).
    expect(heightColour(-1, 1)).toBe("#3d6fa8");
    expect(heightColour(0, 1)).toBe("#f4f1ea");
    expect(heightColour(1, 1)).toBe("#b8741a");
  });

  it("draws positioning as mean ± 2s for both directions with A, R, B and E, when a report carries runs", async () => {
    const runs = {
      targets: [0, 100, 200, 300, 400],
      forward: [
        [0, 2, 3, 5, 6],
        [1, 2, 4, 5, 7],
        [0, 3, 3, 6, 6],
      ],
      reverse: [
        [-2, 0, 1, 2, 4],
        [-1, -1, 1, 3, 3],
        [-2, 0, 0, 2, 4],
      ],
    };
    const evaluation = positioningAccuracy(runs);
    const plot = positioningPlot("C-X-POS", "X axis positioning", evaluation, "mm");
    expect(plot.caption).toContain(`Accuracy A ${evaluation.accuracy.toFixed(1)} µm`);
    expect(plot.caption).toContain(`reversal value B ${evaluation.reversalValue.toFixed(1)} µm`);
    // The registry draws any report test whose readings are positioning runs.
    const withRuns = { ...lathe, measurements: { ...lathe.measurements, tests: { "C-X-POS": { kind: "positioning", ...runs } as never } } };
    expect(plotsOfReport(withRuns, "inch").map((candidate) => candidate.code)).toContain("C-X-POS");
    // An axis's three tests share their runs: one plot for the axis.
    const axis = { ...lathe, measurements: { ...lathe.measurements, tests: Object.fromEntries(["C-X-A", "C-X-R", "C-X-B"].map((code) => [code, { kind: "positioning", ...runs } as never])) } };
    expect(plotsOfReport(axis, "mm").map((candidate) => candidate.code)).toEqual(["C-X-A"]);
    // It draws into a page without error.
    const doc = new PDFDocument({ size: "A4" });
    doc.registerFont("regular", "Helvetica");
    doc.registerFont("bold", "Helvetica-Bold");
    plot.draw(doc, { x: 48, y: 48, width: 499 });
    doc.end();
  });

  it("chooses round ticks and prints them without noise", () => {
    expect(ticks(0, 1000, 6)).toEqual({ values: [0, 200, 400, 600, 800, 1000], decimals: 0 });
    expect(ticks(-0.0004, 0.0004, 4)).toEqual({ values: [-0.0004, -0.0002, 0, 0.0002, 0.0004], decimals: 4 });
    expect(ticks(-0.0005, 0.0005, 4)).toEqual({ values: [-0.0005, -0.00025, 0, 0.00025, 0.0005], decimals: 5 });
    expect(ticks(0, 10, 4).decimals).toBe(1);
  });
});

describe("PDF/A-3b structure (ISO 19005-3, checked by hand)", { timeout: 60_000 }, () => {
  it("has XMP with part 3 conformance B, an sRGB output intent, embedded fonts, the credential as a Source associated file, and no encryption", async () => {
    const pdf = await renderCertificate(publicReport(grinder), { units: "mm", origin });
    expect(pdf.subarray(0, 8).toString("latin1")).toMatch(/^%PDF-1\.7/);
    const document = await PdfLibDocument.load(pdf, { updateMetadata: false });
    const { catalog, context } = document;
    const lookup = <T>(value: unknown) => (value instanceof PDFRef ? context.lookup(value) : value) as T;
    const streamText = (stream: unknown) => {
      const raw = lookup<PDFRawStream>(stream);
      return Buffer.from(decodePDFRawStream(raw).decode()).toString("utf8");
    };

    // No encryption; a document ID.
    expect(context.trailerInfo.Encrypt).toBeUndefined();
    expect(context.trailerInfo.ID).toBeDefined();

    // XMP metadata: pdfaid:part 3, conformance B.
    const xmp = streamText(catalog.get(PDFName.of("Metadata")));
    expect(xmp).toMatch(/pdfaid:part(>|=")3/);
    expect(xmp).toMatch(/pdfaid:conformance(>|=")B/);

    // Output intent: GTS_PDFA1 with an embedded ICC profile (RGB).
    const intents = lookup<PDFArray>(catalog.get(PDFName.of("OutputIntents")));
    const intent = lookup<PDFDict>(intents.get(0));
    expect(intent.get(PDFName.of("S"))).toBe(PDFName.of("GTS_PDFA1"));
    const profile = lookup<PDFStream>(intent.get(PDFName.of("DestOutputProfile")));
    expect(profile.dict.get(PDFName.of("N"))?.toString()).toBe("3");
    const icc = decodePDFRawStream(profile as PDFRawStream).decode();
    expect(Buffer.from(icc.subarray(36, 40)).toString("latin1")).toBe("acsp");

    // Every font is embedded (a font file in its descriptor); none of the standard 14 by name only.
    const fonts = context.enumerateIndirectObjects().map(([, object]) => object).filter((object): object is PDFDict => object instanceof PDFDict && object.get(PDFName.of("Type")) === PDFName.of("Font"));
    expect(fonts.length).toBeGreaterThan(0);
    for (const font of fonts) {
      const descendants = lookup<PDFArray | undefined>(font.get(PDFName.of("DescendantFonts")));
      const leaf = descendants ? lookup<PDFDict>(descendants.get(0)) : font;
      const descriptor = lookup<PDFDict | undefined>(leaf.get(PDFName.of("FontDescriptor")));
      expect(descriptor, String(font.get(PDFName.of("BaseFont")))).toBeDefined();
      expect(["FontFile", "FontFile2", "FontFile3"].some((key) => descriptor!.has(PDFName.of(key)))).toBe(true);
    }

    // The credential is an associated file of the document, relationship Source, with its media type.
    const associated = lookup<PDFArray>(catalog.get(PDFName.of("AF")));
    const spec = lookup<PDFDict>(associated.get(0));
    expect(spec.get(PDFName.of("AFRelationship"))).toBe(PDFName.of("Source"));
    expect(lookup<{ decodeText(): string }>(spec.get(PDFName.of("UF"))).decodeText()).toBe(CREDENTIAL_ATTACHMENT_NAME);
    const embedded = lookup<PDFRawStream>(lookup<PDFDict>(spec.get(PDFName.of("EF"))).get(PDFName.of("F")));
    expect(embedded.dict.get(PDFName.of("Subtype"))?.toString()).toBe("/application#2Fvc");
    expect(inflateSync(Buffer.from(embedded.contents)).toString("utf8")).toContain("DataIntegrityProof");
    // And listed in the document's embedded files, so ordinary readers show it.
    const names = lookup<PDFDict>(catalog.get(PDFName.of("Names")));
    expect(names.has(PDFName.of("EmbeddedFiles"))).toBe(true);

    // Nothing PDF/A forbids: no JavaScript, no launch actions.
    const raw = pdf.toString("latin1");
    expect(raw).not.toMatch(/\/JavaScript|\/JS\b|\/Launch/);
  });
});
