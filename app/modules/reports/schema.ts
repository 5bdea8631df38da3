import { sql } from "drizzle-orm";
import { date, index, integer, jsonb, pgEnum, pgTable, text, timestamp, uniqueIndex, uuid, type AnyPgColumn } from "drizzle-orm/pg-core";
import { user } from "../accounts/schema";
import { bookings } from "../inspections/schema";
import { listings } from "../listings/schema";

/**
 * draft: submitted and scored by the server, waiting for the inspector's signature;
 * signed: immutable, the listing's current report while nothing supersedes it;
 * superseded: a later signed revision corrects it; still readable.
 */
export const reportStatus = pgEnum("report_status", ["draft", "signed", "superseded"]);

// One accuracy report revision. Once signed, the trigger in the custom migration refuses any change to
// its content columns and any delete; only signed → superseded may happen, when a correction is signed.
export const reports = pgTable(
  "reports",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    bookingId: text("booking_id")
      .notNull()
      .references(() => bookings.id, { onDelete: "restrict" }),
    listingId: uuid("listing_id")
      .notNull()
      .references(() => listings.id, { onDelete: "restrict" }),
    inspectorId: text("inspector_id")
      .notNull()
      .references(() => user.id, { onDelete: "restrict" }),
    /** The signed revision this one corrects; each revision is corrected at most once. */
    supersedesId: uuid("supersedes_id").references((): AnyPgColumn => reports.id, { onDelete: "restrict" }),
    revision: integer("revision").notNull().default(1),
    status: reportStatus("status").notNull().default("draft"),
    profileKey: text("profile_key").notNull(),
    profileVersion: integer("profile_version").notNull(),
    /** Copied from the server's score so listings and search can read them without parsing the content. */
    grade: text("grade").notNull(),
    keyFigures: jsonb("key_figures").notNull(),
    measuredOn: date("measured_on").notNull(),
    /** The draft version the server scored; signing needs the draft unchanged since. */
    draftVersion: integer("draft_version").notNull(),
    /** The report as scored by the server (ReportContent); once signed, the parsed canonical JSON. */
    content: jsonb("content").notNull(),
    /** RFC 8785 canonical JSON of the signed content: the bytes the hash covers. */
    canonicalJson: text("canonical_json"),
    /** SHA-256 of canonicalJson (UTF-8), lower-case hex. */
    contentHash: text("content_hash"),
    signedAt: timestamp("signed_at", { withTimezone: true }),
    /** The W3C Verifiable Credential of the signed content with its eddsa-jcs-2022 proof, as JSON text. */
    credential: text("credential"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    uniqueIndex("reports_content_hash_idx").on(table.contentHash),
    uniqueIndex("reports_supersedes_idx").on(table.supersedesId),
    uniqueIndex("reports_one_draft_per_booking_idx").on(table.bookingId).where(sql`${table.status} = 'draft'`),
    index("reports_listing_idx").on(table.listingId, table.status, table.signedAt),
    index("reports_booking_idx").on(table.bookingId),
  ],
);

// The inspector's entry form for one booking, as typed (strings, partial), saved as they go.
export const reportDrafts = pgTable("report_drafts", {
  bookingId: text("booking_id")
    .primaryKey()
    .references(() => bookings.id, { onDelete: "cascade" }),
  inspectorId: text("inspector_id")
    .notNull()
    .references(() => user.id, { onDelete: "cascade" }),
  /** Set when this draft corrects a signed report. */
  correctsReportId: uuid("corrects_report_id").references(() => reports.id, { onDelete: "cascade" }),
  form: jsonb("form").notNull(),
  version: integer("version").notNull().default(1),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});

// A set-up photo of one test, processed by the files pipeline (WebP variants, metadata stripped).
export const reportPhotos = pgTable(
  "report_photos",
  {
    id: uuid("id").primaryKey(),
    bookingId: text("booking_id")
      .notNull()
      .references(() => bookings.id, { onDelete: "cascade" }),
    testCode: text("test_code").notNull(),
    thumbnailKey: text("thumbnail_key").notNull(),
    largeKey: text("large_key").notNull(),
    width: integer("width").notNull(),
    height: integer("height").notNull(),
    // SHA-256 (hex) of the large variant as written: sealed into the report, so a swapped photo shows.
    largeSha256: text("large_sha256"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index("report_photos_booking_idx").on(table.bookingId, table.testCode)],
);

// Every public key that has signed reports, with the period it signed in; `/.well-known/did.json` lists them
// all, so a report signed before a key rotation still verifies. Written by the owner role only.
export const reportSigningKeys = pgTable(
  "report_signing_keys",
  {
    /** The DID URL fragment, e.g. key-2026-12-04-1a2b3c4d. */
    id: text("id").primaryKey(),
    publicKeyMultibase: text("public_key_multibase").notNull().unique(),
    validFrom: timestamp("valid_from", { withTimezone: true }).notNull(),
    validUntil: timestamp("valid_until", { withTimezone: true }),
  },
  (table) => [uniqueIndex("report_signing_keys_one_current_idx").on(sql`(true)`).where(sql`${table.validUntil} is null`)],
);

export type ReportRow = typeof reports.$inferSelect;
export type ReportDraftRow = typeof reportDrafts.$inferSelect;
export type ReportPhotoRow = typeof reportPhotos.$inferSelect;

// How one inspector's instrument exports its table of positioning deviations (which column is run, direction,
// target, deviation; units; decimal comma; header): offered again on the next report's import.
export const deviationColumnMappings = pgTable("deviation_column_mappings", {
  inspectorId: text("inspector_id")
    .primaryKey()
    .references(() => user.id, { onDelete: "cascade" }),
  mapping: jsonb("mapping").notNull(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});
