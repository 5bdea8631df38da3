// Sealing a signed report: RFC 8785 canonical JSON (the `canonicalize` package) and its SHA-256, so anyone
// holding the JSON can recompute the hash, whatever their language's JSON library orders or spaces.
import { createHash } from "node:crypto";
import canonicalize from "canonicalize";

export function canonicalJson(content: unknown): string {
  const canonical = canonicalize(content);
  if (canonical === undefined) throw new Error("The report content cannot be written as JSON.");
  return canonical;
}

export function sha256Hex(text: string): string {
  return createHash("sha256").update(text, "utf8").digest("hex");
}

export function sealContent(content: unknown): { canonical: string; hash: string } {
  const canonical = canonicalJson(content);
  return { canonical, hash: sha256Hex(canonical) };
}

/** True when the stored canonical JSON still hashes to the stored hash and is still canonical. */
export function sealHolds(canonical: string, hash: string): boolean {
  return sha256Hex(canonical) === hash && canonicalJson(JSON.parse(canonical)) === canonical;
}

export const HASH_PATTERN = /^[0-9a-f]{64}$/;
