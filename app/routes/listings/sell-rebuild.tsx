import { data, redirect } from "react-router";
import { RebuildEntry } from "~/components/rebuilds/rebuild-entry";
import { databaseContext } from "~/db/context";
import { MachineMatchCard } from "~/components/machines/machine-match";
import { hasRole, requireVerifiedUser } from "~/modules/accounts/guards.server";
import { listings } from "~/modules/listings/schema";
import { confirmMatch, linkedListings, MachineRuleError, refuseMatch, splitListing, suggestedMatches } from "~/modules/machines/service.server";
import { getRebuildEditor, RebuildRuleError, saveRebuild } from "~/modules/rebuilds/service.server";
import { eq } from "drizzle-orm";
import type { Route } from "./+types/sell-rebuild";

export const meta: Route.MetaFunction = ({ data: loaded }) => [{ title: loaded ? `Rebuild record: ${loaded.listing.title} — Tenthmark` : "Rebuild record — Tenthmark" }];

function refused(error: unknown): never {
  if (error instanceof RebuildRuleError || error instanceof MachineRuleError) throw data(error.message, { status: error.status });
  throw error;
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  // The seller, staff, or an inspector booked to visit the machine; the service decides which.
  const person = await requireVerifiedUser(request);
  const db = context.get(databaseContext);
  const editor = await getRebuildEditor(db, person, params.listingId).catch(refused);
  // Matching the machine across listings is the seller's (and staff's) decision, never the inspector's.
  if (editor.as === "inspector") return { ...editor, machine: null };
  const [listing] = await db.select().from(listings).where(eq(listings.id, editor.listing.id));
  return {
    ...editor,
    machine: { suggestions: await suggestedMatches(db, listing!), linked: await linkedListings(db, listing!.id), isStaff: hasRole(person, "admin") },
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const person = await requireVerifiedUser(request);
  const formData = await request.formData();
  const intent = formData.get("intent");
  if (intent === "confirm-machine" || intent === "refuse-machine" || intent === "split-machine") {
    const db = context.get(databaseContext);
    const other = String(formData.get("otherListingId") ?? "");
    try {
      if (intent === "confirm-machine") await confirmMatch(db, person, params.listingId, other);
      else if (intent === "refuse-machine") await refuseMatch(db, person, params.listingId, other);
      else await splitListing(db, person, params.listingId);
    } catch (error) {
      if (error instanceof MachineRuleError) return data({ errors: { machine: [error.message] } }, { status: error.status });
      throw error;
    }
    return { errors: null, saved: false };
  }
  if (intent !== "save" && intent !== "publish") return data({ errors: { form: ["Choose to save a draft or to publish."] } }, { status: 400 });
  const text = formData.get("form");
  if (typeof text !== "string" || text.length > 500_000) return data({ errors: { form: ["The form could not be read. Reload the page and try again."] } }, { status: 400 });
  let form: unknown;
  try {
    form = JSON.parse(text);
  } catch {
    return data({ errors: { form: ["The form could not be read. Reload the page and try again."] } }, { status: 400 });
  }
  const saved = await saveRebuild(context.get(databaseContext), person, params.listingId, form, intent === "publish").catch(refused);
  if (!saved.ok) return data({ errors: saved.errors }, { status: 422 });
  if (saved.published && intent === "publish") {
    const editor = await getRebuildEditor(context.get(databaseContext), person, params.listingId);
    return redirect(`/machines/${editor.listing.slug}#rebuild`);
  }
  return { errors: null, saved: true };
}

export default function SellRebuild({ loaderData, actionData }: Route.ComponentProps) {
  const machineErrors = (actionData?.errors as Record<string, string[]> | null)?.machine;
  return (
    <RebuildEntry
      machine={
        loaderData.machine ? (
          <>
            {machineErrors ? <p className="mt-4 font-medium text-beyond">{machineErrors.join(" ")}</p> : null}
            <MachineMatchCard suggestions={loaderData.machine.suggestions} linked={loaderData.machine.linked} isStaff={loaderData.machine.isStaff} />
          </>
        ) : null
      }
      as={loaderData.as}
      listing={loaderData.listing}
      photos={loaderData.photos}
      profiles={loaderData.profiles}
      initial={loaderData.form}
      status={loaderData.status}
      errors={(actionData?.errors as Record<string, string[]> | null) ?? null}
    />
  );
}
