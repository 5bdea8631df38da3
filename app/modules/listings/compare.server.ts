// Machines side by side: up to four listings named by their public addresses (`?m=<slug>&m=<slug>`), so
// that the comparison is a link anyone can open. Only what the public listing page shows is read; a listing
// that is not public (a draft, a withdrawn one, or none at that address) is "unavailable", the same answer
// for each so that the page tells nobody which drafts exist.
import { and, eq, inArray } from "drizzle-orm";
import { z } from "zod";
import type { Database } from "~/db/client.server";
import type { KeyFigures } from "~/geometry/types";
import { user } from "~/modules/accounts/schema";
import { fileUrl } from "~/modules/files/serve.server";
import { listingPhotos, listings, type Listing } from "~/modules/listings/schema";
import { currentReportsForListings } from "~/modules/reports/service.server";

import type { KeyFigureName } from "~/geometry/types";
import { countryName, isLathe, labelOf, machineCategories, machineConditions } from "~/modules/listings/catalogue";
import { formatDeviation } from "~/modules/search/figures";
import { formatDate } from "~/modules/units/dates";
import { formatLength, formatMoney, type DisplayUnits } from "~/modules/units/format";
import { formatFootprint, formatSpeedRange, formatSupply, formatThreadRange } from "~/modules/units/machine-specs";
import { formatPower, formatWeight } from "~/modules/units/weight-power";
import { bestDeviations, MAX_COMPARED } from "./compare";

const slugSchema = z
  .string()
  .max(120, { error: "A machine's address is at most 120 characters." })
  .regex(/^[a-z0-9]+(?:-[a-z0-9]+)*$/, { error: "A machine's address holds only lower-case letters, digits and hyphens." });

/** The machines asked for, in order, without repeats; refused with a message when malformed or more than four. */
export function parseComparedSlugs(params: URLSearchParams): { ok: true; slugs: string[] } | { ok: false; message: string } {
  const raw = params.getAll("m");
  // Bounded before any parsing: a link with hundreds of machines is refused, not read.
  if (raw.length > 20) return { ok: false, message: `Compare at most ${MAX_COMPARED} machines at once.` };
  const slugs: string[] = [];
  for (const value of raw) {
    const parsed = slugSchema.safeParse(value.trim());
    if (!parsed.success) return { ok: false, message: `“${value.slice(0, 40)}” is not a machine's address. ${parsed.error.issues[0]!.message}` };
    if (!slugs.includes(parsed.data)) slugs.push(parsed.data);
  }
  if (slugs.length > MAX_COMPARED) return { ok: false, message: `Compare at most ${MAX_COMPARED} machines at once; this link names ${slugs.length}. Leave some out and try again.` };
  return { ok: true, slugs };
}

/** What the comparison shows of one public listing: the public page's specification and its current report's figures. */
export type ComparedMachine = {
  slug: string;
  available: true;
  title: string;
  status: "published" | "sold";
  photoUrl: string | null;
  sellerName: string;
  listing: Omit<Listing, "id" | "sellerId" | "serialNumber" | "slug" | "status" | "createdAt" | "updatedAt" | "publishedAt" | "soldAt" | "withdrawnAt">;
  report: { id: string; grade: string; measuredOn: string; keyFigures: KeyFigures } | null;
};
export type ComparedSlot = ComparedMachine | { slug: string; available: false };

export async function compareMachines(db: Database, slugs: string[]): Promise<ComparedSlot[]> {
  if (!slugs.length) return [];
  const rows = await db
    .select({ listing: listings, sellerName: user.name })
    .from(listings)
    .innerJoin(user, eq(user.id, listings.sellerId))
    .where(and(inArray(listings.slug, slugs), inArray(listings.status, ["published", "sold"])));
  const ids = rows.map((row) => row.listing.id);
  const reports = await currentReportsForListings(db, ids);
  const covers = ids.length
    ? await db
        .selectDistinctOn([listingPhotos.listingId], { listingId: listingPhotos.listingId, key: listingPhotos.thumbnailKey })
        .from(listingPhotos)
        .where(inArray(listingPhotos.listingId, ids))
        .orderBy(listingPhotos.listingId, listingPhotos.position, listingPhotos.createdAt)
    : [];
  const coverOf = new Map(covers.map((cover) => [cover.listingId, fileUrl(cover.key)]));
  return slugs.map((slug): ComparedSlot => {
    const row = rows.find((candidate) => candidate.listing.slug === slug);
    if (!row) return { slug, available: false };
    const { id, sellerId: _seller, serialNumber: _serial, slug: _slug, status, createdAt: _c, updatedAt: _u, publishedAt: _p, soldAt: _s, withdrawnAt: _w, ...shown } = row.listing;
    const report = reports.get(id);
    return {
      slug,
      available: true,
      title: `${row.listing.make} ${row.listing.model}`,
      status: status as "published" | "sold",
      photoUrl: coverOf.get(id) ?? null,
      sellerName: row.sellerName,
      listing: shown,
      report: report ? { id: report.id, grade: report.grade, measuredOn: report.measuredOn, keyFigures: report.keyFigures } : null,
    };
  });
}

// The figures a buyer compares, each a deviation: the smaller the better.
const figureRows: Array<{ key: KeyFigureName; label: string }> = [
  { key: "spindleRunOut", label: "Spindle run-out" },
  { key: "axialSlip", label: "Axial slip" },
  { key: "spindleParallelismVertical", label: "Spindle-axis parallelism, vertical" },
  { key: "spindleParallelismHorizontal", label: "Spindle-axis parallelism, horizontal" },
  { key: "centreHeight", label: "Centre height difference" },
  { key: "bedStraightness", label: "Bed straightness" },
  { key: "tableFlatness", label: "Table flatness" },
  { key: "travelSquareness", label: "Squareness of travels" },
];

type Spec = (machine: ComparedMachine, units: DisplayUnits) => string | null;

const specRows: Array<{ label: string; value: Spec }> = [
  { label: "Price", value: (m) => formatMoney(m.listing.priceMinor, m.listing.currency) },
  { label: "Where it stands", value: (m) => [m.listing.city, countryName(m.listing.country)].join(", ") },
  { label: "Kind of machine", value: (m) => labelOf(machineCategories, m.listing.category) },
  { label: "Condition", value: (m) => labelOf(machineConditions, m.listing.condition) },
  { label: "Year of manufacture", value: (m) => (m.listing.year ? String(m.listing.year) : null) },
  { label: "Swing over bed", value: (m, u) => (m.listing.swingOverBedMm ? formatLength(m.listing.swingOverBedMm, u) : null) },
  { label: "Swing over the cross-slide", value: (m, u) => (isLathe(m.listing.category) && m.listing.swingOverCrossSlideMm ? formatLength(m.listing.swingOverCrossSlideMm, u) : null) },
  { label: "Distance between centres", value: (m, u) => (m.listing.distanceBetweenCentresMm ? formatLength(m.listing.distanceBetweenCentresMm, u) : null) },
  { label: "Table", value: (m, u) => (m.listing.tableLengthMm && m.listing.tableWidthMm ? `${formatLength(m.listing.tableLengthMm, u)} × ${formatLength(m.listing.tableWidthMm, u)}` : null) },
  { label: "Spindle bore", value: (m, u) => (m.listing.spindleBoreMm ? formatLength(m.listing.spindleBoreMm, u) : null) },
  { label: "Spindle nose", value: (m) => m.listing.spindleNose },
  { label: "Spindle speeds", value: (m) => formatSpeedRange(m.listing.spindleSpeedMinRpm, m.listing.spindleSpeedMaxRpm) },
  { label: "Tailstock taper", value: (m) => (isLathe(m.listing.category) ? m.listing.tailstockTaper : null) },
  { label: "Thread cutting", value: (m, u) => (isLathe(m.listing.category) ? formatThreadRange(m.listing, u) : null) },
  { label: "Main motor", value: (m, u) => (m.listing.motorPowerKw ? formatPower(m.listing.motorPowerKw, u) : null) },
  { label: "Electrical supply", value: (m) => formatSupply(m.listing) },
  { label: "Weight", value: (m, u) => (m.listing.weightKg ? formatWeight(m.listing.weightKg, u) : null) },
  { label: "Footprint (length × width)", value: (m, u) => formatFootprint(m.listing.footprintLengthMm, m.listing.footprintWidthMm, u) },
];


/** One machine's column head. */
export type ComparisonColumn =
  | { slug: string; available: true; title: string; status: "published" | "sold"; photoUrl: string | null; sellerName: string; report: { href: string; text: string } | null }
  | { slug: string; available: false };

export type ComparisonView = {
  columns: ComparisonColumn[];
  /** Specification rows some machine has; a null value is "not given" (or the column is unavailable). */
  specs: Array<{ label: string; values: Array<string | null> }>;
  /** Measured figures in the reader's units, the smallest deviation among them marked `best`. */
  figures: Array<{ label: string; cells: Array<{ text: string; best: boolean; reportDate: string } | "not measured" | null> }>;
};

/**
 * The comparison as text in the reader's units, written on the server so that the page's script carries no
 * formatting code of its own.
 */
export function comparisonView(slots: ComparedSlot[], units: DisplayUnits): ComparisonView {
  const available = slots.filter((slot): slot is ComparedMachine => slot.available);
  const columns = slots.map((slot): ComparisonColumn => {
    if (!slot.available) return { slug: slot.slug, available: false };
    const report = slot.report
      ? { href: `/reports/${slot.report.id}`, text: `${slot.report.grade === "incomplete" ? "Incomplete" : `Grade ${slot.report.grade}`}, measured ${formatDate(slot.report.measuredOn)}` }
      : null;
    return { slug: slot.slug, available: true, title: slot.title, status: slot.status, photoUrl: slot.photoUrl, sellerName: slot.sellerName, report };
  });
  // Only rows some machine has: a lathe's tailstock means nothing beside a grinder.
  const specs = specRows
    .map((row) => ({ label: row.label, values: slots.map((slot) => (slot.available ? row.value(slot, units) : null)) }))
    .filter((row) => row.values.some((value) => value !== null));
  const figures = figureRows
    .filter((row) => available.some((machine) => machine.report?.keyFigures[row.key] != null))
    .map((row) => {
      const values = slots.map((slot) => (slot.available ? (slot.report?.keyFigures[row.key] ?? null) : null));
      const best = bestDeviations(values);
      return {
        label: row.label,
        cells: slots.map((slot, index) => {
          if (!slot.available || !slot.report) return null;
          const value = values[index];
          if (value === null || value === undefined) return "not measured" as const;
          return { text: formatDeviation(Math.abs(value), units), best: best.has(index), reportDate: formatDate(slot.report.measuredOn) };
        }),
      };
    });
  return { columns, specs, figures };
}
