// A report credential out of a file someone has: the credential's JSON itself, or a certificate PDF that
// carries it as an embedded file. Shared by the browser's verify page and the offline script.
export type FoundCredential = { ok: true; credential: unknown; from: "json" | "pdf" } | { ok: false; reason: string };

const PDF_MAGIC = "%PDF-";

export async function credentialFromFile(bytes: Uint8Array, maxBytes: number): Promise<FoundCredential> {
  if (bytes.length > maxBytes) return { ok: false, reason: `The file is larger than ${Math.round(maxBytes / 1_000_000)} MB; a certificate or credential is far smaller.` };
  const head = new TextDecoder().decode(bytes.slice(0, 5));
  if (head === PDF_MAGIC) return { ok: false, reason: "Reading certificates (PDF) is not available yet; use the credential's JSON." };
  try {
    return { ok: true, credential: JSON.parse(new TextDecoder("utf-8", { fatal: true }).decode(bytes)), from: "json" };
  } catch {
    return { ok: false, reason: "The file is neither a credential (JSON) nor a Tenthmark certificate (PDF)." };
  }
}
