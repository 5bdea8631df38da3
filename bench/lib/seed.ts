// The bench's data: 50 000 invented listings (500 000 at 10×; streamed in by COPY), a small library of photo
// variants made by the files module's pipeline and shared as covers, and a few thousand lathes with a
// signed report (bookings closed, reports sealed as the reports module seals them). Everything is drawn
// from one seed, so every run seeds the same machines, places, ids and readings.
import { pipeline } from "node:stream/promises";
import { Readable } from "node:stream";
import pg from "pg";
import { from as copyFrom } from "pg-copy-streams";
import { seededRandom, weighted, type SeededRandom } from "./random.ts";
import { credentialFor, signedReport, type ReportedMachine, type SignedReportRow } from "./report-content.ts";
import * as words from "./vocabulary.ts";

export type SeedOptions = { listings: number; reports: number; seed: number };

export type SeedResult = {
  listings: number;
  published: number;
  reports: number;
  photoSets: number;
  dealers: number;
  timingsMs: { accounts: number; listings: number; photos: number; reports: number; analyze: number; total: number };
  /** A published lathe with a signed report and three photos: the listing and report pages the bench loads. */
  sample: { slug: string; listingId: string; reportId: string };
};

const categories = [
  ["centre_lathe", 40],
  ["toolroom_lathe", 14],
  ["cnc_lathe", 20],
  ["milling_machine", 12],
  ["surface_grinder", 8],
  ["other", 6],
] as const;

const statuses = [
  ["published", 92],
  ["sold", 4],
  ["draft", 2],
  ["withdrawn", 2],
] as const;

const currencyOf: Record<string, string> = { GB: "GBP", US: "USD", CA: "CAD", SE: "SEK", NO: "NOK", CZ: "CZK", PL: "PLN" };

type ListingRow = Record<string, unknown> & { id: string; slug: string; status: string; category: string; make: string; model: string };

const listingColumns = [
  "id", "seller_id", "slug", "status", "category", "make", "model", "year", "serial_number", "swing_over_bed_mm",
  "distance_between_centres_mm", "spindle_bore_mm", "spindle_nose", "motor_power_kw", "weight_kg", "city", "region",
  "country", "price_minor", "currency", "condition", "tooling_included", "description", "published_at", "sold_at",
  "withdrawn_at", "created_at", "updated_at",
] as const;

function slugPart(text: string) {
  return text.normalize("NFKD").replace(/[\u0300-\u036f]/g, "").toLowerCase().replace(/[^a-z0-9]+/g, "-").replace(/^-+|-+$/g, "");
}

function makeListing(random: SeededRandom, index: number, sellerIds: string[], now: number): ListingRow {
  const category = weighted(random, categories);
  const lathe = category === "centre_lathe" || category === "toolroom_lathe" || category === "cnc_lathe";
  const make = random.pick(words.makes);
  const model = `${random.pick(words.modelPrefixes)} ${random.int(12, 90) * 10}${random.pick(words.modelSuffixes)}`;
  const year = random.chance(0.9) ? random.int(1962, 2021) : null;
  const place = random.pick(words.places);
  const status = weighted(random, statuses);
  const publishedAt = status === "draft" ? null : new Date(now - random.int(0, 720) * 86_400_000 - random.int(0, 86_399) * 1000);
  const createdAt = publishedAt ?? new Date(now - random.int(0, 30) * 86_400_000);
  const swing = lathe ? random.pick([180, 220, 250, 280, 320, 355.6, 400, 460, 520, 630, 800]) : null;
  const centres = lathe ? random.pick([350, 500, 750, 1000, 1016, 1250, 1500, 2000]) : null;
  const description = [
    random.pick(words.openings),
    random.pick(words.details),
    random.pick(words.details),
    random.chance(0.5) ? random.pick(words.details) : "",
    random.pick(words.closings),
  ]
    .filter(Boolean)
    .join(" ");
  // The index keeps slugs unique; the tail is the listing's number in base 36.
  const slug = `${slugPart(`${make} ${model}`)}-${year ?? "machine"}-${index.toString(36).padStart(4, "0")}`;
  return {
    id: random.uuid(),
    seller_id: random.pick(sellerIds),
    slug,
    status,
    category,
    make,
    model,
    year,
    serial_number: random.chance(0.6) ? `${make.slice(0, 2).toUpperCase()}${random.int(1000, 99999)}` : null,
    swing_over_bed_mm: swing,
    distance_between_centres_mm: centres,
    spindle_bore_mm: lathe ? random.pick([20, 26, 32, 38.1, 42, 52, 66, 80]) : null,
    spindle_nose: lathe ? random.pick(words.spindleNoses) : null,
    motor_power_kw: Math.round(random.between(0.75, 22) * 10) / 10,
    weight_kg: random.int(300, 6500),
    city: place.city,
    region: place.region,
    country: place.country,
    price_minor: random.int(8, 900) * 5_000,
    currency: currencyOf[place.country] ?? "EUR",
    condition: weighted(random, [["reconditioned", 3], ["used", 6], ["as_is", 1]] as const),
    tooling_included: random.pick(words.tooling),
    description,
    published_at: publishedAt,
    sold_at: status === "sold" ? new Date(createdAt.getTime() + 86_400_000) : null,
    withdrawn_at: status === "withdrawn" ? new Date(createdAt.getTime() + 86_400_000) : null,
    created_at: createdAt,
    updated_at: createdAt,
  };
}

/** A value in COPY's text format: `\\N` for null, ISO dates, JSON for objects, and the format's escapes. */
function copyValue(value: unknown): string {
  if (value === null || value === undefined) return "\\N";
  const text =
    value instanceof Date ? value.toISOString() : typeof value === "object" ? JSON.stringify(value) : String(value);
  return text.replace(/[\\\n\r\t]/g, (character) => ({ "\\": "\\\\", "\n": "\\n", "\r": "\\r", "\t": "\\t" })[character]!);
}

/**
 * Rows streamed into `table` by `COPY … FROM STDIN` (pg-copy-streams): one statement for any number of rows,
 * drawn as they are sent, so that 500 000 listings never sit in memory at once.
 */
async function copyRows(client: pg.ClientBase, table: string, columns: readonly string[], rows: Iterable<Record<string, unknown>>) {
  const columnList = columns.map((column) => `"${column}"`).join(", ");
  const lines = function* () {
    let chunk: string[] = [];
    for (const row of rows) {
      chunk.push(`${columns.map((column) => copyValue(row[column])).join("\t")}\n`);
      if (chunk.length === 1_000) {
        yield chunk.join("");
        chunk = [];
      }
    }
    if (chunk.length) yield chunk.join("");
  };
  await pipeline(Readable.from(lines()), client.query(copyFrom(`copy "${table}" (${columnList}) from stdin`)));
}

/** Multi-row INSERTs of at most `batch` rows (PostgreSQL allows 65 535 parameters a statement). */
async function insertRows(client: pg.ClientBase, table: string, columns: readonly string[], rows: Record<string, unknown>[], batch = Math.floor(60_000 / columns.length)) {
  const columnList = columns.map((column) => `"${column}"`).join(", ");
  for (let start = 0; start < rows.length; start += batch) {
    const slice = rows.slice(start, start + batch);
    const values: unknown[] = [];
    const tuples = slice.map((row) => {
      const placeholders = columns.map((column) => {
        const value = row[column];
        values.push(value !== null && typeof value === "object" && !(value instanceof Date) && !Array.isArray(value) ? JSON.stringify(value) : value);
        return `$${values.length}`;
      });
      return `(${placeholders.join(", ")})`;
    });
    await client.query(`insert into "${table}" (${columnList}) values ${tuples.join(", ")}`, values);
  }
}

function users(random: SeededRandom, names: readonly string[], kind: string, now: Date) {
  return names.map((name, index) => ({
    id: random.uuid(),
    name,
    email: `bench.${kind}.${index + 1}@example.test`,
    email_verified: true,
    display_units: "mm",
    created_at: now,
    updated_at: now,
  }));
}

const userColumns = ["id", "name", "email", "email_verified", "display_units", "created_at", "updated_at"];

function isoDate(date: Date) {
  return date.toISOString().slice(0, 10);
}

/**
 * Writes the bench's data into an empty database at `databaseUrl`. Photo variants go to the files stand-in
 * through the files module (its S3_* variables must be set in this process before the call).
 */
export async function seedBenchData(databaseUrl: string, options: SeedOptions): Promise<SeedResult> {
  const started = performance.now();
  const random = seededRandom(options.seed);
  // Dates count back from today (09:00 UTC), so that every seeded report is within its 12 months.
  const today = new Date();
  const now = Date.UTC(today.getUTCFullYear(), today.getUTCMonth(), today.getUTCDate(), 9);
  const nowDate = new Date(now);
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  const timingsMs = { accounts: 0, listings: 0, photos: 0, reports: 0, analyze: 0, total: 0 };
  try {
    let mark = performance.now();
    const dealers = users(random, words.dealerNames, "dealer", nowDate);
    const inspectors = users(random, words.inspectorNames, "inspector", nowDate);
    const [buyer] = users(random, ["Ilse Varga"], "buyer", nowDate);
    await insertRows(client, "user", userColumns, [...dealers, ...inspectors, buyer!]);
    await insertRows(
      client,
      "inspector_profiles",
      ["user_id", "headline", "bio", "qualifications", "base_city", "regions", "categories", "currency"],
      inspectors.map((inspector, index) => ({
        user_id: inspector.id,
        headline: "Geometry checks of centre and toolroom lathes",
        bio: "On-site accuracy checks with calibrated indicators, levels and test mandrels.",
        qualifications: "Machine-tool fitter; calibrated 1 µm lever indicator and a 300 mm test mandrel",
        base_city: words.places[index * 3]!.city,
        regions: [words.places[index * 3]!.region],
        categories: ["centre_lathe", "toolroom_lathe"],
        currency: "EUR",
      })),
    );
    timingsMs.accounts = performance.now() - mark;

    mark = performance.now();
    const sellerIds = dealers.map((dealer) => dealer.id);
    // Drawn as COPY sends them; kept: every id (for the photos), the first published listing, and the
    // lathes a report can be filed for (the lathe profiles' scope), published, the first `reports` of them.
    const ids: string[] = [];
    const reported: ListingRow[] = [];
    let firstPublished: ListingRow | undefined;
    let published = 0;
    function* listingRows() {
      for (let index = 0; index < options.listings; index++) {
        const row = makeListing(random, index, sellerIds, now);
        ids.push(row.id);
        if (row.status === "published") {
          published++;
          firstPublished ??= row;
          const reportable =
            (row.category === "centre_lathe" || row.category === "toolroom_lathe") &&
            (row.swing_over_bed_mm as number) <= 800 &&
            (row.distance_between_centres_mm as number) <= 1500;
          if (reportable && reported.length < options.reports) reported.push(row);
        }
        yield row;
      }
    }
    await client.query("begin");
    await copyRows(client, "listings", listingColumns, listingRows());
    await client.query("commit");
    timingsMs.listings = performance.now() - mark;
    const sample = reported[0] ?? firstPublished!;

    mark = performance.now();
    const photoSets = await seedPhotos(client, random, ids, sample.id);
    timingsMs.photos = performance.now() - mark;

    mark = performance.now();
    const reportRows: SignedReportRow[] = [];
    const bookingRows: Record<string, unknown>[] = [];
    for (const [index, row] of reported.entries()) {
      const inspectorUser = inspectors[index % inspectors.length]!;
      const measured = new Date(now - random.int(3, 330) * 86_400_000);
      const startsAt = new Date(Date.UTC(measured.getUTCFullYear(), measured.getUTCMonth(), measured.getUTCDate(), 8));
      const bookingId = random.uuid();
      const reportId = random.uuid();
      const reference = `BK-${(index + 1).toString(36).toUpperCase().padStart(6, "0")}`;
      const machine: ReportedMachine = {
        listingId: row.id,
        slug: row.slug,
        category: row.category as ReportedMachine["category"],
        make: row.make,
        model: row.model,
        year: row.year as number | null,
        serialNumber: row.serial_number as string | null,
        swingOverBedMm: row.swing_over_bed_mm as number,
        distanceBetweenCentresMm: row.distance_between_centres_mm as number,
        location: [row.city, row.region, row.country].filter(Boolean).join(", "),
      };
      const report = signedReport(random, {
        reportId,
        booking: { id: bookingId, reference },
        machine,
        inspector: { id: inspectorUser.id, name: inspectorUser.name },
        measuredOn: isoDate(measured),
        signedAt: new Date(startsAt.getTime() + 6 * 3_600_000),
      });
      reportRows.push(report);
      bookingRows.push({
        id: bookingId,
        reference,
        listing_id: row.id,
        buyer_id: buyer!.id,
        inspector_id: inspectorUser.id,
        category: row.category,
        starts_at: startsAt,
        ends_at: new Date(startsAt.getTime() + 4 * 3_600_000),
        // Closed: paid, filed and paid out long ago; closed bookings hold no inspector time.
        status: "closed",
        fee_minor: 38_000,
        currency: "EUR",
        platform_fee_minor: 5_700,
        inspector_share_minor: 32_300,
        report_id: reportId,
        paid_at: new Date(startsAt.getTime() - 7 * 86_400_000),
        accepted_at: new Date(startsAt.getTime() - 6 * 86_400_000),
        created_at: new Date(startsAt.getTime() - 8 * 86_400_000),
        updated_at: new Date(startsAt.getTime() + 6 * 3_600_000),
      });
    }
    const credentials = await Promise.all(reportRows.map((report) => credentialFor(report)));
    await client.query("begin");
    await insertRows(client, "bookings", Object.keys(bookingRows[0] ?? { id: 0 }), bookingRows);
    await insertRows(
      client,
      "reports",
      ["id", "booking_id", "listing_id", "inspector_id", "revision", "status", "profile_key", "profile_version", "grade", "key_figures", "measured_on", "draft_version", "content", "canonical_json", "content_hash", "signed_at", "credential", "created_at", "updated_at"],
      reportRows.map((report, index) => ({
        id: report.id,
        booking_id: report.bookingId,
        listing_id: report.listingId,
        inspector_id: report.inspectorId,
        revision: 1,
        status: "signed",
        profile_key: report.profileKey,
        profile_version: report.profileVersion,
        grade: report.grade,
        key_figures: report.keyFigures,
        measured_on: report.measuredOn,
        draft_version: 1,
        content: report.content,
        canonical_json: report.canonicalJson,
        content_hash: report.contentHash,
        signed_at: report.signedAt,
        credential: credentials[index],
        created_at: report.signedAt,
        updated_at: report.signedAt,
      })),
      200,
    );
    await client.query("commit");
    timingsMs.reports = performance.now() - mark;

    mark = performance.now();
    // As autovacuum would in time: statistics, and the visibility map that lets counts read an index alone.
    await client.query("vacuum analyze");
    timingsMs.analyze = performance.now() - mark;
    timingsMs.total = performance.now() - started;

    const sampleReport = reportRows.find((report) => report.listingId === sample.id);
    return {
      listings: ids.length,
      published,
      reports: reportRows.length,
      photoSets,
      dealers: dealers.length,
      timingsMs,
      sample: { slug: sample.slug, listingId: sample.id, reportId: sampleReport?.id ?? "" },
    };
  } finally {
    await client.end();
  }
}

const PHOTO_SETS = 8;

/**
 * Eight drawn lathe photos through the files module's pipeline (WebP thumbnail and large view, metadata
 * stripped) into the bucket; every listing shows one of them as its cover, the sample listing all three views.
 */
async function seedPhotos(client: pg.ClientBase, random: SeededRandom, ids: string[], sampleId: string): Promise<number> {
  const { makePhotoVariants } = await import("../../app/modules/files/images.server.ts");
  const { writeObject } = await import("../../app/modules/files/storage.server.ts");
  const { drawLathePhoto, paints } = await import("../../app/demo/listing-photos.server.ts");
  type Stored = { thumbnailKey: string; largeKey: string; width: number; height: number; bytes: number };
  const stored: Stored[] = [];
  // The variants live under the sample listing's folder: the files route serves listing keys of that shape.
  for (let set = 0; set < PHOTO_SETS; set++) {
    const photo = await drawLathePhoto({ paint: paints[set % paints.length], view: set < 3 ? set : set % 3 });
    const variants = await makePhotoVariants(photo);
    const prefix = `listings/${sampleId}/photos/${random.uuid()}`;
    await writeObject({ key: `${prefix}/thumb.webp`, body: variants.thumbnail, contentType: "image/webp" });
    await writeObject({ key: `${prefix}/large.webp`, body: variants.large, contentType: "image/webp" });
    stored.push({ thumbnailKey: `${prefix}/thumb.webp`, largeKey: `${prefix}/large.webp`, width: variants.width, height: variants.height, bytes: photo.length });
  }
  function* photoRows() {
    for (const [index, id] of ids.entries()) {
      const views = id === sampleId ? [0, 1, 2] : [index % PHOTO_SETS];
      for (const [position, set] of views.entries()) {
        const photo = stored[set]!;
        yield {
          id: random.uuid(),
          listing_id: id,
          position,
          thumbnail_key: photo.thumbnailKey,
          large_key: photo.largeKey,
          width: photo.width,
          height: photo.height,
          original_name: `photo-${position + 1}.jpg`,
          original_bytes: photo.bytes,
        };
      }
    }
  }
  const photoColumns = ["id", "listing_id", "position", "thumbnail_key", "large_key", "width", "height", "original_name", "original_bytes"];
  await client.query("begin");
  await copyRows(client, "listing_photos", photoColumns, photoRows());
  await client.query("commit");
  return PHOTO_SETS;
}
