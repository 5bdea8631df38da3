import { parseWithZod } from "@conform-to/zod/v4";
import { data, redirect } from "react-router";
import { ListingForm } from "~/components/listings/listing-form";
import { ButtonLink } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { requireSeller } from "~/modules/listings/access.server";
import { createListing } from "~/modules/listings/service.server";
import { listingFormSchema } from "~/modules/listings/validation";
import type { Route } from "./+types/sell-new";

export const meta: Route.MetaFunction = () => [{ title: "New listing — Tenthmark" }];

export async function loader({ request }: Route.LoaderArgs) {
  const seller = await requireSeller(request);
  return { units: seller.displayUnits };
}

export async function action({ request, context }: Route.ActionArgs) {
  const seller = await requireSeller(request);
  const submission = parseWithZod(await request.formData(), { schema: listingFormSchema(seller.displayUnits) });
  if (submission.status !== "success") return data(submission.reply(), { status: 422 });
  const listing = await createListing(context.get(databaseContext), seller, submission.value);
  return redirect(`/sell/listings/${listing.id}?notice=created#photos`);
}

export default function NewListing({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <div className="mx-auto max-w-3xl px-4 py-10 sm:px-6">
      <p className="text-sm font-bold uppercase tracking-wide text-brass-600">Sell a machine</p>
      <h1 className="mt-1 text-3xl font-extrabold text-ink-900">New listing</h1>
      <p className="mt-2 text-ink-600">
        Describe the machine first. It is saved as a draft; you add photos and documents next, and publish when it is ready.
      </p>
      <div className="mt-8">
        <ListingForm
          units={loaderData.units}
          lastResult={actionData}
          submitLabel="Save draft and add photos"
          aside={
            <ButtonLink to="/sell" variant="quiet">
              Cancel
            </ButtonLink>
          }
        />
      </div>
    </div>
  );
}
