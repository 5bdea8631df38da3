// Each signed report as a W3C Verifiable Credential: served at /api/v1/reports/:id/credential, linked from the
// JSON view, verified against /.well-known/did.json (ours and @noble/curves), corrections naming their predecessor.
import { ed25519 } from "@noble/curves/ed25519.js";
import { sha256 } from "@noble/hashes/sha2.js";
import { base58 } from "@scure/base";
import canonicalize from "canonicalize";
import { describe, expect, it } from "vitest";
import { publicKeyFromMultibase, verifyReportCredential, type DidDocument, type ReportCredential } from "~/modules/reports/credential";
import { testAppOrigin } from "../../support/accounts";
import { acceptedBooking, completeForm, fileAndSign, inspectorCookie } from "../../support/reports";

async function getJson<T>(url: string) {
  const response = await fetch(url);
  return { status: response.status, type: response.headers.get("content-type"), body: (await response.json()) as T, text: "" };
}

describe("a report's credential", () => {
  it("is issued at signing, linked from the JSON view, and verifies with the issuer's did.json and with @noble/curves", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const signed = await fileAndSign(cookie, booked.bookingId, completeForm());

    const api = await getJson<{ links: { credential: string; issuerKeys: string } }>(`${testAppOrigin}/api/v1/reports/${signed.id}`);
    expect(api.body.links.credential).toBe(`${testAppOrigin}/api/v1/reports/${signed.id}/credential`);
    expect(api.body.links.issuerKeys).toBe(`${testAppOrigin}/.well-known/did.json`);

    const response = await fetch(api.body.links.credential);
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("application/vc");
    const text = await response.text();
    const credential = JSON.parse(text) as ReportCredential;
    expect(text).toBe(canonicalize(credential));
    expect(credential.issuer.id).toBe(`did:web:${new URL(testAppOrigin).host.replace(":", "%3A")}`);
    expect(credential.credentialSubject).toMatchObject({ reportId: signed.id, grade: "B", measuredOn: signed.measuredOn, signedAt: signed.signedAt!.toISOString(), content: { sha256: signed.contentHash } });
    expect(credential.credentialSubject.machine).toMatchObject({ make: "Tessmar", model: "DL 330", serialNumber: "DL330-1187", year: 1991 });

    const did = await getJson<DidDocument>(`${testAppOrigin}/.well-known/did.json`);
    expect(did.type).toBe("application/did+json");
    expect(did.body.id).toBe(credential.issuer.id);
    const verification = await verifyReportCredential(credential, did.body);
    expect(verification.valid).toBe(true);

    // Independently: noble's Ed25519 over the eddsa-jcs-2022 hash data, with the key did.json names.
    const method = did.body.verificationMethod.find((candidate) => candidate.id === credential.proof!.verificationMethod)!;
    const { proof, ...unsecured } = credential;
    const { proofValue, ...options } = proof!;
    const hashData = new Uint8Array([...sha256(new TextEncoder().encode(canonicalize(options))), ...sha256(new TextEncoder().encode(canonicalize(unsecured)))]);
    expect(ed25519.verify(base58.decode(proofValue!.slice(1)), hashData, publicKeyFromMultibase(method.publicKeyMultibase)!)).toBe(true);

    const tampered = structuredClone(credential);
    tampered.credentialSubject.grade = "A";
    expect((await verifyReportCredential(tampered, did.body)).checks.at(-1)).toMatchObject({ name: "signature", state: "failed" });
  });

  it("of a correction names the credential it supersedes", async () => {
    const booked = await acceptedBooking();
    const cookie = await inspectorCookie(booked.inspector);
    const first = await fileAndSign(cookie, booked.bookingId, completeForm());
    await fetch(`${testAppOrigin}/inspector/reports/${first.id}/correct`, { method: "POST", headers: { cookie, origin: testAppOrigin }, redirect: "manual" });
    const second = await fileAndSign(cookie, booked.bookingId, completeForm({ "L-SP-NOSE": { kind: "sweep", readings: ["0", "9", "3"], instrumentId: "i1" } }));
    const credential = (await getJson<ReportCredential>(`${testAppOrigin}/api/v1/reports/${second.id}/credential`)).body;
    expect(credential.credentialSubject.supersedes).toEqual({ id: `${testAppOrigin}/api/v1/reports/${first.id}/credential`, reportId: first.id, contentHash: first.contentHash });
    const did = (await getJson<DidDocument>(`${testAppOrigin}/.well-known/did.json`)).body;
    expect((await verifyReportCredential(credential, did)).valid).toBe(true);
    // The superseded revision's credential is still served and still verifies.
    expect((await verifyReportCredential((await getJson<ReportCredential>(`${testAppOrigin}/api/v1/reports/${first.id}/credential`)).body, did)).valid).toBe(true);
  });

  it("is 404 for unknown ids and 405 for writes", async () => {
    expect((await fetch(`${testAppOrigin}/api/v1/reports/00000000-0000-4000-8000-000000000000/credential`)).status).toBe(404);
    expect((await fetch(`${testAppOrigin}/api/v1/reports/not-a-uuid/credential`)).status).toBe(404);
    expect((await fetch(`${testAppOrigin}/api/v1/reports/00000000-0000-4000-8000-000000000000/credential`, { method: "POST" })).status).toBe(405);
  });
});
