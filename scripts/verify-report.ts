// `npm run verify-report -- <credential.json | certificate.pdf> [--did did.json]`: checks a report credential
// offline, with nothing but the issuer's DID document (saved from <origin>/.well-known/did.json). Without
// --did it fetches that document from the issuer's did:web address. Exit code 0 only when valid.
import { readFileSync } from "node:fs";
import { didDocumentUrl, MAX_CREDENTIAL_BYTES, verifyReportCredential } from "../app/modules/reports/credential.ts";
import { credentialFromFile } from "../app/modules/reports/credential-file.ts";

async function main(args: string[]): Promise<number> {
  const didIndex = args.indexOf("--did");
  const didFile = didIndex >= 0 ? args[didIndex + 1] : undefined;
  const file = args.find((arg, index) => !arg.startsWith("--") && (didIndex < 0 || index !== didIndex + 1));
  if (!file || (didIndex >= 0 && !didFile)) {
    console.error("Usage: npm run verify-report -- <credential.json | certificate.pdf> [--did did.json]");
    return 2;
  }
  const bytes = readFileSync(file);
  const found = await credentialFromFile(new Uint8Array(bytes), MAX_CREDENTIAL_BYTES * 20);
  if (!found.ok) {
    console.log(`NOT VALID: ${found.reason}`);
    return 1;
  }
  let didDocument: unknown;
  if (didFile) {
    didDocument = JSON.parse(readFileSync(didFile, "utf8"));
  } else {
    const issuer = (found.credential as { issuer?: { id?: unknown } }).issuer?.id;
    if (typeof issuer !== "string" || !issuer.startsWith("did:web:")) {
      console.log("NOT VALID: the credential names no did:web issuer; give its DID document with --did.");
      return 1;
    }
    const url = didDocumentUrl(issuer);
    console.log(`fetching the issuer's keys from ${url}`);
    didDocument = await (await fetch(url)).json();
  }
  const result = await verifyReportCredential(found.credential, didDocument);
  console.log(result.valid ? "VALID" : "NOT VALID");
  for (const check of result.checks) console.log(`  ${check.state === "passed" ? "✓" : check.state === "failed" ? "✗" : "?"} ${check.detail}`);
  if (result.valid && result.subject) {
    const subject = result.subject;
    console.log(`\n${subject.machine.title} (serial ${subject.machine.serialNumber ?? "not given"}): grade ${subject.grade}, measured ${subject.measuredOn} by ${subject.inspector.name}, signed ${subject.signedAt}`);
    if (subject.reissued) console.log(`credential re-issued on ${subject.reissued.on}: ${subject.reissued.note}`);
  }
  return result.valid ? 0 : 1;
}

main(process.argv.slice(2)).then(
  (code) => process.exit(code),
  (error) => {
    console.error(error instanceof Error ? error.message : String(error));
    process.exit(2);
  },
);
