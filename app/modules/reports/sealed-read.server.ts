// Reading a signed report's figures from its seal, not from the row's copies. Every read that shows a grade,
// key figure or date (listings, search, the API, the report page) checks the stored credential's Ed25519
// proof against the issuer's registered keys, that it seals this row's content hash, and that the row's
// columns still say what the credential says; a report that fails is not shown as verified.
import { asc, sql, type SQL } from "drizzle-orm";
import type { AnyPgColumn } from "drizzle-orm/pg-core";
import type { Executor } from "~/modules/inspections/profiles.server";
import { publicKeyFromMultibase, verifyDataIntegrityProof, type ReportCredential, type ReportCredentialSubject } from "./credential";
import type { ReportContent } from "./content";
import { reportSigningKeys } from "./schema";
import { canonicalJson, sha256Hex } from "./seal.server";

/** The stored columns of a signed report that pages read or that the seal covers. */
export interface StoredSealedReport {
  id: string;
  bookingId?: string;
  listingId?: string;
  inspectorId?: string;
  supersedesId?: string | null;
  revision?: number;
  profileKey?: string;
  profileVersion?: number;
  grade: string;
  keyFigures: unknown;
  measuredOn: string;
  signedAt: Date | null;
  content?: unknown;
  canonicalJson: string | null;
  contentHash: string | null;
  credential: string | null;
  /**
   * Instead of the credential's text, lists may read its SHA-256 (lower-case hex of the UTF-8 text, computed
   * by the database: `credentialSha256Sql`). A credential verified earlier with that digest is used as it
   * was; otherwise `loadCredential` reads the text and it is verified.
   */
  credentialSha256?: string | null;
  /**
   * The key figures as the database's JSON text (`key_figures::text`), instead of parsed: a text already
   * found equal to the signed figures is not compared again.
   */
  keyFiguresText?: string | null;
}

export type SealedReading =
  | { ok: true; subject: ReportCredentialSubject; keyId: string }
  | { ok: false; reason: string; mismatched: string[] };

type KnownKey = { publicKey: Uint8Array; validFrom: number; validUntil: number };
let keyCache: { at: number; keys: Promise<Map<string, KnownKey>> } | undefined;
const KEY_CACHE_MS = 60_000;

// One read for every report of a page: the reads that start while the keys are being loaded share it.
async function registeredKeys(db: Executor): Promise<Map<string, KnownKey>> {
  if (keyCache && Date.now() - keyCache.at < KEY_CACHE_MS) return keyCache.keys;
  const entry = { at: Date.now(), keys: loadKeys(db) };
  keyCache = entry;
  // A failed read is not kept: the next report tries again.
  entry.keys.catch(() => {
    if (keyCache === entry) keyCache = undefined;
  });
  return entry.keys;
}

async function loadKeys(db: Executor): Promise<Map<string, KnownKey>> {
  const rows = await db.select().from(reportSigningKeys).orderBy(asc(reportSigningKeys.validFrom));
  const keys = new Map<string, KnownKey>();
  for (const row of rows) {
    const publicKey = publicKeyFromMultibase(row.publicKeyMultibase);
    if (publicKey) keys.set(row.id, { publicKey, validFrom: row.validFrom.getTime(), validUntil: row.validUntil?.getTime() ?? Number.POSITIVE_INFINITY });
  }
  return keys;
}

/** Forgets the cached keys (after a registration in this process, and in tests). */
export function forgetSigningKeys() {
  keyCache = undefined;
}

let keysSeen: string | undefined;
/**
 * Told the digest of the signing keys' rows as a request read them: when it differs from the last one seen,
 * the cached keys and every proof checked with them are forgotten, so that a withdrawn key or changed dates
 * decide the next check at once, not a minute later.
 */
export function signingKeysAre(digest: string) {
  if (keysSeen === digest) return;
  if (keysSeen !== undefined) {
    keyCache = undefined;
    verified.clear();
  }
  keysSeen = digest;
}

/**
 * The SHA-256 of a report's stored credential as lower-case hex of its UTF-8 text, computed by the database
 * (named in pg_catalog, so that no function of the same name in another schema stands in for it).
 */
export const credentialSha256Sql = (credential: SQL | AnyPgColumn) => sql<string | null>`encode(pg_catalog.sha256(convert_to(${credential}, 'UTF8')), 'hex')`;

// A proof already checked, by report id, with the exact credential text it was checked on and that text's
// SHA-256 (computed here, from the text verified): a row read again unchanged is not verified again, and any
// changed byte misses the cache. A list that reads the database's digest of the stored text instead of the
// text stays as safe against a hostile database: what it shows is always a credential verified here for this
// report id (the subject's report id, hash and figures are still compared with the row); a changed credential
// has another digest and is read whole and verified; and a database that lied about the digest could at most
// have a credential shown that was verified for this very report — as it could by storing that text again.
type VerifiedEntry = { credential: string; sha256: string; subject: ReportCredentialSubject; keyId: string; subjectFigures: string; figuresTextsMatched: Set<string> };
const verified = new Map<string, VerifiedEntry>();
const VERIFIED_CACHE_SIZE = 50_000;

function sameFigures(a: unknown, b: unknown) {
  return canonicalJson(a ?? null) === canonicalJson(b ?? null);
}

/** Whether the stored figures (as given, or as the database's JSON text) are the signed ones. */
function figuresMatch(entry: VerifiedEntry | undefined, subject: ReportCredentialSubject, row: StoredSealedReport): boolean {
  if (row.keyFiguresText === undefined || row.keyFiguresText === null) return sameFigures(subject.keyFigures, row.keyFigures);
  if (entry?.subject === subject && entry.figuresTextsMatched.has(row.keyFiguresText)) return true;
  const same = (entry?.subject === subject ? entry.subjectFigures : canonicalJson(subject.keyFigures ?? null)) === canonicalJson(JSON.parse(row.keyFiguresText) ?? null);
  // Only texts found equal are remembered (a few per report at most: JSONB prints one value one way).
  if (same && entry?.subject === subject && entry.figuresTextsMatched.size < 4) entry.figuresTextsMatched.add(row.keyFiguresText);
  return same;
}

type CredentialCheck = { ok: true; subject: ReportCredentialSubject; keyId: string; entry?: VerifiedEntry } | { ok: false; reason: string };

async function verifiedCredential(db: Executor, id: string, text: string): Promise<CredentialCheck> {
  const cached = verified.get(id);
  if (cached && cached.credential === text) return { ok: true, subject: cached.subject, keyId: cached.keyId, entry: cached };
  let credential: ReportCredential;
  try {
    credential = JSON.parse(text) as ReportCredential;
  } catch {
    return { ok: false, reason: "The stored credential is not JSON." };
  }
  const proofOf = credential.proof;
  const keyId = typeof proofOf?.verificationMethod === "string" ? proofOf.verificationMethod.split("#")[1] : undefined;
  const key = keyId ? (await registeredKeys(db)).get(keyId) : undefined;
  if (!key || !keyId) return { ok: false, reason: "The credential names no registered signing key." };
  const created = Date.parse(proofOf!.created);
  if (!(created >= key.validFrom && created < key.validUntil)) return { ok: false, reason: "The signing key was not in use at the signing time." };
  const proof = await verifyDataIntegrityProof(credential as unknown as Record<string, unknown>, key.publicKey);
  if (!proof.verified) return { ok: false, reason: proof.reason };
  if (verified.size >= VERIFIED_CACHE_SIZE) verified.clear();
  const subject = credential.credentialSubject;
  const entry: VerifiedEntry = { credential: text, sha256: sha256Hex(text), subject, keyId, subjectFigures: canonicalJson(subject?.keyFigures ?? null), figuresTextsMatched: new Set() };
  verified.set(id, entry);
  return { ok: true, subject, keyId, entry };
}

/** Whether this report's credential with this digest was verified in this process (and is still remembered). */
export function credentialKnown(id: string, sha256: string | null | undefined): boolean {
  return !!sha256 && verified.get(id)?.sha256 === sha256;
}

async function storedCredential(db: Executor, row: StoredSealedReport, loadCredential: ((id: string) => Promise<string | null>) | undefined): Promise<CredentialCheck | null> {
  if (row.credential !== null) return verifiedCredential(db, row.id, row.credential);
  if (!row.credentialSha256) return null;
  const cached = verified.get(row.id);
  if (cached && cached.sha256 === row.credentialSha256) return { ok: true, subject: cached.subject, keyId: cached.keyId, entry: cached };
  const text = loadCredential ? await loadCredential(row.id) : null;
  return text === null ? null : verifiedCredential(db, row.id, text);
}

/**
 * Checks one stored signed report against its credential. `checkContent` also re-hashes the stored canonical
 * JSON and compares the JSONB copy and the identity columns (the report page and the API); lists check the
 * proof and the figures they show.
 */
export async function readSealedReport(
  db: Executor,
  row: StoredSealedReport,
  options: { checkContent?: boolean; loadCredential?: (id: string) => Promise<string | null> } = {},
): Promise<SealedReading> {
  const credential = row.credential === "" ? null : await storedCredential(db, row, options.loadCredential);
  if (!credential) return refuse(row.id, "The report has no signed credential.", ["credential"]);
  if (!credential.ok) return refuse(row.id, credential.reason, ["credential"]);
  const { subject, keyId, entry } = credential;

  const mismatched: string[] = [];
  if (subject.reportId !== row.id) mismatched.push("id");
  if (subject.content.sha256 !== row.contentHash) mismatched.push("content_hash");
  if (subject.grade !== row.grade) mismatched.push("grade");
  if (!figuresMatch(entry, subject, row)) mismatched.push("key_figures");
  if (subject.measuredOn !== row.measuredOn) mismatched.push("measured_on");
  if (subject.signedAt !== row.signedAt?.toISOString()) mismatched.push("signed_at");
  if (row.listingId !== undefined && subject.machine.listingId !== row.listingId) mismatched.push("listing_id");
  if (row.revision !== undefined && subject.revision !== row.revision) mismatched.push("revision");
  if (row.profileKey !== undefined && subject.profile.key !== row.profileKey) mismatched.push("profile_key");
  if (row.profileVersion !== undefined && subject.profile.version !== row.profileVersion) mismatched.push("profile_version");
  if (row.supersedesId !== undefined && (subject.supersedes?.reportId ?? null) !== row.supersedesId) mismatched.push("supersedes_id");
  if (options.checkContent) {
    const canonical = row.canonicalJson;
    if (!canonical || sha256Hex(canonical) !== subject.content.sha256) mismatched.push("canonical_json");
    else {
      const content = JSON.parse(canonical) as ReportContent;
      if (row.content !== undefined && canonicalJson(row.content) !== canonical) mismatched.push("content");
      if (row.bookingId !== undefined && content.booking.id !== row.bookingId) mismatched.push("booking_id");
    }
  }
  if (mismatched.length) return refuse(row.id, `What is stored (${mismatched.join(", ").replaceAll("_", " ")}) no longer matches what was signed.`, mismatched);
  return { ok: true, subject, keyId };
}

function refuse(id: string, reason: string, mismatched: string[]): SealedReading {
  console.warn(`[reports] report ${id} is not shown as verified: ${reason}`);
  return { ok: false, reason, mismatched };
}
