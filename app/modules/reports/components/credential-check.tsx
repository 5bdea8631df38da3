// Checks a report credential or certificate in the reader's own browser: the file never leaves it. Only the
// issuer's public keys (/.well-known/did.json) and, for the one thing a file cannot tell (a later correction),
// the report's status are fetched. The verification code loads when a file is chosen, not with the page.
import { useRef, useState, type DragEvent } from "react";
import { Badge } from "~/components/ui";
import type { CredentialCheck as Check, ReportCredentialSubject } from "../credential";
import { formatDate } from "~/modules/units/dates";

type Outcome = {
  valid: boolean;
  fileName: string;
  from: "json" | "pdf" | null;
  checks: Check[];
  subject: ReportCredentialSubject | null;
};

const MAX_FILE_BYTES = 20_000_000;

const STATE_MARK: Record<Check["state"], string> = { passed: "✓", failed: "✗", "not-checked": "?" };
const STATE_CLASS: Record<Check["state"], string> = { passed: "text-within", failed: "text-beyond", "not-checked": "text-ink-600" };

/** What Tenthmark's server says of the report now: not part of the signature, so said apart from it. */
async function serverStatus(subject: ReportCredentialSubject): Promise<Check> {
  try {
    const response = await fetch(`/api/v1/reports/${encodeURIComponent(subject.reportId)}`, { headers: { accept: "application/json" } });
    if (response.status === 404) return { name: "current", state: "failed", detail: "Tenthmark's server knows no report with this id." };
    const body = (await response.json()) as { status?: string; supersededBy?: { id: string; revision: number } | null; content?: { score?: { grade?: string }; measuredOn?: string }; mismatched?: string[] };
    if (response.status === 409) {
      return { name: "current", state: "failed", detail: `Tenthmark's stored copy of this report no longer matches what was signed (${(body.mismatched ?? []).join(", ")}); the credential you hold is what the inspector signed.` };
    }
    if (!response.ok) return { name: "current", state: "not-checked", detail: "Tenthmark's server did not answer; whether a later correction supersedes it could not be checked." };
    if (body.content?.score?.grade !== subject.grade || body.content?.measuredOn !== subject.measuredOn) {
      return { name: "current", state: "failed", detail: "Tenthmark's server shows other figures for this report than the credential holds." };
    }
    if (body.status === "superseded") {
      return { name: "current", state: "failed", detail: `Superseded: revision ${body.supersededBy?.revision ?? "?"} corrects it (asked of Tenthmark's server). Read the current revision before relying on it.` };
    }
    return { name: "current", state: "passed", detail: "Not superseded, and Tenthmark shows the same grade and date (asked of Tenthmark's server: a file alone cannot tell)." };
  } catch {
    return { name: "current", state: "not-checked", detail: "Tenthmark's server could not be reached; whether a later correction supersedes it could not be checked." };
  }
}

async function check(file: File): Promise<Outcome> {
  const [{ verifyReportCredential }, { credentialFromFile }] = await Promise.all([import("../credential"), import("../credential-file")]);
  const bytes = new Uint8Array(await file.arrayBuffer());
  const found = await credentialFromFile(bytes, MAX_FILE_BYTES);
  if (!found.ok) return { valid: false, fileName: file.name, from: null, checks: [{ name: "format", state: "failed", detail: found.reason }], subject: null };
  let didDocument: unknown = null;
  try {
    didDocument = await (await fetch("/.well-known/did.json")).json();
  } catch {
    // reported by the issuer check below
  }
  const result = await verifyReportCredential(found.credential, didDocument);
  const checks = result.checks.filter((entry) => entry.name !== "current");
  if (result.valid && result.subject) checks.push(await serverStatus(result.subject));
  return { valid: result.valid, fileName: file.name, from: found.from, checks, subject: result.valid ? result.subject : null };
}

export function CredentialCheck() {
  const [outcome, setOutcome] = useState<Outcome | null>(null);
  const [busy, setBusy] = useState(false);
  const [over, setOver] = useState(false);
  const input = useRef<HTMLInputElement>(null);

  const run = async (file: File | undefined) => {
    if (!file) return;
    setBusy(true);
    try {
      setOutcome(await check(file));
    } catch (error) {
      setOutcome({ valid: false, fileName: file.name, from: null, checks: [{ name: "format", state: "failed", detail: `The file could not be checked: ${error instanceof Error ? error.message : String(error)}` }], subject: null });
    } finally {
      setBusy(false);
    }
  };
  const onDrop = (event: DragEvent<HTMLElement>) => {
    event.preventDefault();
    setOver(false);
    void run(event.dataTransfer.files[0]);
  };

  return (
    <section aria-labelledby="credential-check-heading" className="mt-10">
      <h2 id="credential-check-heading" className="text-xl font-extrabold tracking-tight text-ink-950">
        Check a certificate or credential
      </h2>
      <p className="mt-2 text-ink-600">
        Every signed report is also a W3C Verifiable Credential, signed with Tenthmark's Ed25519 key and embedded in its PDF certificate. Drop the certificate (PDF) or the credential (JSON) here: your browser checks the signature itself, fetching only Tenthmark's public keys. The file is not uploaded.
      </p>
      <label
        htmlFor="credential-file"
        onDragOver={(event) => {
          event.preventDefault();
          setOver(true);
        }}
        onDragLeave={() => setOver(false)}
        onDrop={onDrop}
        data-testid="credential-drop"
        className={`mt-4 flex min-h-32 cursor-pointer flex-col items-center justify-center gap-2 rounded-panel border-2 border-dashed px-4 py-6 text-center ${over ? "border-brass-600 bg-brass-100" : "border-ink-300 bg-white"}`}
      >
        <span className="font-semibold text-ink-900">{busy ? "Checking…" : "Drop a certificate PDF or credential JSON here"}</span>
        <span className="text-sm text-ink-600">or choose a file</span>
        <input
          ref={input}
          id="credential-file"
          type="file"
          accept="application/pdf,application/json,application/vc,.pdf,.json"
          className="sr-only"
          onChange={(event) => void run(event.currentTarget.files?.[0])}
        />
      </label>
      {outcome ? (
        <div className="mt-4 rounded-panel border border-ink-200 bg-white p-4" data-testid="credential-result" role="status">
          <div className="flex flex-wrap items-center gap-2">
            <Badge tone={outcome.valid ? "within" : "beyond"}>{outcome.valid ? "Valid" : "Not valid"}</Badge>
            <span className="text-sm text-ink-600">
              {outcome.fileName}
              {outcome.from === "pdf" ? " (credential embedded in the certificate)" : ""}
            </span>
          </div>
          {outcome.subject ? (
            <p className="mt-3 text-ink-900">
              <span className="font-bold">{outcome.subject.machine.title}</span> (serial {outcome.subject.machine.serialNumber ?? "not given"}): grade{" "}
              <span className="font-bold" data-testid="credential-grade">
                {outcome.subject.grade}
              </span>
              , tests on {formatDate(outcome.subject.measuredOn)} by {outcome.subject.inspector.name}, signed {outcome.subject.signedAt.replace("T", " ").replace(/\.\d+Z$/, " UTC")}.
              {outcome.subject.reissued && typeof outcome.subject.reissued.on === "string" ? (
                <span className="block text-sm text-ink-600" data-testid="credential-reissued">
                  Credential re-issued on {formatDate(outcome.subject.reissued.on.slice(0, 10))}: the report predates signed credentials, so this signature is Tenthmark's of that date, over the content whose hash was recorded when the inspector signed.
                </span>
              ) : null}
            </p>
          ) : null}
          <h3 className="mt-3 text-sm font-bold text-ink-900">What was checked</h3>
          <ul className="mt-1 space-y-1 text-sm">
            {outcome.checks.map((entry) => (
              <li key={entry.name} className="flex gap-2" data-check={entry.name} data-state={entry.state}>
                <span aria-hidden="true" className={`font-bold ${STATE_CLASS[entry.state]}`}>
                  {STATE_MARK[entry.state]}
                </span>
                <span className="text-ink-800">
                  <span className="sr-only">{entry.state === "passed" ? "Passed: " : entry.state === "failed" ? "Failed: " : "Not checked: "}</span>
                  {entry.detail}
                </span>
              </li>
            ))}
          </ul>
        </div>
      ) : null}
    </section>
  );
}
