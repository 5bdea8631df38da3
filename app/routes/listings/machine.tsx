import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { lazy, Suspense } from "react";
import { data, Form, Link, useNavigation } from "react-router";
import { isbot } from "isbot";
import { z } from "zod";
import { PhotoGallery } from "~/components/listings/photo-gallery";
import { StatusBadge } from "~/components/listings/status-badge";
import type { InquiryConstraint } from "~/components/listings/inquiry-form";
import { Badge, Button, ButtonLink, Card, CardBody, CardHeader } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { getOptionalUser, requireUser, requireVerifiedUser } from "~/modules/accounts/guards.server";
import { countryName, isLathe, labelOf, machineCategories, machineConditions } from "~/modules/listings/catalogue";
import { getPublicListing, ListingRuleError, sendInquiry, setWatch } from "~/modules/listings/service.server";
import { countListingView } from "~/modules/listings/views.server";
import { inquiryFormSchema } from "~/modules/listings/validation";
import { MachineHistorySection } from "~/components/machines/machine-history";
import { RebuildSection } from "~/components/rebuilds/rebuild-panel";
import { machineHistory } from "~/modules/machines/service.server";
import { publicRebuildForListing } from "~/modules/rebuilds/service.server";
import { VerifiedAccuracyPanel } from "~/modules/reports/components/listing-accuracy";
import { currentReportForListing, type ListingReportSummary } from "~/modules/reports/service.server";
import { formatLength, formatMoney, type DisplayUnits } from "~/modules/units/format";
import { formatFootprint, formatSpeedRange, formatSupply, formatThreadRange } from "~/modules/units/machine-specs";
import { formatPower, formatWeight } from "~/modules/units/weight-power";
import type { Route } from "./+types/machine";

// Only a signed-in visitor gets the question form, so only they download it (and Conform with it).
const InquiryForm = lazy(() => import("~/components/listings/inquiry-form").then((module) => ({ default: module.InquiryForm })));

export const meta: Route.MetaFunction = ({ data }) =>
  data
    ? [
        { title: `${data.listing.title}, ${labelOf(machineCategories, data.listing.category).toLowerCase()} — Tenthmark` },
        { name: "description", content: data.listing.description.slice(0, 160) },
      ]
    : [{ title: "Machine not found — Tenthmark" }];

// Rendered once per version of its data for visitors without a session (app/modules/http/rendered-pages.server.ts).
export const handle = { keepRendered: true };

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const viewer = await getOptionalUser(request);
  const found = await getPublicListing(context.get(databaseContext), params.slug, viewer);
  if (!found) throw data("There is no machine at this address. It may have been withdrawn, or the link mistyped.", { status: 404 });
  // Counted in memory and written in batches: the page waits for no write.
  if (isNewView(request) && found.listing.status === "published" && !found.isOwner) countListingView(found.listing.id);
  const db = context.get(databaseContext);
  // Independent reads: sent together rather than one after another.
  const [accuracy, rebuild, history] = await Promise.all([
    currentReportForListing(db, found.listing.id),
    publicRebuildForListing(db, found.listing.id),
    machineHistory(db, found.listing.id),
  ]);
  // The question form's limits are read from its schema here, so that the page's script carries no schema.
  const inquiryConstraint: InquiryConstraint | null = viewer ? getZodConstraint(inquiryFormSchema) : null;
  // The page reads the clock by the day only (a report's age in months, by UTC dates): the start of today
  // makes the same page as the moment of the request, and keeps one rendering for the whole day.
  const today = `${new Date().toISOString().slice(0, 10)}T00:00:00.000Z`;
  return { ...found, accuracy, rebuild, history, now: today, units: (viewer?.displayUnits ?? "mm") as DisplayUnits, signedIn: Boolean(viewer), inquiryConstraint };
}

/** A person's arrival at the page: not a robot, and not this page reloaded or revalidated after its own forms. */
function isNewView(request: Request) {
  const userAgent = request.headers.get("user-agent") ?? "";
  if (!userAgent || isbot(userAgent)) return false;
  const referer = URL.parse(request.headers.get("referer") ?? "");
  const here = new URL(request.url);
  return !(referer && referer.origin === here.origin && referer.pathname === here.pathname.replace(/\.data$/, ""));
}

const otherIntents = z.object({ intent: z.enum(["watch", "unwatch"]), listingId: z.uuid() });

export async function action({ request, context }: Route.ActionArgs) {
  const db = context.get(databaseContext);
  const formData = await request.formData();
  if (formData.get("intent") === "inquire") {
    const sender = await requireVerifiedUser(request);
    const submission = parseWithZod(formData, { schema: inquiryFormSchema });
    const listingId = z.uuid().safeParse(formData.get("listingId"));
    if (submission.status !== "success" || !listingId.success) {
      const formErrors = listingId.success ? undefined : ["This question names no listing. Reload the page and ask again."];
      return data({ inquiry: submission.reply({ formErrors }), sent: false }, { status: 422 });
    }
    try {
      await sendInquiry(db, sender, listingId.data, submission.value);
    } catch (error) {
      if (error instanceof ListingRuleError) return data({ inquiry: submission.reply({ formErrors: [error.message] }), sent: false }, { status: 422 });
      throw error;
    }
    return { inquiry: submission.reply({ resetForm: true }), sent: true };
  }
  const viewer = await requireUser(request);
  const parsed = otherIntents.safeParse(Object.fromEntries(formData));
  if (!parsed.success) throw data("That request was not understood.", { status: 400 });
  try {
    await setWatch(db, viewer, parsed.data.listingId, parsed.data.intent === "watch");
  } catch (error) {
    if (error instanceof ListingRuleError) throw data(error.message, { status: 422 });
    throw error;
  }
  return { inquiry: null, sent: false };
}

export default function MachinePage({ loaderData }: Route.ComponentProps) {
  const { listing, photos, documents, sellerName, isManager, isOwner, isWatching, units, signedIn } = loaderData;
  const place = [listing.city, listing.region, countryName(listing.country)].filter(Boolean).join(", ");
  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6">
      {isManager && listing.status !== "published" ? (
        <p className="mb-6 rounded-control border border-caution/30 bg-caution-soft px-4 py-3 text-sm text-ink-800">
          {listing.status === "sold" ? "This listing is sold." : "Preview: only you can see this page until the listing is published."}
        </p>
      ) : null}

      <nav aria-label="Breadcrumb" className="text-sm text-ink-500">
        <Link to="/machines" className="font-semibold hover:text-ink-900">
          Machines
        </Link>{" "}
        / {labelOf(machineCategories, listing.category)}
      </nav>

      {/* Phone order: title and price, photos and specification, then accuracy and the question form. */}
      <div className="mt-4 grid items-start gap-8 lg:grid-cols-[minmax(0,1fr)_24rem] lg:grid-rows-[auto_auto_1fr]">
        <div className="lg:col-start-2 lg:row-start-1">
          <p className="text-sm font-bold uppercase tracking-wide text-brass-600">
            {labelOf(machineCategories, listing.category)}
            {listing.year ? ` · ${listing.year}` : ""}
          </p>
          <h1 className="mt-1 text-3xl font-extrabold leading-tight text-ink-950">{listing.title}</h1>
          <p className="mt-2 text-ink-600">{place}</p>
          <div className="mt-4 flex flex-wrap items-center gap-3">
            <p className="text-2xl font-extrabold text-ink-900 tabular">{formatMoney(listing.priceMinor, listing.currency)}</p>
            <Badge>{labelOf(machineConditions, listing.condition)}</Badge>
            {loaderData.accuracy ? <Badge tone="within">Verified · grade {loaderData.accuracy.grade}</Badge> : <Badge tone="caution">Not yet verified</Badge>}
            {listing.status !== "published" ? <StatusBadge status={listing.status} /> : null}
          </div>
          <p className="mt-1 text-sm text-ink-500">
            Offered by{" "}
            {loaderData.sellerPageId ? (
              <Link to={`/sellers/${loaderData.sellerPageId}`} className="font-semibold text-ink-800 underline underline-offset-2">
                {sellerName}
              </Link>
            ) : (
              sellerName
            )}
          </p>
          {isOwner ? (
            <ButtonLink to={`/sell/listings/${listing.id}`} variant="secondary" size="sm" className="mt-4" data-testid="edit-own-listing">
              Edit
            </ButtonLink>
          ) : null}
          {listing.status === "published" && !isManager ? (
            <WatchButton listingId={listing.id} isWatching={isWatching} signedIn={signedIn} />
          ) : null}
        </div>

        <div className="min-w-0 space-y-8 lg:col-start-1 lg:row-span-3 lg:row-start-1">
          <PhotoGallery photos={photos} title={listing.title} />

          <section aria-labelledby="specification">
            <h2 id="specification" className="text-xl font-bold text-ink-900">
              Specification
            </h2>
            <SpecificationTable listing={listing} units={units} />
          </section>

          <section aria-labelledby="description">
            <h2 id="description" className="text-xl font-bold text-ink-900">
              Description
            </h2>
            <p className="mt-3 whitespace-pre-line text-ink-700">{listing.description}</p>
            {listing.toolingIncluded ? (
              <>
                <h3 className="mt-6 font-bold text-ink-900">Tooling included</h3>
                <p className="mt-2 whitespace-pre-line text-ink-700">{listing.toolingIncluded}</p>
              </>
            ) : null}
          </section>

          {documents.length ? (
            <section aria-labelledby="documents">
              <h2 id="documents" className="text-xl font-bold text-ink-900">
                Documents
              </h2>
              <ul className="mt-3 divide-y divide-ink-100 rounded-panel border border-ink-200 bg-white">
                {documents.map((document) => (
                  <li key={document.id} className="flex items-center justify-between gap-3 px-4 py-3 text-sm">
                    <a href={document.url} target="_blank" rel="noreferrer" className="font-semibold text-ink-900 underline underline-offset-2">
                      {document.title}
                    </a>
                    <span className="text-ink-500">PDF, {document.size}</span>
                  </li>
                ))}
              </ul>
            </section>
          ) : null}

          <RebuildSection rebuild={loaderData.rebuild} units={units} manageUrl={isManager ? `/sell/listings/${listing.id}/rebuild` : null} />

          <MachineHistorySection history={loaderData.history} units={units} />
        </div>

        <aside className="space-y-6 lg:col-start-2 lg:row-start-2">
          <AccuracyPanel slug={listing.slug} category={listing.category} report={loaderData.accuracy} units={units} now={loaderData.now} />

          {listing.status === "published" && !isManager ? <InquiryCard listingId={listing.id} sellerName={sellerName} constraint={loaderData.inquiryConstraint} /> : null}
        </aside>
      </div>
    </div>
  );
}

function SpecificationTable({ listing, units }: { listing: Route.ComponentProps["loaderData"]["listing"]; units: DisplayUnits }) {
  const lathe = isLathe(listing.category);
  // Rows every listing has say "not given" when empty; the trade's finer figures appear only when the seller gave them.
  const optional = (term: string, value: string | null): Array<[string, string | null]> => (value ? [[term, value]] : []);
  // Swing and distance between centres size a lathe: "not given" there, left off other machines unless given.
  const latheSize = (term: string, mm: number | null): Array<[string, string | null]> => {
    const value = mm ? formatLength(mm, units) : null;
    return lathe ? [[term, value]] : optional(term, value);
  };
  const rows: Array<[string, string | null]> = [
    ["Kind of machine", labelOf(machineCategories, listing.category)],
    ["Make", listing.make],
    ["Model", listing.model],
    ["Year of manufacture", listing.year ? String(listing.year) : null],
    ["Serial number", listing.serialNumber],
    ...latheSize("Swing over bed", listing.swingOverBedMm),
    ...(lathe ? optional("Swing over the cross-slide", listing.swingOverCrossSlideMm ? formatLength(listing.swingOverCrossSlideMm, units) : null) : []),
    ...latheSize("Distance between centres", listing.distanceBetweenCentresMm),
    ["Spindle bore", listing.spindleBoreMm ? formatLength(listing.spindleBoreMm, units) : null],
    ...(listing.tableLengthMm ? [["Table", `${formatLength(listing.tableLengthMm, units)}${listing.tableWidthMm ? ` × ${formatLength(listing.tableWidthMm, units)}` : ""}`] as [string, string]] : []),
    ["Spindle nose", listing.spindleNose],
    ...optional("Spindle speeds", formatSpeedRange(listing.spindleSpeedMinRpm, listing.spindleSpeedMaxRpm)),
    ...(lathe ? optional("Tailstock taper", listing.tailstockTaper) : []),
    ...(lathe ? optional("Thread cutting", formatThreadRange(listing, units)) : []),
    ["Main motor", listing.motorPowerKw ? formatPower(listing.motorPowerKw, units) : null],
    ["Electrical supply", formatSupply(listing)],
    ["Weight", listing.weightKg ? formatWeight(listing.weightKg, units) : null],
    ...optional("Footprint (length × width)", formatFootprint(listing.footprintLengthMm, listing.footprintWidthMm, units)),
    ["Condition", labelOf(machineConditions, listing.condition)],
  ];
  return (
    <dl className="mt-3 divide-y divide-ink-100 rounded-panel border border-ink-200 bg-white text-sm">
      {rows.map(([term, value]) => (
        <div key={term} className="grid grid-cols-[11rem_1fr] gap-4 px-4 py-2.5 sm:grid-cols-[14rem_1fr]">
          <dt className="font-semibold text-ink-600">{term}</dt>
          <dd className={value ? "text-ink-900 tabular" : "text-ink-400"}>{value ?? "not given"}</dd>
        </div>
      ))}
    </dl>
  );
}

function AccuracyPanel({ slug, category, report, units, now }: { slug: string; category: string; report: ListingReportSummary | null; units: DisplayUnits; now: string }) {
  if (report) return <VerifiedAccuracyPanel report={report} units={units} now={new Date(now)} bookingLink={`/machines/${slug}/book`} category={category} />;
  return (
    <Card id="accuracy" className="border-caution/40">
      <CardHeader title="Accuracy" action={<Badge tone="caution">Not yet verified</Badge>} />
      <CardBody className="space-y-3 text-sm text-ink-700">
        <p>
          No certified inspector has measured this machine yet. An on-site check reads spindle run-out, axial slip, spindle-axis parallelism,
          bed straightness and centre height, and scores each against the tolerance for a machine of this size.
        </p>
        <ButtonLink to={`/machines/${slug}/book`} variant="secondary" className="w-full">
          Book an inspection
        </ButtonLink>
        <p className="text-xs text-ink-500">
          A certified inspector serving this region checks it on site; the fee and refund rules are shown before you pay.{" "}
          <Link to="/how-scoring-works" className="underline underline-offset-2">
            How scoring works
          </Link>
        </p>
      </CardBody>
    </Card>
  );
}

function WatchButton({ listingId, isWatching, signedIn }: { listingId: string; isWatching: boolean; signedIn: boolean }) {
  const navigation = useNavigation();
  if (!signedIn) {
    return (
      <p className="mt-4 text-sm text-ink-600">
        <Link to="/sign-in" className="font-semibold underline underline-offset-2">
          Sign in
        </Link>{" "}
        to watch this machine or write to the seller.
      </p>
    );
  }
  return (
    <Form method="post" className="mt-4" preventScrollReset>
      <input type="hidden" name="listingId" value={listingId} />
      <Button type="submit" name="intent" value={isWatching ? "unwatch" : "watch"} variant="secondary" disabled={navigation.state === "submitting"}>
        {isWatching ? "★ Watching — stop" : "☆ Watch this machine"}
      </Button>
      {isWatching ? (
        <p className="mt-2 text-sm text-ink-600">
          We e-mail you once a day at most if its price drops, it is verified, or it is sold or withdrawn.{" "}
          <Link to="/account/watched" className="font-semibold underline underline-offset-2">
            Watched machines
          </Link>
        </p>
      ) : null}
    </Form>
  );
}

function InquiryCard({ listingId, sellerName, constraint }: { listingId: string; sellerName: string; constraint: InquiryConstraint | null }) {
  return (
    <Card id="ask">
      <CardHeader title="Ask the seller" description={`Your message goes to ${sellerName} by e-mail; replies come to your address.`} />
      <CardBody>
        {constraint ? (
          <Suspense fallback={null}>
            <InquiryForm listingId={listingId} constraint={constraint} />
          </Suspense>
        ) : (
          <p className="text-sm text-ink-600">Sign in to write to the seller.</p>
        )}
      </CardBody>
    </Card>
  );
}
