// A report credential out of a file someone has: the credential's JSON itself, or a certificate PDF that
// carries it as an embedded file (PDF/A-3 associated file). Shared by the browser's verify page and the offline
// script, so it uses only what both have (TextDecoder, DecompressionStream).
export type FoundCredential = { ok: true; credential: unknown; from: "json" | "pdf" } | { ok: false; reason: string };

/** The embedded file's name in a certificate, and its media type (the VC Data Model 2.0's). */
export const CREDENTIAL_ATTACHMENT_NAME = "report-credential.json";
export const CREDENTIAL_MEDIA_TYPE = "application/vc";

const latin1 = new TextDecoder("latin1");

async function inflate(bytes: Uint8Array): Promise<Uint8Array> {
  const stream = new Blob([bytes as BlobPart]).stream().pipeThrough(new DecompressionStream("deflate"));
  return new Uint8Array(await new Response(stream).arrayBuffer());
}

/**
 * The embedded files of a PDF, read straight from their stream objects (`/Type /EmbeddedFile`), without the
 * cross-reference table: enough for our own certificates, which write them with a direct `/Length`.
 */
export async function embeddedFilesOfPdf(bytes: Uint8Array, limit = 20): Promise<Uint8Array[]> {
  const text = latin1.decode(bytes);
  const files: Uint8Array[] = [];
  const marker = /\/Type\s*\/EmbeddedFile\b/g;
  for (let match = marker.exec(text); match && files.length < limit; match = marker.exec(text)) {
    const dictionaryStart = text.lastIndexOf("obj", match.index);
    const streamStart = text.indexOf("stream", match.index);
    if (dictionaryStart < 0 || streamStart < 0) continue;
    const dictionary = text.slice(dictionaryStart, streamStart);
    const length = /\/Length\s+(\d+)(?!\s+\d+\s+R)/.exec(dictionary);
    if (!length) continue;
    let dataStart = streamStart + "stream".length;
    if (text[dataStart] === "\r") dataStart += 1;
    if (text[dataStart] === "\n") dataStart += 1;
    const raw = bytes.slice(dataStart, dataStart + Number(length[1]));
    const filter = /\/Filter\s*\/(\w+)/.exec(dictionary)?.[1];
    if (filter && filter !== "FlateDecode") continue;
    try {
      files.push(filter ? await inflate(raw) : raw);
    } catch {
      files.push(new Uint8Array());
    }
  }
  return files;
}

function parseJson(bytes: Uint8Array): unknown {
  return JSON.parse(new TextDecoder("utf-8", { fatal: true }).decode(bytes));
}

export async function credentialFromFile(bytes: Uint8Array, maxBytes: number): Promise<FoundCredential> {
  if (bytes.length > maxBytes) return { ok: false, reason: `The file is larger than ${Math.round(maxBytes / 1_000_000)} MB; a certificate or credential is far smaller.` };
  if (latin1.decode(bytes.slice(0, 5)) === "%PDF-") {
    const files = await embeddedFilesOfPdf(bytes);
    if (!files.length) return { ok: false, reason: "This PDF carries no embedded credential: it is not a Tenthmark certificate, or an older one without it." };
    for (const file of files) {
      try {
        const credential = parseJson(file);
        if (credential && typeof credential === "object" && "proof" in credential) return { ok: true, credential, from: "pdf" };
      } catch {
        // another attachment, or a damaged one: try the next
      }
    }
    return { ok: false, reason: "The credential embedded in this PDF cannot be read: the file was changed or damaged." };
  }
  try {
    return { ok: true, credential: parseJson(bytes), from: "json" };
  } catch {
    return { ok: false, reason: "The file is neither a credential (JSON) nor a Tenthmark certificate (PDF)." };
  }
}
