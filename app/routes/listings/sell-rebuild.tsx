import { data, redirect } from "react-router";
import { RebuildEntry } from "~/components/rebuilds/rebuild-entry";
import { databaseContext } from "~/db/context";
import { requireSeller } from "~/modules/listings/access.server";
import { getRebuildEditor, RebuildRuleError, saveRebuild } from "~/modules/rebuilds/service.server";
import type { Route } from "./+types/sell-rebuild";

export const meta: Route.MetaFunction = ({ data: loaded }) => [{ title: loaded ? `Rebuild record: ${loaded.listing.title} — Tenthmark` : "Rebuild record — Tenthmark" }];

function refused(error: unknown): never {
  if (error instanceof RebuildRuleError) throw data(error.message, { status: error.status });
  throw error;
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const seller = await requireSeller(request);
  return getRebuildEditor(context.get(databaseContext), seller, params.listingId).catch(refused);
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const seller = await requireSeller(request);
  const formData = await request.formData();
  const intent = formData.get("intent");
  if (intent !== "save" && intent !== "publish") return data({ errors: { form: ["Choose to save a draft or to publish."] } }, { status: 400 });
  const text = formData.get("form");
  if (typeof text !== "string" || text.length > 500_000) return data({ errors: { form: ["The form could not be read. Reload the page and try again."] } }, { status: 400 });
  let form: unknown;
  try {
    form = JSON.parse(text);
  } catch {
    return data({ errors: { form: ["The form could not be read. Reload the page and try again."] } }, { status: 400 });
  }
  const saved = await saveRebuild(context.get(databaseContext), seller, params.listingId, form, intent === "publish").catch(refused);
  if (!saved.ok) return data({ errors: saved.errors }, { status: 422 });
  if (saved.published && intent === "publish") {
    const editor = await getRebuildEditor(context.get(databaseContext), seller, params.listingId);
    return redirect(`/machines/${editor.listing.slug}#rebuild`);
  }
  return { errors: null, saved: true };
}

export default function SellRebuild({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <RebuildEntry
      listing={loaderData.listing}
      profiles={loaderData.profiles}
      initial={loaderData.form}
      status={loaderData.status}
      errors={(actionData?.errors as Record<string, string[]> | null) ?? null}
    />
  );
}
