import { useRef, useState } from "react";
import { useRevalidator } from "react-router";
import { cx } from "~/components/ui";
import { formatBytes } from "~/modules/files/limits";

type Upload = {
  id: string;
  name: string;
  size: number;
  /** 0..1 of the bytes sent to storage. */
  progress: number;
  state: "sending" | "checking" | "done" | "rejected";
  message?: string;
};

type Props = {
  /** The resource route that presigns and confirms, e.g. /sell/listings/:id/photos. */
  endpoint: string;
  accept: readonly string[];
  maxBytes: number;
  limitText: string;
  label: string;
  multiple?: boolean;
};

async function postForm(endpoint: string, fields: Record<string, string>) {
  const body = new FormData();
  for (const [key, value] of Object.entries(fields)) body.set(key, value);
  const response = await fetch(endpoint, { method: "POST", body, headers: { accept: "application/json" } });
  const payload = (await response.json().catch(() => ({}))) as { error?: string; uploadUrl?: string; uploadKey?: string };
  if (!response.ok) throw new Error(payload.error ?? "The server could not take this file. Try again in a moment.");
  return payload;
}

/** Sends the file straight to storage, reporting progress; XMLHttpRequest because fetch has no upload progress. */
function putWithProgress(url: string, file: File, onProgress: (fraction: number) => void) {
  return new Promise<void>((resolve, reject) => {
    const request = new XMLHttpRequest();
    request.open("PUT", url);
    request.setRequestHeader("content-type", file.type);
    request.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress(event.loaded / event.total);
    };
    request.onload = () => (request.status < 300 ? resolve() : reject(new Error(`Storage refused the file (${request.status}). Try again.`)));
    request.onerror = () => reject(new Error("The upload was interrupted. Check your connection and try again."));
    request.send(file);
  });
}

/**
 * Upload of photos or PDFs: presign, PUT to storage with a progress bar per file, then ask the server to
 * check and process the object. Needs JavaScript (the file goes to storage, not through our server).
 */
export function FileUploader({ endpoint, accept, maxBytes, limitText, label, multiple = true }: Props) {
  const [uploads, setUploads] = useState<Upload[]>([]);
  const input = useRef<HTMLInputElement>(null);
  const revalidator = useRevalidator();

  const update = (id: string, change: Partial<Upload>) =>
    setUploads((current) => current.map((upload) => (upload.id === id ? { ...upload, ...change } : upload)));

  /**
   * Asks for each file's upload address in the order the seller chose them (a photo's gallery place is
   * reserved then), and sends each file as soon as its address is in: uploads finish in any order.
   */
  async function sendAll(files: File[]) {
    const chosen = files.map((file) => ({ file, id: `${file.name}-${file.size}-${Math.random().toString(36).slice(2)}` }));
    setUploads((current) => [...current, ...chosen.map(({ file, id }) => ({ id, name: file.name, size: file.size, progress: 0, state: "sending" as const }))]);
    const reject = (id: string, error: unknown) => update(id, { state: "rejected", message: error instanceof Error ? error.message : String(error) });
    const transfers: Promise<void>[] = [];
    for (const { file, id } of chosen) {
      try {
        if (!accept.includes(file.type)) throw new Error(`This file is not one we accept. ${limitText}.`);
        if (file.size > maxBytes) throw new Error(`This file is ${formatBytes(file.size)}, over the ${formatBytes(maxBytes)} limit.`);
        const ticket = await postForm(endpoint, { intent: "presign", fileName: file.name, size: String(file.size), contentType: file.type });
        transfers.push(
          (async () => {
            await putWithProgress(ticket.uploadUrl!, file, (progress) => update(id, { progress }));
            update(id, { progress: 1, state: "checking" });
            await postForm(endpoint, { intent: "confirm", fileName: file.name, uploadKey: ticket.uploadKey! });
            update(id, { state: "done" });
            revalidator.revalidate();
          })().catch((error) => reject(id, error)),
        );
      } catch (error) {
        reject(id, error);
      }
    }
    await Promise.all(transfers);
  }

  return (
    <div className="space-y-3">
      <label
        className="flex cursor-pointer flex-col items-center justify-center gap-1 rounded-panel border-2 border-dashed border-ink-300 bg-ink-50 px-4 py-6 text-center hover:border-brass-400 hover:bg-brass-100/40"
      >
        <span className="text-sm font-bold text-ink-900">{label}</span>
        <span className="text-sm text-ink-500">{limitText}</span>
        <input
          ref={input}
          type="file"
          className="sr-only"
          accept={accept.join(",")}
          multiple={multiple}
          onChange={(event) => {
            const files = [...(event.target.files ?? [])];
            event.target.value = "";
            void sendAll(files);
          }}
        />
      </label>
      {uploads.length ? (
        <ul className="space-y-2" aria-label="Uploads">
          {uploads.map((upload) => (
            <li key={upload.id} className="rounded-control border border-ink-200 bg-white px-3 py-2" data-upload-state={upload.state}>
              <div className="flex items-baseline justify-between gap-3 text-sm">
                <span className="truncate font-semibold text-ink-800">{upload.name}</span>
                <span className={cx("shrink-0 tabular", upload.state === "rejected" ? "text-beyond" : "text-ink-500")}>
                  {upload.state === "sending"
                    ? `${Math.round(upload.progress * 100)} %`
                    : upload.state === "checking"
                      ? "Checking…"
                      : upload.state === "done"
                        ? "Added"
                        : "Not added"}
                </span>
              </div>
              <div
                role="progressbar"
                aria-label={`Upload of ${upload.name}`}
                aria-valuemin={0}
                aria-valuemax={100}
                aria-valuenow={Math.round(upload.progress * 100)}
                className="mt-1.5 h-1.5 overflow-hidden rounded-full bg-ink-100"
              >
                <div
                  className={cx(
                    "h-full rounded-full transition-[width]",
                    upload.state === "rejected" ? "bg-beyond" : upload.state === "done" ? "bg-within" : "bg-brass-500",
                  )}
                  style={{ width: `${Math.round(upload.progress * 100)}%` }}
                />
              </div>
              {upload.message ? (
                <p role="alert" className="mt-1 text-sm text-beyond">
                  {upload.message}
                </p>
              ) : null}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
