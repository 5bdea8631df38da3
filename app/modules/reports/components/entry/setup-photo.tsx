// A set-up photo for one test: presigned upload straight to storage with progress, then the server checks
// and re-encodes it. The tablet's camera opens directly where the browser supports `capture`.
import { useRef, useState } from "react";
import { Button } from "~/components/ui";
import { PHOTO_TYPES, photoLimitText } from "~/modules/files/limits";

export type SetupPhotoView = { id: string; thumbnailUrl: string };

async function postStep(url: string, fields: Record<string, string>) {
  const body = new FormData();
  for (const [key, value] of Object.entries(fields)) body.set(key, value);
  const response = await fetch(url, { method: "POST", body });
  const json = (await response.json().catch(() => ({}))) as Record<string, unknown>;
  if (!response.ok) throw new Error(typeof json.error === "string" ? json.error : `The upload failed (${response.status}). Try again.`);
  return json;
}

function putWithProgress(url: string, file: File, onProgress: (share: number) => void) {
  return new Promise<void>((resolve, reject) => {
    const request = new XMLHttpRequest();
    request.open("PUT", url);
    request.setRequestHeader("content-type", file.type);
    request.upload.onprogress = (event) => event.lengthComputable && onProgress(event.loaded / event.total);
    request.onload = () => (request.status >= 200 && request.status < 300 ? resolve() : reject(new Error(`Storage refused the photo (${request.status}).`)));
    request.onerror = () => reject(new Error("The connection dropped during the upload. Try again."));
    request.send(file);
  });
}

export function SetupPhoto({ testCode, photo, photosUrl, onChange, error, disabled }: { testCode: string; photo: SetupPhotoView | null; photosUrl: string; onChange: (photo: SetupPhotoView | null) => void; error?: string; disabled: boolean }) {
  const input = useRef<HTMLInputElement>(null);
  const [progress, setProgress] = useState<number | null>(null);
  const [message, setMessage] = useState<string | null>(null);

  const upload = async (file: File) => {
    setMessage(null);
    setProgress(0);
    try {
      const ticket = await postStep(photosUrl, { intent: "presign", testCode, fileName: file.name, size: String(file.size), contentType: file.type });
      await putWithProgress(String(ticket.uploadUrl), file, setProgress);
      const confirmed = await postStep(photosUrl, { intent: "confirm", testCode, uploadKey: String(ticket.uploadKey) });
      const stored = confirmed.photo as { id: string; thumbnailUrl: string };
      onChange({ id: stored.id, thumbnailUrl: stored.thumbnailUrl });
    } catch (failure) {
      setMessage(failure instanceof Error ? failure.message : "The upload failed. Try again.");
    } finally {
      setProgress(null);
      if (input.current) input.current.value = "";
    }
  };

  return (
    <div className="space-y-2">
      <p className="text-sm font-semibold text-ink-800">Set-up photo</p>
      <div className="flex flex-wrap items-center gap-3">
        {photo ? <img src={photo.thumbnailUrl} alt={`Set-up of ${testCode}`} className="h-20 w-28 rounded-control border border-ink-200 object-cover" /> : null}
        <input
          ref={input}
          type="file"
          accept={PHOTO_TYPES.join(",")}
          capture="environment"
          className="sr-only"
          aria-label={`Set-up photo for ${testCode}`}
          disabled={disabled || progress !== null}
          onChange={(event) => {
            const file = event.target.files?.[0];
            if (file) void upload(file);
          }}
        />
        <Button variant="secondary" size="sm" disabled={disabled || progress !== null} onClick={() => input.current?.click()}>
          {photo ? "Replace the photo" : "Add a photo"}
        </Button>
        {photo ? (
          <Button variant="quiet" size="sm" disabled={disabled} onClick={() => onChange(null)}>
            Remove
          </Button>
        ) : null}
        {progress !== null ? (
          <div className="flex items-center gap-2 text-sm text-ink-600" role="status">
            <progress max={1} value={progress} className="h-2 w-28" />
            {Math.round(progress * 100)} %
          </div>
        ) : null}
      </div>
      <p className="text-xs text-ink-500">{photoLimitText}. Location and camera data are removed.</p>
      {message || error ? (
        <p className="text-sm font-medium text-beyond" role="alert">
          {message ?? error}
        </p>
      ) : null}
    </div>
  );
}
