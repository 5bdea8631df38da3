import { data, Form, Link, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import { useState } from "react";
import { z } from "zod";
import { Badge, Button, ButtonLink, Card, CardBody, CardHeader, CheckboxField, cx } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { getOptionalUser, requireVerifiedUser } from "~/modules/accounts/guards.server";
import { createBookingWithPublicInspector } from "~/modules/inspections/bookings.server";
import { RefundRules, SlotTime } from "~/modules/inspections/components/parts";
import { BookingRuleError, SlotTakenError } from "~/modules/inspections/errors";
import { bookingPageFor } from "~/modules/inspections/profiles.server";
import { bookingRequestSchema, categoryLabel } from "~/modules/inspections/validation";
import { inspectorRequestFor, InspectorRequestRuleError, requestInspector } from "~/modules/demand/service.server";
import { countryName } from "~/modules/listings/catalogue";
import { PaymentsRejectedError, PaymentsUnavailableError } from "~/modules/payments/stripe.server";
import { formatMoney } from "~/modules/units/format";
import type { Route } from "./+types/book";

export const meta: Route.MetaFunction = ({ data: loaded }) => [
  { title: loaded ? `Book an inspection of the ${loaded.listing.make} ${loaded.listing.model} — Tenthmark` : "Book an inspection — Tenthmark" },
];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await getOptionalUser(request);
  const page = await bookingPageFor(context.get(databaseContext), params.slug, user?.id ?? null);
  if (!page) throw data("There is no such machine, or it is not offered any more.", { status: 404 });
  // Where nobody serves yet, whether this person has asked for an inspector there.
  const asked = user && !page.inspectors.length ? await inspectorRequestFor(context.get(databaseContext), user.id, page.listing) : null;
  return { listing: page.listing, inspectors: page.inspectors, signedIn: Boolean(user), isSeller: page.viewerIsSeller, asked };
}

type Errors = Partial<Record<"inspectorId" | "slotId" | "acceptTerms" | "form", string[]>>;

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireVerifiedUser(request);
  const form = Object.fromEntries(await request.formData());
  if (form.intent === "request-inspector") {
    try {
      const { recorded } = await requestInspector(context.get(databaseContext), user, params.slug);
      return { requested: recorded ? ("recorded" as const) : ("already" as const) };
    } catch (error) {
      if (error instanceof InspectorRequestRuleError) return data({ errors: { form: [error.message] } as Errors }, { status: 422 });
      throw error;
    }
  }
  const parsed = bookingRequestSchema.safeParse(form);
  if (!parsed.success) {
    return data({ errors: z.flattenError(parsed.error).fieldErrors as Errors }, { status: 422 });
  }
  try {
    const { checkoutUrl } = await createBookingWithPublicInspector(context.get(databaseContext), {
      booker: user,
      listingSlug: params.slug,
      inspectorPublicId: parsed.data.inspectorId,
      slotId: parsed.data.slotId,
    });
    return redirect(checkoutUrl);
  } catch (error) {
    if (error instanceof SlotTakenError) return data({ errors: { slotId: [error.message] } as Errors }, { status: 409 });
    if (error instanceof BookingRuleError) return data({ errors: { [error.field ?? "form"]: [error.message] } as Errors }, { status: error.status });
    if (error instanceof PaymentsUnavailableError) return data({ errors: { form: [`${error.message} Your slot was not held; nothing was charged.`] } as Errors }, { status: 503 });
    if (error instanceof PaymentsRejectedError) return data({ errors: { form: [`The payment could not be started: ${error.message}`] } as Errors }, { status: 422 });
    throw error;
  }
}

export default function BookInspection() {
  const { listing, inspectors, signedIn, isSeller, asked } = useLoaderData<typeof loader>();
  const actionData = useActionData<typeof action>();
  const errors: Errors = (actionData && "errors" in actionData ? actionData.errors : undefined) ?? {};
  const navigation = useNavigation();
  const [chosen, setChosen] = useState<string | null>(inspectors.length === 1 ? inspectors[0]!.id : null);
  const chosenInspector = inspectors.find((inspector) => inspector.id === chosen);
  const place = [listing.city, listing.region, countryName(listing.country)].filter(Boolean).join(", ");
  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6 sm:py-10">
      <nav className="text-sm text-ink-500" aria-label="Breadcrumb">
        <Link to={`/machines/${listing.slug}`} className="underline underline-offset-2 hover:text-ink-800">
          {listing.make} {listing.model}
        </Link>{" "}
        / Book an inspection
      </nav>
      <h1 className="mt-2 text-2xl font-extrabold tracking-tight text-ink-950 sm:text-3xl">Book an on-site inspection</h1>
      <p className="mt-2 max-w-3xl text-ink-600">
        {categoryLabel(listing.category)} {listing.make} {listing.model}, {place}. A certified inspector measures the machine's geometry on site; the
        report is scored against the tolerance tables and published on the listing.
        {isSeller ? " As its seller, you may book the inspection of your own machine." : ""}
      </p>

      {inspectors.length === 0 ? (
        <Card className="mt-8">
          <CardBody className="space-y-2 py-8 text-center">
            <p className="text-lg font-bold text-ink-900">No certified inspector serves this machine's region yet</p>
            <InspectorRequest
              place={[listing.region || listing.city, countryName(listing.country)].join(", ")}
              slug={listing.slug}
              signedIn={signedIn}
              asked={asked}
              answer={actionData && "requested" in actionData ? actionData.requested : null}
              error={errors.form?.join(" ") ?? null}
              busy={navigation.state !== "idle"}
            />
            <p className="text-sm text-ink-600">
              Or <Link className="underline" to="/inspectors">see all inspectors</Link>: one who travels may take it on.
            </p>
          </CardBody>
        </Card>
      ) : (
        <Form method="post" className="mt-8 grid gap-8 lg:grid-cols-[1fr_22rem]">
          <div className="space-y-6">
            {errors.form ? (
              <p role="alert" className="rounded-control border border-beyond/30 bg-beyond-soft px-4 py-3 text-sm font-medium text-beyond">
                {errors.form.join(" ")}
              </p>
            ) : null}
            <fieldset>
              <legend className="text-lg font-bold text-ink-900">1. Choose an inspector</legend>
              {errors.inspectorId ? <p role="alert" className="mt-1 text-sm font-medium text-beyond">{errors.inspectorId.join(" ")}</p> : null}
              <div className="mt-3 grid gap-3 sm:grid-cols-2">
                {inspectors.map((inspector) => (
                  <label
                    key={inspector.id}
                    className={cx(
                      "block cursor-pointer rounded-panel border bg-white p-4 shadow-panel",
                      chosen === inspector.id ? "border-ink-900 ring-2 ring-ink-900" : "border-ink-200 hover:border-ink-400",
                    )}
                  >
                    <div className="flex items-start gap-3">
                      <input type="radio" name="inspectorId" value={inspector.id} checked={chosen === inspector.id} onChange={() => setChosen(inspector.id)} className="mt-1 accent-ink-900" />
                      <div className="min-w-0 flex-1">
                        <p className="font-bold text-ink-900">{inspector.name}</p>
                        <p className="text-sm text-ink-600">{inspector.headline}</p>
                        <p className="mt-2 flex flex-wrap items-center gap-2 text-sm">
                          <span className="font-extrabold text-ink-900 tabular">{formatMoney(inspector.feeMinor, inspector.currency)}</span>
                          <Badge tone="within">Certified</Badge>
                          <span className="text-ink-500">{inspector.slots.length} free slot{inspector.slots.length === 1 ? "" : "s"}</span>
                        </p>
                        <Link to={`/inspectors/${inspector.id}`} className="mt-1 inline-block text-sm font-semibold text-ink-700 underline underline-offset-2">
                          Profile
                        </Link>
                      </div>
                    </div>
                  </label>
                ))}
              </div>
            </fieldset>

            <fieldset>
              <legend className="text-lg font-bold text-ink-900">2. Choose a slot</legend>
              {errors.slotId ? (
                <p role="alert" className="mt-2 rounded-control border border-beyond/30 bg-beyond-soft px-3 py-2 text-sm font-medium text-beyond">
                  {errors.slotId.join(" ")}
                </p>
              ) : null}
              {!chosenInspector ? (
                <p className="mt-2 text-sm text-ink-500">Choose an inspector to see their free slots.</p>
              ) : chosenInspector.slots.length === 0 ? (
                <p className="mt-2 text-sm text-ink-500">{chosenInspector.name} has no free slot at the moment.</p>
              ) : (
                <div className="mt-3 grid gap-2 sm:grid-cols-2">
                  {chosenInspector.slots.map((slot) => (
                    <label key={slot.id} className="flex cursor-pointer items-center gap-3 rounded-control border border-ink-200 bg-white px-3 py-2.5 text-sm has-[:checked]:border-ink-900 has-[:checked]:ring-1 has-[:checked]:ring-ink-900">
                      <input type="radio" name="slotId" value={slot.id} className="accent-ink-900" required />
                      <SlotTime startsAt={slot.startsAt} endsAt={slot.endsAt} place={listing} />
                    </label>
                  ))}
                </div>
              )}
            </fieldset>
          </div>

          <aside className="space-y-4 lg:sticky lg:top-24 lg:self-start">
            <Card>
              <CardHeader title="3. Fee and payment" />
              <CardBody className="space-y-4">
                <div className="flex items-baseline justify-between">
                  <span className="text-sm text-ink-600">Inspection fee</span>
                  <span className="text-xl font-extrabold text-ink-950 tabular" data-testid="fee">
                    {chosenInspector ? formatMoney(chosenInspector.feeMinor, chosenInspector.currency) : "—"}
                  </span>
                </div>
                <p className="text-xs text-ink-500">Paid once through Stripe Checkout. The booking is confirmed as soon as the payment arrives.</p>
                <RefundRules />
                <CheckboxField name="acceptTerms" label="I have read the refund rules" errors={errors.acceptTerms} required />
                {signedIn ? (
                  <Button type="submit" size="lg" className="w-full" disabled={navigation.state !== "idle"}>
                    {navigation.state !== "idle" ? "Holding your slot…" : "Continue to payment"}
                  </Button>
                ) : (
                  <ButtonLink to={`/sign-in?redirectTo=${encodeURIComponent(`/machines/${listing.slug}/book`)}`} size="lg" className="w-full">
                    Sign in to book
                  </ButtonLink>
                )}
              </CardBody>
            </Card>
          </aside>
        </Form>
      )}
    </div>
  );
}

/** The way on where nobody serves yet: ask for an inspector in the region, and hear when one starts. */
function InspectorRequest({
  place,
  slug,
  signedIn,
  asked,
  answer,
  error,
  busy,
}: {
  place: string;
  slug: string;
  signedIn: boolean;
  asked: { askedOn: string; served: boolean } | null;
  answer: "recorded" | "already" | null;
  error: string | null;
  busy: boolean;
}) {
  if (!signedIn) {
    return (
      <p className="text-ink-600">
        <Link className="font-semibold underline" to={`/sign-in?${new URLSearchParams({ redirectTo: `/machines/${slug}/book` })}`}>
          Sign in
        </Link>{" "}
        to ask for an inspector in {place}; we e-mail you when one starts serving it.
      </p>
    );
  }
  if (answer || asked) {
    return (
      <p role="status" className="mx-auto max-w-xl text-ink-700" data-testid="inspector-requested">
        {answer === "recorded"
          ? `Your request for an inspector in ${place} is recorded. Certified inspectors in the country have been told, and we e-mail you when one starts serving it.`
          : `You asked for an inspector in ${place}${asked ? ` on ${asked.askedOn}` : ""}. We e-mail you when one starts serving it.`}
      </p>
    );
  }
  return (
    <Form method="post" className="mx-auto flex max-w-xl flex-col items-center gap-3">
      <p className="text-ink-600">Ask for one: we tell the certified inspectors who work in the country, and e-mail you when one starts serving {place}.</p>
      {error ? (
        <p role="alert" className="text-sm font-medium text-beyond">
          {error}
        </p>
      ) : null}
      <input type="hidden" name="intent" value="request-inspector" />
      <Button type="submit" disabled={busy}>
        Ask for an inspector
      </Button>
    </Form>
  );
}
