import { databaseContext } from "~/db/context";
import { requireSeller } from "~/modules/listings/access.server";
import { handleUploadStep } from "~/modules/listings/upload-actions.server";
import type { Route } from "./+types/sell-documents";

// POST intent=presign → { uploadUrl, uploadKey }; intent=confirm → { document } or 422 { error }.
export async function action({ request, params, context }: Route.ActionArgs) {
  const seller = await requireSeller(request);
  return handleUploadStep(context.get(databaseContext), seller, params.listingId, "document", await request.formData());
}
