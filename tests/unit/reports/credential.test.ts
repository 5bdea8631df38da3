// The eddsa-jcs-2022 cryptosuite against the W3C specification's own test vectors (tests/fixtures/vc-di-eddsa)
// and against an independent Ed25519 implementation from npm (@noble/curves), then the report credential.
import { readFileSync } from "node:fs";
import path from "node:path";
import { ed25519 } from "@noble/curves/ed25519.js";
import canonicalize from "canonicalize";
import { describe, expect, it } from "vitest";
import type { ReportContent } from "~/modules/reports/content";
import {
  buildReportCredential,
  didWebOf,
  privateKeyFromMultibase,
  proofHashData,
  proofOptionsFor,
  publicKeyFromMultibase,
  toHex,
  verifyDataIntegrityProof,
  verifyReportCredential,
  type ReportCredential,
} from "~/modules/reports/credential";
import { keyFragment, newSigningKeyMultibase, signCredential, signingKeyFromMultibase } from "~/modules/reports/signing.server";
import { base58 } from "@scure/base";

const vectors = path.resolve(import.meta.dirname, "../../fixtures/vc-di-eddsa");
const read = (name: string) => readFileSync(path.join(vectors, name), "utf8").trim();
const json = (name: string) => JSON.parse(read(name)) as Record<string, unknown>;

describe("eddsa-jcs-2022 against the W3C test vectors (vc-di-eddsa TestVectors/eddsa-jcs-2022)", () => {
  const keyPair = json("keyPair.json") as { publicKeyMultibase: string; privateKeyMultibase: string };
  const unsigned = json("unsigned.json");
  const proofConfig = json("proofConfigJCS.json");

  it("decodes the vector key pair as Multikey Ed25519 keys that belong together (checked with @noble/curves)", () => {
    const seed = privateKeyFromMultibase(keyPair.privateKeyMultibase)!;
    const publicKey = publicKeyFromMultibase(keyPair.publicKeyMultibase)!;
    expect(seed).toHaveLength(32);
    expect(toHex(ed25519.getPublicKey(seed))).toBe(toHex(publicKey));
    expect(signingKeyFromMultibase(keyPair.privateKeyMultibase).publicKeyMultibase).toBe(keyPair.publicKeyMultibase);
  });

  it("canonicalises and hashes document and proof configuration as the vectors do", async () => {
    expect(canonicalize(unsigned)).toBe(read("canonDocJCS.txt"));
    const options = proofOptionsFor(unsigned as { "@context": string[] }, proofConfig.verificationMethod as string, proofConfig.created as string);
    expect(canonicalize(options)).toBe(read("proofCanonJCS.txt"));
    const hashData = await proofHashData(unsigned, options);
    expect(toHex(hashData.slice(0, 32))).toBe(read("proofHashJCS.txt"));
    expect(toHex(hashData.slice(32))).toBe(read("docHashJCS.txt"));
  });

  it("signs to the vector's signature and proof value (Ed25519 is deterministic)", async () => {
    const key = signingKeyFromMultibase(keyPair.privateKeyMultibase);
    const signed = await signCredential(unsigned as unknown as ReportCredential, key, proofConfig.verificationMethod as string, proofConfig.created as string);
    expect(toHex(base58.decode(signed.proof!.proofValue!.slice(1)))).toBe(read("sigHexJCS.txt"));
    expect(signed.proof!.proofValue).toBe(read("sigBTC58JCS.txt"));
    expect(canonicalize(signed)).toBe(canonicalize(json("signedJCS.json")));
  });

  it("verifies the vector's signed credential, and refuses it after any change", async () => {
    const publicKey = publicKeyFromMultibase(keyPair.publicKeyMultibase)!;
    const signed = json("signedJCS.json");
    expect(await verifyDataIntegrityProof(signed, publicKey)).toEqual({ verified: true });
    const changed = structuredClone(signed) as { credentialSubject: { alumniOf: string } };
    changed.credentialSubject.alumniOf = "The School of Counterfeits";
    expect((await verifyDataIntegrityProof(changed as unknown as Record<string, unknown>, publicKey)).verified).toBe(false);
    const otherContext = structuredClone(signed) as { proof: { "@context": string[] } };
    otherContext.proof["@context"] = ["https://www.w3.org/ns/credentials/v2"];
    expect((await verifyDataIntegrityProof(otherContext as unknown as Record<string, unknown>, publicKey)).verified).toBe(false);
  });
});

// ————— The report credential —————

const origin = "https://tenthmark.example.test";
const content = {
  format: "tenthmark.accuracy-report/1",
  reportId: "0b7f3c8e-3f43-4d4e-9a47-5f0b2d1c9e10",
  revision: 1,
  supersedes: null,
  machine: { title: "Tessmar DL 330", make: "Tessmar", model: "DL 330", year: 1991, serialNumber: "DL330-1187", category: "centre_lathe", listingId: "5d1f0c3a-8b2e-4f6a-9c1d-2e3f4a5b6c7d" },
  inspector: { id: "u1", name: "Aldo Verrin" },
  measuredOn: "2026-11-20",
  profile: { key: "centre-lathe-normal", version: 1, title: "Centre lathe, normal class" },
  tests: { "L-SP-NOSE": { instrumentId: "i1", notes: "", photo: { id: "p1", width: 1600, height: 1200, sha256: "ab".repeat(32) } } },
  score: {
    grade: "B",
    keyFigures: { spindleRunOut: 4, axialSlip: null, spindleParallelismVertical: null, spindleParallelismHorizontal: null, centreHeight: null, bedStraightness: 12.5 },
    results: [
      { code: "L-SP-NOSE", title: "Spindle nose run-out", value: 4, unit: "µm", tolerance: 10, measuringLength: null, ratio: 0.4, pass: true, sources: { tolerance: "ISO 1708 (from memory)" } },
    ],
  },
  signedAt: "2026-11-21T09:30:00.000Z",
} as unknown as ReportContent;

async function signedCredential(privateKey: string, validFrom: string) {
  const key = signingKeyFromMultibase(privateKey);
  const fragment = keyFragment(key.publicKeyMultibase);
  const did = didWebOf(origin);
  const credential = await signCredential(buildReportCredential(content, "cd".repeat(32), origin), key, `${did}#${fragment}`, content.signedAt!);
  const method = { id: `${did}#${fragment}`, type: "Multikey" as const, controller: did, publicKeyMultibase: key.publicKeyMultibase, validFrom };
  return { credential, method, key };
}

function didDocumentOf(...methods: Array<{ id: string; validFrom: string; validUntil?: string }>) {
  return { "@context": ["https://www.w3.org/ns/did/v1"], id: didWebOf(origin), verificationMethod: methods, assertionMethod: methods.map((method) => method.id) };
}

describe("a report credential", () => {
  it("is a VC 2.0 with the machine, inspector, dates, profile, results with sources, grade, key figures and photo digests", async () => {
    const { credential } = await signedCredential(newSigningKeyMultibase(), "2026-01-01T00:00:00.000Z");
    expect(credential["@context"]).toEqual(["https://www.w3.org/ns/credentials/v2"]);
    expect(credential.issuer.id).toBe("did:web:tenthmark.example.test");
    expect(credential.validFrom).toBe(content.signedAt);
    const subject = credential.credentialSubject;
    expect(subject.machine).toMatchObject({ make: "Tessmar", model: "DL 330", serialNumber: "DL330-1187", year: 1991 });
    expect(subject).toMatchObject({ measuredOn: "2026-11-20", grade: "B", profile: { key: "centre-lathe-normal", version: 1 }, inspector: { name: "Aldo Verrin" } });
    expect(subject.results[0]).toMatchObject({ code: "L-SP-NOSE", tolerance: 10, source: "ISO 1708 (from memory)" });
    expect(subject.setupPhotos).toEqual([{ test: "L-SP-NOSE", sha256: "ab".repeat(32) }]);
    expect(subject.content.sha256).toBe("cd".repeat(32));
    expect(credential.proof).toMatchObject({ type: "DataIntegrityProof", cryptosuite: "eddsa-jcs-2022", proofPurpose: "assertionMethod", created: content.signedAt });
  });

  it("verifies with @noble/curves (an implementation independent of ours and of node:crypto), and fails after any byte changes", async () => {
    const { credential, method } = await signedCredential(newSigningKeyMultibase(), "2026-01-01T00:00:00.000Z");
    const text = canonicalize(credential)!;
    const publicKey = publicKeyFromMultibase(method.publicKeyMultibase)!;
    // The eddsa-jcs-2022 steps written out again here, with noble's SHA-256-free verify over our hash data.
    const { proof, ...unsecured } = JSON.parse(text) as ReportCredential;
    const { proofValue, ...options } = proof!;
    const { sha256 } = await import("@noble/hashes/sha2.js");
    const hashData = new Uint8Array([...sha256(new TextEncoder().encode(canonicalize(options))), ...sha256(new TextEncoder().encode(canonicalize(unsecured)))]);
    const signature = base58.decode(proofValue!.slice(1));
    expect(ed25519.verify(signature, hashData, publicKey)).toBe(true);

    // Every single character of the signed JSON changed in turn (to another that keeps it parseable where it can).
    let refused = 0;
    let tried = 0;
    for (let index = 0; index < text.length; index += 1) {
      const original = text[index]!;
      const replacement = /[0-9]/.test(original) ? String((Number(original) + 1) % 10) : /[a-z]/i.test(original) ? (original === "x" ? "y" : "x") : null;
      if (!replacement) continue;
      let changed: Record<string, unknown>;
      try {
        changed = JSON.parse(text.slice(0, index) + replacement + text.slice(index + 1));
      } catch {
        continue;
      }
      tried += 1;
      let nobleSays = false;
      try {
        const { proof: changedProof, ...changedUnsecured } = changed as unknown as ReportCredential;
        const { proofValue: changedValue, ...changedOptions } = changedProof!;
        if (!changedValue!.startsWith("z")) throw new Error("not base58-btc multibase");
        const changedHash = new Uint8Array([...sha256(new TextEncoder().encode(canonicalize(changedOptions))), ...sha256(new TextEncoder().encode(canonicalize(changedUnsecured)))]);
        nobleSays = ed25519.verify(base58.decode(changedValue!.slice(1)), changedHash, publicKey);
      } catch {
        nobleSays = false;
      }
      const oursSays = (await verifyReportCredential(changed, didDocumentOf(method))).valid;
      if (!nobleSays && !oursSays) refused += 1;
    }
    expect(tried).toBeGreaterThan(500);
    expect(refused).toBe(tried);
  }, 60_000);

  it("checks issuer, key and the key's validity period against the DID document, and says what it checked", async () => {
    const { credential, method } = await signedCredential(newSigningKeyMultibase(), "2026-01-01T00:00:00.000Z");
    const ok = await verifyReportCredential(credential, didDocumentOf(method));
    expect(ok.valid).toBe(true);
    expect(ok.checks.map((check) => [check.name, check.state])).toEqual([
      ["format", "passed"],
      ["issuer", "passed"],
      ["signature", "passed"],
      ["key-validity", "passed"],
      ["content", "passed"],
      ["current", "not-checked"],
    ]);
    const retiredBefore = await verifyReportCredential(credential, didDocumentOf({ ...method, validUntil: "2026-06-01T00:00:00.000Z" }));
    expect(retiredBefore.valid).toBe(false);
    expect(retiredBefore.checks.at(-1)).toMatchObject({ name: "key-validity", state: "failed" });
    const otherIssuer = await verifyReportCredential(credential, { ...didDocumentOf(method), id: "did:web:elsewhere.example.test" });
    expect(otherIssuer.checks.at(-1)).toMatchObject({ name: "issuer", state: "failed" });
    expect((await verifyReportCredential({ hello: "world" }, didDocumentOf(method))).checks[0]).toMatchObject({ name: "format", state: "failed" });
  });

  it("signed before a key rotation still verifies with the old key's validity period, and a newer key cannot pass for it", async () => {
    const old = await signedCredential(newSigningKeyMultibase(), "2026-01-01T00:00:00.000Z");
    const next = await signedCredential(newSigningKeyMultibase(), "2026-12-01T00:00:00.000Z");
    const document = didDocumentOf({ ...old.method, validUntil: "2026-12-01T00:00:00.000Z" }, next.method);
    expect((await verifyReportCredential(old.credential, document)).valid).toBe(true);
    // The new key did not exist when this report was signed.
    expect((await verifyReportCredential(next.credential, document)).checks.at(-1)).toMatchObject({ name: "key-validity", state: "failed" });
  });
});
