import { data, Form, Link, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import { Badge, Button, Card, CardBody, CardHeader, CheckboxField, SelectField, TextAreaField, TextField } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { formatSlot, InspectionSafetyNotice } from "~/modules/inspections/components/parts";
import { BookingRuleError } from "~/modules/inspections/errors";
import { addSlots, getOwnProfile, removeSlot, saveProfile, storeCertificate } from "~/modules/inspections/profiles.server";
import { getPayoutAccount, payoutStateWords, startPayoutOnboarding } from "~/modules/inspections/payouts.server";
import { PaymentsRejectedError, PaymentsUnavailableError } from "~/modules/payments/stripe.server";
import { categoryLabel, inspectionCategories, parseProfileForm, SLOT_DURATIONS, slotSchema } from "~/modules/inspections/validation";
import { DOCUMENT_MAX_BYTES, documentLimitText } from "~/modules/files/limits";
import { StorageUnavailableError } from "~/modules/files/storage.server";
import { currencies, fromMinorUnits } from "~/modules/units/format";
import { formId } from "~/modules/validation/text";
import { z } from "zod";
import type { Route } from "./+types/inspector-profile-edit";

export const meta: Route.MetaFunction = () => [{ title: "Your inspector profile — Tenthmark" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireRole(request, "inspector");
  const db = context.get(databaseContext);
  const own = await getOwnProfile(db, user.id);
  const returned = new URL(request.url).searchParams.get("payouts");
  return { ...own, payouts: payoutStateWords(await getPayoutAccount(db, user.id)), payoutsReturned: returned === "returned" };
}

type Errors = Record<string, string[] | undefined>;
type Result = { intent: string; errors: Errors | null; message?: string };

const result = (intent: string, errors: Errors, status: number) => data<Result>({ intent, errors }, { status });

export async function action({ request, context }: Route.ActionArgs) {
  const user = await requireRole(request, "inspector");
  const db = context.get(databaseContext);
  if (Number(request.headers.get("content-length") ?? 0) > DOCUMENT_MAX_BYTES + 64 * 1024) return result("certificate", { certificate: [`The file is over the limit: ${documentLimitText}.`] }, 413);
  const form = await request.formData();
  const intent = String(form.get("intent") ?? "");
  try {
    switch (intent) {
      case "profile": {
        const parsed = parseProfileForm(form);
        if (parsed.errors) return result(intent, parsed.errors, 422);
        await saveProfile(db, user.id, parsed.value);
        return { intent, errors: null, message: "Profile saved." } satisfies Result;
      }
      case "add-slot": {
        const parsed = slotSchema.safeParse(Object.fromEntries(form));
        if (!parsed.success) return result(intent, z.flattenError(parsed.error).fieldErrors, 422);
        const added = await addSlots(db, user.id, parsed.data);
        return { intent, errors: null, message: added === 1 ? "Slot added." : `${added} slots added.` } satisfies Result;
      }
      case "remove-slot": {
        const slotId = formId("slot").safeParse(form.get("slotId"));
        if (!slotId.success) return result(intent, { slotId: slotId.error.issues.map((issue) => issue.message) }, 422);
        await removeSlot(db, user.id, slotId.data);
        return { intent, errors: null, message: "Slot removed." } satisfies Result;
      }
      case "payouts": {
        // Off to the payment provider's hosted set-up; it sends the inspector back to /inspector/payouts/return.
        return redirect(await startPayoutOnboarding(db, user));
      }
      case "certificate": {
        const file = form.get("certificate");
        if (!(file instanceof File)) return result(intent, { certificate: ["Choose a PDF file to upload."] }, 422);
        await storeCertificate(db, user.id, file);
        return { intent, errors: null, message: "Certificate uploaded." } satisfies Result;
      }
      default:
        return result(intent, { form: ["Unknown action."] }, 400);
    }
  } catch (error) {
    if (error instanceof BookingRuleError) return result(intent, { [error.field ?? "form"]: [error.message] }, error.status);
    if (error instanceof StorageUnavailableError) return result(intent, { certificate: [error.message] }, 503);
    if (error instanceof PaymentsUnavailableError) {
      return result(intent, { payouts: ["The payment provider is not answering, so payout set-up could not start. Nothing was lost: try again in a few minutes."] }, 503);
    }
    if (error instanceof PaymentsRejectedError) return result(intent, { payouts: [`The payment provider refused to start set-up: ${error.message}`] }, 502);
    throw error;
  }
}

export default function InspectorProfileEdit() {
  const { profile, fees, slots, fromApplication, payouts, payoutsReturned } = useLoaderData<typeof loader>();
  // The public page's address uses the profile's public id, which a profile has once it is saved.
  const publicId = profile && "publicId" in profile ? profile.publicId : null;
  const actionData = useActionData<typeof action>();
  const busy = useNavigation().state !== "idle";
  const errorsFor = (intent: string) => (actionData?.intent === intent ? (actionData.errors ?? {}) : {});
  const profileErrors = errorsFor("profile");
  const slotErrors = errorsFor("add-slot");
  const certificateErrors = errorsFor("certificate");
  const payoutErrors = errorsFor("payouts");
  const saved = profile && "headline" in profile ? profile : null;
  const feeOf = (category: string) => {
    const fee = fees.find((candidate) => candidate.category === category);
    return fee ? String(fromMinorUnits(fee.amountMinor)) : "";
  };
  const served = new Set<string>(profile?.categories ?? []);
  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6 sm:py-10">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-extrabold tracking-tight text-ink-950 sm:text-3xl">Your inspector profile</h1>
          <p className="mt-1 text-ink-600">What buyers see before they book you, your fees, and the times you offer.</p>
        </div>
        <div className="flex gap-2">
          {saved && publicId ? (
            <Link to={`/inspectors/${publicId}`} className="text-sm font-semibold text-ink-800 underline underline-offset-2">
              See your public page
            </Link>
          ) : null}
          <Link to="/inspector/bookings" className="text-sm font-semibold text-ink-800 underline underline-offset-2">
            Your bookings
          </Link>
        </div>
      </div>
      {actionData?.message ? (
        <p role="status" className="mt-4 rounded-control border border-within/30 bg-within-soft px-4 py-3 text-sm font-semibold text-within">
          {actionData.message}
        </p>
      ) : null}
      {fromApplication ? (
        <p className="mt-4 rounded-control border border-brass-200 bg-brass-100 px-4 py-3 text-sm text-ink-800">
          Filled in from your approved application. Add a headline, a few words about yourself and your fees, then save.
        </p>
      ) : null}

      <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_24rem]">
        <Card>
          <CardHeader title="Profile and fees" />
          <CardBody>
            <Form method="post" className="space-y-5">
              <input type="hidden" name="intent" value="profile" />
              <TextField label="Headline" name="headline" defaultValue={saved?.headline ?? ""} errors={profileErrors.headline} placeholder="Lathe rebuilder, geometry checks since 1998" />
              <TextAreaField label="About you" name="bio" defaultValue={saved?.bio ?? ""} errors={profileErrors.bio} rows={5} />
              <TextAreaField label="Qualifications" name="qualifications" defaultValue={profile?.qualifications ?? ""} errors={profileErrors.qualifications} hint="Trade certificates, years of practice, instruments and their calibration." />
              <div className="grid gap-4 sm:grid-cols-2">
                <TextField label="Based in" name="baseCity" defaultValue={saved?.baseCity ?? ""} errors={profileErrors.baseCity} />
                <SelectField label="Currency of your fees" name="currency" defaultValue={saved?.currency ?? "EUR"} errors={profileErrors.currency} options={currencies.map((code) => ({ value: code, label: code }))} />
              </div>
              <TextAreaField
                label="Regions you travel to"
                name="regions"
                defaultValue={(profile?.regions ?? []).join("\n")}
                errors={profileErrors.regions}
                hint="One per line: a region, a country (name or code such as DE) or a city, as listings name them."
                rows={3}
              />
              <fieldset>
                <legend className="text-sm font-semibold text-ink-800">Machines you inspect, and your fee for each</legend>
                {profileErrors.categories ? <p role="alert" className="mt-1 text-sm font-medium text-beyond">{profileErrors.categories.join(" ")}</p> : null}
                <div className="mt-2 divide-y divide-ink-100 rounded-control border border-ink-200">
                  {inspectionCategories.map((category) => (
                    <div key={category} className="flex flex-col gap-2 px-3 py-2.5 sm:flex-row sm:items-center sm:justify-between">
                      <CheckboxField label={categoryLabel(category)} name="categories" value={category} defaultChecked={served.has(category)} />
                      <div className="sm:w-40">
                        <label className="sr-only" htmlFor={`fee-${category}`}>
                          Fee for {categoryLabel(category)}
                        </label>
                        <input
                          id={`fee-${category}`}
                          name={`fee.${category}`}
                          inputMode="decimal"
                          placeholder="Fee, e.g. 380"
                          defaultValue={feeOf(category)}
                          aria-invalid={profileErrors[`fee.${category}`] ? true : undefined}
                          className="block w-full rounded-control border border-ink-300 bg-white px-3 py-1.5 text-base tabular focus:outline-none focus:ring-2 focus:ring-brass-400"
                        />
                        {profileErrors[`fee.${category}`] ? <p className="mt-1 text-xs font-medium text-beyond">{profileErrors[`fee.${category}`]!.join(" ")}</p> : null}
                      </div>
                    </div>
                  ))}
                </div>
              </fieldset>
              <Button type="submit" disabled={busy}>
                Save profile
              </Button>
            </Form>
          </CardBody>
        </Card>

        <div className="space-y-6">
          <Card>
            <CardHeader title="Slots" description="Times in UTC. Buyers book a whole slot." />
            <CardBody className="space-y-4">
              {saved ? (
                <Form method="post" className="space-y-3">
                  <input type="hidden" name="intent" value="add-slot" />
                  <div className="grid grid-cols-2 gap-3">
                    <TextField label="Day" name="date" type="date" errors={slotErrors.date} required />
                    <TextField label="Start (UTC)" name="startTime" type="time" defaultValue="08:00" errors={slotErrors.startTime} required />
                  </div>
                  <div className="grid grid-cols-2 gap-3">
                    <SelectField label="Length" name="durationMinutes" defaultValue="240" errors={slotErrors.durationMinutes} options={SLOT_DURATIONS.map((minutes) => ({ value: String(minutes), label: `${minutes / 60} hours` }))} />
                    <SelectField label="Repeat" name="repeatWeeks" defaultValue="1" errors={slotErrors.repeatWeeks} options={[1, 2, 4, 8].map((weeks) => ({ value: String(weeks), label: weeks === 1 ? "Once" : `Weekly, ${weeks} times` }))} />
                  </div>
                  {slotErrors.form ? <p role="alert" className="text-sm font-medium text-beyond">{slotErrors.form.join(" ")}</p> : null}
                  <Button type="submit" variant="secondary" className="w-full" disabled={busy}>
                    Add slot
                  </Button>
                </Form>
              ) : (
                <p className="text-sm text-ink-500">Save your profile first.</p>
              )}
              <ul className="divide-y divide-ink-100 text-sm">
                {slots.map((slot) => (
                  <li key={slot.id} className="flex items-center justify-between gap-2 py-2">
                    <span>{formatSlot(slot.startsAt, slot.endsAt)}</span>
                    {slot.booked ? (
                      <Badge tone="brass">Booked</Badge>
                    ) : (
                      <Form method="post">
                        <input type="hidden" name="intent" value="remove-slot" />
                        <input type="hidden" name="slotId" value={slot.id} />
                        <Button type="submit" variant="quiet" size="sm" aria-label={`Remove the slot ${formatSlot(slot.startsAt, slot.endsAt)}`}>
                          Remove
                        </Button>
                      </Form>
                    )}
                  </li>
                ))}
              </ul>
            </CardBody>
          </Card>

          <Card>
            <CardHeader title="Payouts" description="Your share of each fee is paid to your own account with our payment provider." />
            <CardBody className="space-y-3 text-sm text-ink-700">
              {payoutsReturned && !payouts.ready ? <p role="status">Back from set-up. If you finished it, this page updates as soon as the provider confirms.</p> : null}
              <p className={payouts.ready ? "font-semibold text-within" : "font-semibold text-ink-900"} data-testid="payout-state">
                {payouts.headline}
              </p>
              {payouts.missing.length ? (
                <div>
                  <p>Still needed:</p>
                  <ul className="mt-1 list-disc space-y-0.5 pl-5">
                    {payouts.missing.map((item) => (
                      <li key={item}>{item}</li>
                    ))}
                  </ul>
                </div>
              ) : null}
              {payouts.ready ? (
                <Link to="/inspector/earnings" className="font-semibold underline underline-offset-2">
                  Your earnings and statements
                </Link>
              ) : (
                <Form method="post" className="space-y-2">
                  <input type="hidden" name="intent" value="payouts" />
                  <Button type="submit" className="w-full" disabled={busy}>
                    {payouts.headline.startsWith("Payouts are not set up") ? "Set up payouts" : "Continue payout set-up"}
                  </Button>
                  {payoutErrors.payouts ? (
                    <p role="alert" className="text-sm font-medium text-beyond">
                      {payoutErrors.payouts.join(" ")}
                    </p>
                  ) : null}
                </Form>
              )}
            </CardBody>
          </Card>

          <Card>
            <CardHeader title="Certificate" description={documentLimitText} />
            <CardBody className="space-y-3">
              {saved?.certificateFileName ? (
                <p className="text-sm text-ink-700">
                  On file:{" "}
                  <a className="font-semibold underline underline-offset-2" href={`/inspectors/${publicId}/certificate`}>
                    {saved.certificateFileName}
                  </a>
                </p>
              ) : (
                <p className="text-sm text-ink-500">No certificate uploaded yet.</p>
              )}
              {saved ? (
                <Form method="post" encType="multipart/form-data" className="space-y-3">
                  <input type="hidden" name="intent" value="certificate" />
                  <TextField label="Certificate (PDF)" name="certificate" type="file" accept="application/pdf" errors={certificateErrors.certificate} required />
                  <Button type="submit" variant="secondary" className="w-full" disabled={busy}>
                    Upload certificate
                  </Button>
                </Form>
              ) : null}
            </CardBody>
          </Card>
          <InspectionSafetyNotice />
        </div>
      </div>
    </div>
  );
}
