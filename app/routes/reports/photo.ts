import { z } from "zod";
import { databaseContext } from "~/db/context";
import { getOptionalUser } from "~/modules/accounts/guards.server";
import { serveSetupPhoto } from "~/modules/reports/photos.server";
import type { Route } from "./+types/photo";

const variantSchema = z.enum(["thumb", "large"]);

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const variant = variantSchema.safeParse(params.variant);
  if (!variant.success) return new Response("Not found", { status: 404 });
  return serveSetupPhoto(context.get(databaseContext), params.photoId, variant.data, await getOptionalUser(request), request);
}
