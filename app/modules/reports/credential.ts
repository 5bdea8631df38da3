// A signed report as a W3C Verifiable Credential (Data Model 2.0) secured with a Data Integrity proof of the
// `eddsa-jcs-2022` cryptosuite (W3C "Data Integrity EdDSA Cryptosuites v1.0", §3.3): RFC 8785 canonical JSON,
// SHA-256 and Ed25519. Shared by the server, the browser's verify page and the offline script, so it uses
// WebCrypto only (Ed25519 verification is in Node 20 and in current browsers), never node:crypto.
import { base58 } from "@scure/base";
import canonicalize from "canonicalize";
import type { ReportContent } from "./content";

export const VC_CONTEXT_V2 = "https://www.w3.org/ns/credentials/v2";
export const CRYPTOSUITE = "eddsa-jcs-2022";
export const REPORT_CREDENTIAL_TYPE = "MachineAccuracyReportCredential";
/** Credentials larger than this are refused before parsing (a real one is a few kilobytes). */
export const MAX_CREDENTIAL_BYTES = 1_000_000;

/** Multicodec prefixes (varint) of an Ed25519 public key (0xed) and private key (0x1300), as Multikey uses them. */
const ED25519_PUBLIC_PREFIX = [0xed, 0x01];
const ED25519_PRIVATE_PREFIX = [0x80, 0x26];

export interface DataIntegrityProof {
  type: "DataIntegrityProof";
  cryptosuite: typeof CRYPTOSUITE;
  created: string;
  verificationMethod: string;
  proofPurpose: "assertionMethod";
  "@context"?: string[];
  proofValue?: string;
}

export interface ReportCredentialSubject {
  id: string;
  type: "MachineAccuracyReport";
  reportId: string;
  revision: number;
  /** The revision this one corrects: its credential, report and content hash. */
  supersedes: { id: string; reportId: string; contentHash: string } | null;
  /** `listingId`: the listing the report was filed for (the same id as in the report's public JSON). */
  machine: { title: string; make: string; model: string; serialNumber: string | null; year: number | null; category: string; listingId: string };
  inspector: { name: string };
  measuredOn: string;
  signedAt: string;
  profile: { key: string; version: number; title: string };
  grade: string;
  /** Micrometres; null where the test was not measured. */
  keyFigures: Record<string, number | null>;
  results: Array<{
    code: string;
    title: string;
    value: number;
    unit: string;
    tolerance: number;
    measuringLength: number | null;
    ratio: number;
    pass: boolean;
    source: string;
  }>;
  setupPhotos: Array<{ test: string; sha256: string }>;
  /** The whole report (readings, conditions, instruments, notes) by the SHA-256 of its RFC 8785 canonical JSON. */
  content: { sha256: string; canonicalization: "RFC 8785"; url: string };
  /**
   * Set on a credential issued later for a report signed before credentials existed: when, and what the
   * re-issue vouches for. Its proof is made at `on`, not at `signedAt`.
   */
  reissued?: { on: string; note: string };
}

export interface ReportCredential {
  "@context": string[];
  id: string;
  type: string[];
  name: string;
  issuer: { id: string; name: string };
  validFrom: string;
  credentialSubject: ReportCredentialSubject;
  proof?: DataIntegrityProof;
}

// ————— did:web —————

/** did:web of an origin: `https://example.com` → `did:web:example.com`; a port is percent-encoded. */
export function didWebOf(origin: string): string {
  const url = new URL(origin);
  return `did:web:${url.host.replace(":", "%3A")}`;
}

/** Where a did:web's document lives (https, as did:web requires; http for a local origin). */
export function didDocumentUrl(did: string): string {
  const host = decodeURIComponent(did.replace(/^did:web:/, "").split(":")[0]!);
  const local = /^(localhost|127\.0\.0\.1)(:\d+)?$/.test(host);
  return `${local ? "http" : "https"}://${host}/.well-known/did.json`;
}

export interface DidVerificationMethod {
  id: string;
  type: "Multikey";
  controller: string;
  publicKeyMultibase: string;
  /** When the key began and (for an earlier key) stopped signing reports. */
  validFrom: string;
  validUntil?: string;
}

export interface DidDocument {
  "@context": string[];
  id: string;
  verificationMethod: DidVerificationMethod[];
  assertionMethod: string[];
}

// ————— Multibase / Multikey —————

export function publicKeyToMultibase(raw: Uint8Array): string {
  if (raw.length !== 32) throw new Error("An Ed25519 public key has 32 bytes.");
  return `z${base58.encode(Uint8Array.from([...ED25519_PUBLIC_PREFIX, ...raw]))}`;
}

function decodeMultikey(multibase: string, prefix: number[]): Uint8Array | null {
  if (typeof multibase !== "string" || !multibase.startsWith("z") || multibase.length > 100) return null;
  let bytes: Uint8Array;
  try {
    bytes = base58.decode(multibase.slice(1));
  } catch {
    return null;
  }
  if (bytes.length !== 34 || bytes[0] !== prefix[0] || bytes[1] !== prefix[1]) return null;
  return bytes.slice(2);
}

export function publicKeyFromMultibase(multibase: string): Uint8Array | null {
  return decodeMultikey(multibase, ED25519_PUBLIC_PREFIX);
}

/** The 32-byte seed of a Multikey-encoded Ed25519 private key (`z3u2…`). */
export function privateKeyFromMultibase(multibase: string): Uint8Array | null {
  return decodeMultikey(multibase, ED25519_PRIVATE_PREFIX);
}

export function privateKeyToMultibase(seed: Uint8Array): string {
  if (seed.length !== 32) throw new Error("An Ed25519 private key has 32 bytes.");
  return `z${base58.encode(Uint8Array.from([...ED25519_PRIVATE_PREFIX, ...seed]))}`;
}

export function signatureToMultibase(signature: Uint8Array): string {
  return `z${base58.encode(signature)}`;
}

function signatureFromMultibase(proofValue: unknown): Uint8Array | null {
  if (typeof proofValue !== "string" || !proofValue.startsWith("z") || proofValue.length > 120) return null;
  try {
    const bytes = base58.decode(proofValue.slice(1));
    return bytes.length === 64 ? bytes : null;
  } catch {
    return null;
  }
}

// ————— eddsa-jcs-2022 —————

function jcs(value: unknown): string {
  const canonical = canonicalize(value);
  if (canonical === undefined) throw new Error("The document cannot be written as JSON.");
  return canonical;
}

async function sha256(text: string): Promise<Uint8Array> {
  return new Uint8Array(await globalThis.crypto.subtle.digest("SHA-256", new TextEncoder().encode(text)));
}

export function toHex(bytes: Uint8Array): string {
  return Array.from(bytes, (byte) => byte.toString(16).padStart(2, "0")).join("");
}

/**
 * The bytes an eddsa-jcs-2022 proof signs (§3.3.4 hashing): SHA-256 of the canonical proof configuration,
 * then SHA-256 of the canonical document without its proof. `proofOptions` must not hold `proofValue`.
 */
export async function proofHashData(unsecuredDocument: object, proofOptions: object): Promise<Uint8Array> {
  const options = proofOptions as Partial<DataIntegrityProof>;
  if (options.type !== "DataIntegrityProof" || options.cryptosuite !== CRYPTOSUITE) throw new Error(`The proof is not a DataIntegrityProof of ${CRYPTOSUITE}.`);
  if (typeof options.created === "string" && Number.isNaN(Date.parse(options.created))) throw new Error("The proof's creation time is not a date-time.");
  const [proofConfigHash, documentHash] = await Promise.all([sha256(jcs(proofOptions)), sha256(jcs(unsecuredDocument))]);
  const joined = new Uint8Array(64);
  joined.set(proofConfigHash, 0);
  joined.set(documentHash, 32);
  return joined;
}

/** The proof options (without proofValue) for a document: the document's @context is copied in (§3.3.5). */
export function proofOptionsFor(document: { "@context"?: string[] }, verificationMethod: string, created: string): DataIntegrityProof {
  return {
    type: "DataIntegrityProof",
    cryptosuite: CRYPTOSUITE,
    created,
    verificationMethod,
    proofPurpose: "assertionMethod",
    ...(document["@context"] ? { "@context": [...document["@context"]] } : {}),
  };
}

export type ProofCheck = { verified: true } | { verified: false; reason: string };

/** Verify Proof (eddsa-jcs-2022, §3.3.2) with a raw 32-byte Ed25519 public key. */
export async function verifyDataIntegrityProof(securedDocument: Record<string, unknown>, publicKey: Uint8Array): Promise<ProofCheck> {
  const proof = securedDocument.proof as Record<string, unknown> | undefined;
  if (!proof || typeof proof !== "object" || Array.isArray(proof)) return { verified: false, reason: "It carries no proof." };
  const { proof: _proof, ...unsecured } = securedDocument;
  const { proofValue, ...proofOptions } = proof;
  const signature = signatureFromMultibase(proofValue);
  if (!signature) return { verified: false, reason: "The proof value is not a base58-btc Ed25519 signature." };
  if (proofOptions["@context"] !== undefined) {
    const proofContext = proofOptions["@context"];
    const documentContext = securedDocument["@context"];
    if (!Array.isArray(proofContext) || !Array.isArray(documentContext) || proofContext.some((entry, index) => documentContext[index] !== entry)) {
      return { verified: false, reason: "The proof's @context does not match the credential's." };
    }
    unsecured["@context"] = proofContext;
  }
  let hashData: Uint8Array;
  try {
    hashData = await proofHashData(unsecured, proofOptions);
  } catch (error) {
    return { verified: false, reason: error instanceof Error ? error.message : String(error) };
  }
  try {
    const key = await globalThis.crypto.subtle.importKey("raw", publicKey as BufferSource, { name: "Ed25519" }, false, ["verify"]);
    const ok = await globalThis.crypto.subtle.verify({ name: "Ed25519" }, key, signature as BufferSource, hashData as BufferSource);
    return ok ? { verified: true } : { verified: false, reason: "The signature does not match the content: something in the credential changed after it was signed." };
  } catch {
    return { verified: false, reason: "The public key could not be read as an Ed25519 key." };
  }
}

// ————— The report credential —————

export function credentialUrl(origin: string, reportId: string) {
  return `${origin}/api/v1/reports/${reportId}/credential`;
}

/** What a re-issued credential says of itself (see reissue.server.ts). */
export const REISSUE_NOTE =
  "Re-issued by Tenthmark for a report signed before signed credentials existed: the content is the one whose SHA-256 was recorded when the inspector signed; this signature is Tenthmark's, made on the re-issue date, not the original one.";

/**
 * The unsigned credential of a signed report's content (`content.signedAt` set) and its content hash;
 * `reissuedAt` for a report signed before credentials existed, whose proof is made now.
 */
export function buildReportCredential(content: ReportContent, contentHash: string, origin: string, options: { reissuedAt?: string } = {}): ReportCredential {
  if (!content.signedAt) throw new Error("Only a signed report becomes a credential.");
  const photos = Object.entries(content.tests)
    .filter(([, test]) => test.photo?.sha256)
    .map(([code, test]) => ({ test: code, sha256: test.photo!.sha256! }));
  return {
    "@context": [VC_CONTEXT_V2],
    id: credentialUrl(origin, content.reportId),
    type: ["VerifiableCredential", REPORT_CREDENTIAL_TYPE],
    name: `Machine accuracy report: ${content.machine.title}`,
    issuer: { id: didWebOf(origin), name: "Tenthmark" },
    validFrom: options.reissuedAt ?? content.signedAt,
    credentialSubject: {
      id: `${origin}/reports/${content.reportId}`,
      type: "MachineAccuracyReport",
      reportId: content.reportId,
      revision: content.revision,
      supersedes: content.supersedes
        ? { id: credentialUrl(origin, content.supersedes.reportId), reportId: content.supersedes.reportId, contentHash: content.supersedes.contentHash }
        : null,
      machine: {
        title: content.machine.title,
        make: content.machine.make,
        model: content.machine.model,
        serialNumber: content.machine.serialNumber,
        year: content.machine.year,
        category: content.machine.category,
        listingId: content.machine.listingId,
      },
      inspector: { name: content.inspector.name },
      measuredOn: content.measuredOn,
      signedAt: content.signedAt,
      profile: { key: content.profile.key, version: content.profile.version, title: content.profile.title },
      grade: content.score.grade,
      keyFigures: { ...content.score.keyFigures },
      results: content.score.results.map((result) => ({
        code: result.code,
        title: result.title,
        value: result.value,
        unit: result.unit,
        tolerance: result.tolerance,
        measuringLength: result.measuringLength,
        ratio: result.ratio,
        pass: result.pass,
        source: result.sources.tolerance,
      })),
      setupPhotos: photos,
      content: { sha256: contentHash, canonicalization: "RFC 8785", url: `${origin}/api/v1/reports/${content.reportId}` },
      ...(options.reissuedAt ? { reissued: { on: options.reissuedAt, note: REISSUE_NOTE } } : {}),
    },
  };
}

/** The figures pages show of a report, as the credential seals them. */
export function sealedFigures(subject: Pick<ReportCredentialSubject, "grade" | "keyFigures" | "measuredOn" | "signedAt">) {
  return { grade: subject.grade, keyFigures: subject.keyFigures, measuredOn: subject.measuredOn, signedAt: subject.signedAt };
}

// ————— Checking a credential against the issuer's DID document —————

export type CheckState = "passed" | "failed" | "not-checked";
export interface CredentialCheck {
  name: "format" | "issuer" | "signature" | "key-validity" | "content" | "current";
  state: CheckState;
  /** In plain words: what was checked and what was found. */
  detail: string;
}
export interface CredentialVerification {
  valid: boolean;
  checks: CredentialCheck[];
  subject: ReportCredentialSubject | null;
  keyId: string | null;
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

function looksLikeReportCredential(value: unknown): value is ReportCredential & { proof: DataIntegrityProof } {
  if (!isRecord(value) || !isRecord(value.proof) || !isRecord(value.credentialSubject) || !isRecord(value.issuer)) return false;
  const subject = value.credentialSubject;
  return (
    Array.isArray(value["@context"]) &&
    value["@context"][0] === VC_CONTEXT_V2 &&
    Array.isArray(value.type) &&
    value.type.includes("VerifiableCredential") &&
    value.type.includes(REPORT_CREDENTIAL_TYPE) &&
    typeof value.issuer.id === "string" &&
    typeof value.validFrom === "string" &&
    typeof subject.reportId === "string" &&
    typeof subject.grade === "string" &&
    isRecord(subject.keyFigures) &&
    typeof subject.measuredOn === "string" &&
    typeof subject.signedAt === "string" &&
    isRecord(subject.machine) &&
    Array.isArray(subject.results) &&
    typeof value.proof.verificationMethod === "string" &&
    typeof value.proof.created === "string"
  );
}

/**
 * Checks a credential with nothing but the issuer's DID document: its shape, that the issuer is the
 * document's DID, the Ed25519 signature with the key the proof names, and that the key was in use when the
 * proof was made. Whether a later revision supersedes it cannot be known offline; that check is left
 * `not-checked` for the caller that can ask the server.
 */
export async function verifyReportCredential(input: unknown, didDocument: unknown): Promise<CredentialVerification> {
  const checks: CredentialCheck[] = [];
  const fail = (name: CredentialCheck["name"], detail: string): CredentialVerification => {
    checks.push({ name, state: "failed", detail });
    return { valid: false, checks, subject: isRecord(input) && isRecord(input.credentialSubject) ? (input.credentialSubject as unknown as ReportCredentialSubject) : null, keyId: null };
  };
  if (!looksLikeReportCredential(input)) return fail("format", "This is not a Tenthmark report credential (a W3C Verifiable Credential with a Data Integrity proof).");
  if (input.proof.type !== "DataIntegrityProof" || input.proof.cryptosuite !== CRYPTOSUITE || input.proof.proofPurpose !== "assertionMethod") {
    return fail("format", `The proof is not a ${CRYPTOSUITE} assertion proof.`);
  }
  checks.push({ name: "format", state: "passed", detail: "It is a W3C Verifiable Credential (Data Model 2.0) with an eddsa-jcs-2022 Data Integrity proof." });

  if (!isRecord(didDocument) || typeof didDocument.id !== "string" || !Array.isArray(didDocument.verificationMethod)) {
    return fail("issuer", "The issuer's DID document could not be read.");
  }
  if (input.issuer.id !== didDocument.id) return fail("issuer", `The credential names ${input.issuer.id} as issuer, but the keys given are those of ${didDocument.id}.`);
  const keyId = input.proof.verificationMethod;
  const method = (didDocument.verificationMethod as unknown[]).find((candidate): candidate is DidVerificationMethod => isRecord(candidate) && candidate.id === keyId);
  const assertion = Array.isArray(didDocument.assertionMethod) && didDocument.assertionMethod.includes(keyId);
  if (!method || !assertion || !keyId.startsWith(`${didDocument.id}#`)) return fail("issuer", `The key ${keyId} is not one of the issuer's signing keys.`);
  checks.push({ name: "issuer", state: "passed", detail: `Issued by ${didDocument.id}, with its key ${keyId.split("#")[1]}.` });

  const publicKey = publicKeyFromMultibase(method.publicKeyMultibase);
  if (!publicKey) return fail("signature", "The issuer's key is not an Ed25519 Multikey.");
  const proofCheck = await verifyDataIntegrityProof(input as unknown as Record<string, unknown>, publicKey);
  if (!proofCheck.verified) return { ...fail("signature", proofCheck.reason), keyId };
  checks.push({ name: "signature", state: "passed", detail: "The Ed25519 signature matches every byte of the credential (RFC 8785 canonical JSON, SHA-256)." });

  const created = Date.parse(input.proof.created);
  const from = Date.parse(method.validFrom);
  const until = method.validUntil ? Date.parse(method.validUntil) : Number.POSITIVE_INFINITY;
  if (Number.isNaN(created) || Number.isNaN(from) || created < from || created >= until) {
    return { ...fail("key-validity", `The key was in use from ${method.validFrom}${method.validUntil ? ` until ${method.validUntil}` : ""}, but the proof says it was made at ${input.proof.created}.`), keyId };
  }
  checks.push({
    name: "key-validity",
    state: "passed",
    detail: `The key was in use when the proof was made (${input.proof.created}; key used from ${method.validFrom}${method.validUntil ? ` until ${method.validUntil}` : " to now"}).`,
  });

  const subject = input.credentialSubject;
  const reissued = isRecord(subject.reissued) ? subject.reissued : null;
  if (reissued) {
    // A re-issue is signed at its own date, after the inspector's signing, and says so.
    if (reissued.on !== input.proof.created || input.validFrom !== input.proof.created || !(Date.parse(subject.signedAt) < created)) {
      return { ...fail("content", "The re-issue date inside the report differs from the proof's, or comes before the original signing."), keyId };
    }
  } else if (subject.signedAt !== input.proof.created || input.validFrom !== input.proof.created) {
    return { ...fail("content", "The signing time inside the report differs from the proof's."), keyId };
  }
  checks.push({
    name: "content",
    state: "passed",
    detail: reissued
      ? `Grade ${subject.grade}, measured ${subject.measuredOn}, key figures and ${subject.results.length} results, as signed by the inspector on ${subject.signedAt.slice(0, 10)}; this credential was re-issued by Tenthmark on ${reissued.on.slice(0, 10)} because the report predates signed credentials.`
      : `Grade ${subject.grade}, measured ${subject.measuredOn}, key figures and ${subject.results.length} results are those signed.`,
  });
  checks.push({ name: "current", state: "not-checked", detail: "Whether a later correction supersedes this revision is known only to Tenthmark's server." });
  return { valid: true, checks, subject, keyId };
}
