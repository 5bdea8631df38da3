// The issuer's Ed25519 key: the private key from REPORT_SIGNING_KEY (a Multikey `z3u2…`), every public key
// ever used in `report_signing_keys` with the period it signed in, and signing with node:crypto.
import { createHash, createPrivateKey, createPublicKey, randomBytes, sign, type KeyObject } from "node:crypto";
import { and, asc, eq, isNull } from "drizzle-orm";
import { env } from "~/env.server";
import type { Executor } from "~/modules/inspections/profiles.server";
import {
  didWebOf,
  privateKeyFromMultibase,
  privateKeyToMultibase,
  proofHashData,
  proofOptionsFor,
  publicKeyToMultibase,
  signatureToMultibase,
  type DidDocument,
  type ReportCredential,
} from "./credential";
import { reportSigningKeys } from "./schema";

// PKCS #8 wrapping of a 32-byte Ed25519 seed (RFC 8410), so node:crypto can load the raw key.
const PKCS8_ED25519_PREFIX = Buffer.from("302e020100300506032b657004220420", "hex");

export interface SigningKey {
  privateKey: KeyObject;
  publicKeyMultibase: string;
}

export class SigningKeyError extends Error {
  override name = "SigningKeyError";
}

export function signingKeyFromMultibase(multibase: string): SigningKey {
  const seed = privateKeyFromMultibase(multibase.trim());
  if (!seed) throw new SigningKeyError("REPORT_SIGNING_KEY must be an Ed25519 private key as a Multikey (z3u2…); make one with `npm run signing-key -- new`.");
  const privateKey = createPrivateKey({ key: Buffer.concat([PKCS8_ED25519_PREFIX, seed]), format: "der", type: "pkcs8" });
  const jwk = createPublicKey(privateKey).export({ format: "jwk" });
  return { privateKey, publicKeyMultibase: publicKeyToMultibase(Buffer.from(jwk.x!, "base64url")) };
}

let cachedKey: { source: string; key: SigningKey } | undefined;

/** This server's signing key, from REPORT_SIGNING_KEY. */
export function reportSigningKey(): SigningKey {
  const source = env().REPORT_SIGNING_KEY;
  if (!source) throw new SigningKeyError("REPORT_SIGNING_KEY is not set, so no report can be signed; make one with `npm run signing-key -- new`.");
  if (cachedKey?.source !== source) cachedKey = { source, key: signingKeyFromMultibase(source) };
  return cachedKey.key;
}

/** A new private key as a Multikey string. */
export function newSigningKeyMultibase(): string {
  return privateKeyToMultibase(randomBytes(32));
}

/** `key-1a2b3c4d5e6f`: a fingerprint of the public key (its period is in the DID document beside it). */
export function keyFragment(publicKeyMultibase: string): string {
  return `key-${createHash("sha256").update(publicKeyMultibase).digest("hex").slice(0, 12)}`;
}

/**
 * Records a key as the one signing from `now`: the key in use until then gets `valid_until = now`. Doing it
 * again with the key already current changes nothing. Needs the owner role (the app may only read keys).
 */
export async function registerSigningKey(db: Executor, publicKeyMultibase: string, now = new Date()): Promise<{ id: string; added: boolean }> {
  const [known] = await db.select().from(reportSigningKeys).where(eq(reportSigningKeys.publicKeyMultibase, publicKeyMultibase));
  if (known) {
    if (known.validUntil) throw new SigningKeyError(`The key ${known.id} was retired on ${known.validUntil.toISOString()} and cannot sign again; make a new one.`);
    return { id: known.id, added: false };
  }
  await db.update(reportSigningKeys).set({ validUntil: now }).where(isNull(reportSigningKeys.validUntil));
  const id = keyFragment(publicKeyMultibase);
  await db.insert(reportSigningKeys).values({ id, publicKeyMultibase, validFrom: now });
  return { id, added: true };
}

/** The id (fragment) under which this public key signs now; null when it is not the registered current key. */
export async function currentKeyFragment(db: Executor, publicKeyMultibase: string): Promise<string | null> {
  const [row] = await db
    .select({ id: reportSigningKeys.id })
    .from(reportSigningKeys)
    .where(and(eq(reportSigningKeys.publicKeyMultibase, publicKeyMultibase), isNull(reportSigningKeys.validUntil)));
  return row?.id ?? null;
}

/** `/.well-known/did.json`: the issuer's DID with every key it has signed with, oldest first. */
export async function didDocument(db: Executor, origin: string): Promise<DidDocument> {
  const did = didWebOf(origin);
  const rows = await db.select().from(reportSigningKeys).orderBy(asc(reportSigningKeys.validFrom));
  const methods = rows.map((row) => ({
    id: `${did}#${row.id}`,
    type: "Multikey" as const,
    controller: did,
    publicKeyMultibase: row.publicKeyMultibase,
    validFrom: row.validFrom.toISOString(),
    ...(row.validUntil ? { validUntil: row.validUntil.toISOString() } : {}),
  }));
  return {
    "@context": ["https://www.w3.org/ns/did/v1", "https://w3id.org/security/multikey/v1"],
    id: did,
    verificationMethod: methods,
    assertionMethod: methods.map((method) => method.id),
  };
}

/** Adds an eddsa-jcs-2022 proof made at `created` (ISO) with the key named `verificationMethod`. */
export async function signCredential(credential: ReportCredential, key: SigningKey, verificationMethod: string, created: string): Promise<ReportCredential> {
  const { proof: _unused, ...unsecured } = credential;
  const options = proofOptionsFor(unsecured, verificationMethod, created);
  const hashData = await proofHashData(unsecured, options);
  const signature = sign(null, hashData, key.privateKey);
  return { ...unsecured, proof: { ...options, proofValue: signatureToMultibase(signature) } };
}

