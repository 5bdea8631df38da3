// Keeps the entry form safe on a workshop connection: every change goes to this device's storage at once,
// and to the server after a short pause, one request at a time, retried until it lands.
// Plain fetch, not a router fetcher: a failed fetcher action would replace the form with the error page.
import { useCallback, useEffect, useRef, useState } from "react";
import { reportFormSchema, type ReportForm } from "../../form";

export type SyncStatus =
  | { kind: "saved"; at: string; version: number }
  | { kind: "pending" }
  | { kind: "saving" }
  | { kind: "offline"; message: string }
  | { kind: "refused"; message: string };

type LocalCopy = { form: ReportForm; changedAt: number; synced: boolean };

const DEBOUNCE_MS = 900;
const RETRY_MS = 5_000;

export function localDraftKey(bookingId: string) {
  return `tenthmark:report-draft:${bookingId}`;
}

function readLocal(bookingId: string): LocalCopy | null {
  try {
    const raw = window.localStorage.getItem(localDraftKey(bookingId));
    if (!raw) return null;
    const parsed = JSON.parse(raw) as LocalCopy;
    const form = reportFormSchema.safeParse(parsed.form);
    return form.success ? { ...parsed, form: form.data } : null;
  } catch {
    return null;
  }
}

function writeLocal(bookingId: string, copy: LocalCopy) {
  try {
    window.localStorage.setItem(localDraftKey(bookingId), JSON.stringify(copy));
  } catch {
    // Storage full or disabled (private mode): the server copy still holds the draft.
  }
}

export function useDraftSync({
  bookingId,
  draftUrl,
  form,
  setForm,
  serverUpdatedAt,
  serverVersion,
  enabled,
}: {
  bookingId: string;
  draftUrl: string;
  form: ReportForm;
  setForm: (form: ReportForm) => void;
  serverUpdatedAt: string | null;
  serverVersion: number | null;
  enabled: boolean;
}) {
  const [status, setStatus] = useState<SyncStatus>(
    serverUpdatedAt && serverVersion ? { kind: "saved", at: serverUpdatedAt, version: serverVersion } : { kind: "pending" },
  );
  const [restored, setRestored] = useState(false);
  const latest = useRef(form);
  const dirty = useRef(false);
  const inFlight = useRef(false);
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const firstRender = useRef(true);

  const save = useCallback(async () => {
    if (!enabled || !dirty.current) return;
    if (inFlight.current) return;
    inFlight.current = true;
    dirty.current = false;
    const sending = latest.current;
    setStatus({ kind: "saving" });
    try {
      const response = await fetch(draftUrl, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ form: sending }),
      });
      if (response.ok) {
        const body = (await response.json()) as { version: number; savedAt: string };
        if (latest.current === sending) writeLocal(bookingId, { form: sending, changedAt: Date.now(), synced: true });
        setStatus(dirty.current ? { kind: "pending" } : { kind: "saved", at: body.savedAt, version: body.version });
      } else if (response.status === 409 || response.status === 422 || response.status === 403 || response.status === 404) {
        const body = (await response.json().catch(() => ({}))) as { error?: string };
        setStatus({ kind: "refused", message: body.error ?? "The server refused this draft." });
      } else {
        dirty.current = true;
        setStatus({ kind: "offline", message: `The server answered ${response.status}; your readings are kept on this device and will be sent again.` });
        timer.current = setTimeout(save, RETRY_MS);
      }
    } catch {
      dirty.current = true;
      setStatus({ kind: "offline", message: "No connection; your readings are kept on this device and will be sent when it is back." });
      timer.current = setTimeout(save, RETRY_MS);
    } finally {
      inFlight.current = false;
      if (dirty.current && !timer.current) timer.current = setTimeout(save, DEBOUNCE_MS);
    }
  }, [bookingId, draftUrl, enabled]);

  const schedule = useCallback(() => {
    if (timer.current) clearTimeout(timer.current);
    timer.current = setTimeout(() => {
      timer.current = null;
      void save();
    }, DEBOUNCE_MS);
  }, [save]);

  // Resume: a copy on this device newer than the server's wins and is sent on.
  useEffect(() => {
    if (!enabled) return;
    const local = readLocal(bookingId);
    const serverTime = serverUpdatedAt ? Date.parse(serverUpdatedAt) : 0;
    if (local && !local.synced && local.changedAt > serverTime) {
      latest.current = local.form;
      setForm(local.form);
      setRestored(true);
      dirty.current = true;
      schedule();
    }
    // Only on arrival.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  useEffect(() => {
    if (firstRender.current) {
      firstRender.current = false;
      return;
    }
    latest.current = form;
    if (!enabled) return;
    writeLocal(bookingId, { form, changedAt: Date.now(), synced: false });
    dirty.current = true;
    setStatus((current) => (current.kind === "refused" ? current : { kind: "pending" }));
    schedule();
  }, [form, bookingId, enabled, schedule]);

  // Leaving the page or the tablet sleeping: send what is not yet on the server.
  useEffect(() => {
    if (!enabled) return;
    const flush = () => {
      if (!dirty.current) return;
      navigator.sendBeacon?.(draftUrl, new Blob([JSON.stringify({ form: latest.current })], { type: "application/json" }));
    };
    const onHidden = () => document.visibilityState === "hidden" && flush();
    const onOnline = () => void save();
    window.addEventListener("pagehide", flush);
    document.addEventListener("visibilitychange", onHidden);
    window.addEventListener("online", onOnline);
    return () => {
      window.removeEventListener("pagehide", flush);
      document.removeEventListener("visibilitychange", onHidden);
      window.removeEventListener("online", onOnline);
    };
  }, [draftUrl, enabled, save]);

  useEffect(() => () => void (timer.current && clearTimeout(timer.current)), []);

  /** Sends any unsaved change now; resolves when the server has the latest form (or could not be reached). */
  const flushNow = useCallback(async () => {
    if (timer.current) clearTimeout(timer.current);
    timer.current = null;
    await save();
  }, [save]);

  return { status, restored, flushNow };
}
