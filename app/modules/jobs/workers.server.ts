// Every background worker of the app, declared in one place and started inside the app server process
// (app/entry.server.tsx calls `startJobWorkers` once at boot). Add a domain's worker declaration here.
import { env } from "~/env.server";
import { getDatabase } from "~/db/client.server";
import { declareFileWorkers } from "~/modules/files/abandoned-uploads.server";
import { declareInspectionWorkers } from "~/modules/inspections/bookings.server";
import { flushListingViews } from "~/modules/listings/views.server";
import { declareWatchlistWorkers } from "~/modules/listings/watchlist.server";
import { declareMailWorker } from "~/modules/mail/mail.server";
import { declareSearchWorkers } from "~/modules/search/indexing.server";
import { closeSearchConnections } from "~/modules/search/search-http.server";
import { closeDatabase } from "~/db/client.server";
import { startWorkers, stopQueue } from "./queue.server";

let declared = false;

export function declareJobWorkers() {
  if (declared) return;
  declared = true;
  declareMailWorker();
  declareFileWorkers();
  declareInspectionWorkers(getDatabase);
  declareSearchWorkers(getDatabase);
  declareWatchlistWorkers(getDatabase);
}

/** Declares and starts the workers, unless JOB_WORKERS=false; stops them cleanly on SIGTERM or SIGINT. */
export async function startJobWorkers() {
  declareJobWorkers();
  stopOnSignals();
  if (!env().JOB_WORKERS) return;
  await startWorkers();
}

// How long a running job may take to finish when the server is told to stop, and how long the process
// may then take to end by itself before it is ended.
const jobGraceMs = 5_000;
const exitGraceMs = 10_000;

let signalsHandled = false;
let stopping: Promise<void> | undefined;

/**
 * The HTTP server (react-router-serve) closes its port on SIGTERM/SIGINT; this stops the job queue (running
 * jobs may finish within a short grace), closes the database pool and the search service's kept-alive
 * connections, so that nothing keeps the process alive and it ends by itself.
 */
function stopOnSignals() {
  if (signalsHandled) return;
  signalsHandled = true;
  for (const signal of ["SIGTERM", "SIGINT"] as const) {
    process.once(signal, () => {
      stopping ??= (async () => {
        try {
          // Views counted since the last write are stored first (the server exits within seconds), and
          // again after the queue has stopped, for the requests that were still being answered.
          await flushListingViews();
          await stopQueue({ timeoutMs: jobGraceMs });
          await flushListingViews();
          await closeDatabase();
          await closeSearchConnections();
        } catch (error) {
          console.warn(`[jobs] stopping on ${signal}: ${error instanceof Error ? error.message : String(error)}`);
        }
        // A stray handle (a client that never hangs up) must not keep a stopped server alive.
        setTimeout(() => {
          console.warn(`[jobs] the process had not ended ${exitGraceMs / 1000} s after ${signal}; ending it`);
          process.exit(0);
        }, exitGraceMs).unref();
      })();
    });
  }
}

/** Resolves when the work stopped on a signal has finished (our server waits for it before it exits). */
export function serverWorkStopped(): Promise<void> {
  return stopping ?? Promise.resolve();
}
