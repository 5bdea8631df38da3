import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { RejectedFileError } from "~/modules/files/images.server";
import { StorageUnavailableError } from "~/modules/files/storage.server";
import { confirmSetupPhotoUpload, photoStepSchema, startSetupPhotoUpload } from "~/modules/reports/photos.server";
import { ReportRuleError } from "~/modules/reports/service.server";
import type { Route } from "./+types/setup-photos";

// The two steps of a set-up photo upload (presign, confirm), answered in JSON.
export async function action({ request, params, context }: Route.ActionArgs) {
  const inspector = await requireRole(request, "inspector");
  const step = photoStepSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!step.success) return Response.json({ error: "This upload request is incomplete. Reload the page and try again." }, { status: 400 });
  const db = context.get(databaseContext);
  try {
    if (step.data.intent === "presign") return Response.json(await startSetupPhotoUpload(db, inspector, params.bookingId, step.data));
    return Response.json({ photo: await confirmSetupPhotoUpload(db, inspector, params.bookingId, step.data) });
  } catch (error) {
    if (error instanceof ReportRuleError) return Response.json({ error: error.message }, { status: error.status });
    if (error instanceof RejectedFileError) return Response.json({ error: error.message }, { status: 422 });
    if (error instanceof StorageUnavailableError) return Response.json({ error: error.message }, { status: 503 });
    throw error;
  }
}

export function loader() {
  return Response.json({ error: "Upload with POST." }, { status: 405, headers: { Allow: "POST" } });
}
