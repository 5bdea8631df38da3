// Every background worker of the app, declared in one place and started inside the app server process
// (app/entry.server.tsx calls `startJobWorkers` once at boot). Add a domain's worker declaration here.
import { env } from "~/env.server";
import { getDatabase } from "~/db/client.server";
import { declareInspectionWorkers } from "~/modules/inspections/bookings.server";
import { declareMailWorker } from "~/modules/mail/mail.server";
import { declareSearchWorkers } from "~/modules/search/indexing.server";
import { startWorkers } from "./queue.server";

let declared = false;

export function declareJobWorkers() {
  if (declared) return;
  declared = true;
  declareMailWorker();
  declareInspectionWorkers(getDatabase);
  declareSearchWorkers(getDatabase);
}

/** Declares and starts the workers, unless JOB_WORKERS=false. */
export async function startJobWorkers() {
  declareJobWorkers();
  if (!env().JOB_WORKERS) return;
  await startWorkers();
}
