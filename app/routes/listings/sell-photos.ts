import { databaseContext } from "~/db/context";
import { requireSeller } from "~/modules/listings/access.server";
import { handleUploadStep } from "~/modules/listings/upload-actions.server";
import type { Route } from "./+types/sell-photos";

// POST intent=presign → { uploadUrl, uploadKey }; intent=confirm → { photo } or 422 { error }.
export async function action({ request, params, context }: Route.ActionArgs) {
  const seller = await requireSeller(request);
  return handleUploadStep(context.get(databaseContext), seller, params.listingId, "photo", await request.formData());
}
