import { ButtonLink, Card } from "~/components/ui";
import { SellerListingsTable } from "~/components/listings/seller-listings-table";
import { databaseContext } from "~/db/context";
import { getOptionalUser, hasRole } from "~/modules/accounts/guards.server";
import { latestBookingStatusOfListings } from "~/modules/inspections/bookings.server";
import { listSellerListings } from "~/modules/listings/service.server";
import { currentReportsForListings } from "~/modules/reports/service.server";
import type { Route } from "./+types/sell-dashboard";

export const meta: Route.MetaFunction = () => [{ title: "Sell a machine — Tenthmark" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await getOptionalUser(request);
  // Visitors and buyers see why and how to sell; sellers see their listings.
  if (!user || !(hasRole(user, "seller") || hasRole(user, "admin"))) return { seller: null, signedIn: Boolean(user), listings: [], notice: null };
  const db = context.get(databaseContext);
  const own = await listSellerListings(db, user);
  const ids = own.map((listing) => listing.id);
  const [reportsById, bookingsById] = await Promise.all([currentReportsForListings(db, ids), latestBookingStatusOfListings(db, ids)]);
  const listings = own.map((listing) => ({
    ...listing,
    grade: reportsById.get(listing.id)?.grade ?? null,
    bookingStatus: bookingsById.get(listing.id) ?? null,
  }));
  return { seller: { name: user.name, emailVerified: user.emailVerified }, signedIn: true, listings, notice: new URL(request.url).searchParams.get("notice") };
}

export default function SellDashboard({ loaderData }: Route.ComponentProps) {
  const { seller, signedIn, listings, notice } = loaderData;
  if (!seller) return <SellingExplained signedIn={signedIn} />;
  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <p className="text-sm font-bold uppercase tracking-wide text-brass-600">Sell a machine</p>
          <h1 className="mt-1 text-3xl font-extrabold text-ink-900">Your listings</h1>
        </div>
        <ButtonLink to="/sell/new" size="lg">
          New listing
        </ButtonLink>
      </div>
      {notice === "deleted" ? (
        <p role="status" className="mt-6 rounded-control border border-within/30 bg-within-soft px-4 py-3 text-sm font-medium text-within">
          The draft and its files were deleted.
        </p>
      ) : null}
      {!seller.emailVerified ? (
        <p className="mt-6 rounded-control border border-caution/30 bg-caution-soft px-4 py-3 text-sm text-ink-800">
          Confirm your e-mail address (see the link we sent you) before you create or change a listing.
        </p>
      ) : null}
      <div className="mt-8">
        {listings.length ? (
          <SellerListingsTable rows={listings} />
        ) : (
          <Card className="p-8 text-center">
            <h2 className="text-lg font-bold text-ink-900">No listings yet</h2>
            <p className="mx-auto mt-2 max-w-md text-ink-600">
              Start with the machine's make, model and sizes; add photos next. A draft stays private until you publish it.
            </p>
            <ButtonLink to="/sell/new" className="mt-6">
              List your first machine
            </ButtonLink>
          </Card>
        )}
      </div>
    </div>
  );
}

function SellingExplained({ signedIn }: { signedIn: boolean }) {
  const steps = [
    ["Describe the machine", "Make, model, sizes in mm or inches, condition, what tooling comes with it."],
    ["Add photos and documents", "Straight from your phone or camera; we make thumbnails and strip location data."],
    ["Publish and book an inspection", "A certified inspector's scored report tells buyers how true the machine runs."],
  ];
  return (
    <div className="mx-auto max-w-4xl px-4 py-14 sm:px-6">
      <p className="text-sm font-bold uppercase tracking-wide text-brass-600">Sell a machine</p>
      <h1 className="mt-1 text-3xl font-extrabold text-ink-900">List a machine on Tenthmark</h1>
      <p className="mt-3 max-w-2xl text-lg text-ink-600">
        Dealers and private owners list used machine tools here, and can prove their condition with an on-site geometry report.
      </p>
      <ol className="mt-10 grid gap-5 md:grid-cols-3">
        {steps.map(([title, body], index) => (
          <li key={title}>
            <Card className="h-full p-5">
              <p className="text-sm font-bold text-brass-600">Step {index + 1}</p>
              <h2 className="mt-1 font-bold text-ink-900">{title}</h2>
              <p className="mt-2 text-sm text-ink-600">{body}</p>
            </Card>
          </li>
        ))}
      </ol>
      <div className="mt-10 flex flex-wrap gap-3">
        {signedIn ? (
          <>
            <p className="w-full text-ink-700">Your account is not a seller's account yet. Add selling to it on your account page.</p>
            <ButtonLink to="/account">Open your account</ButtonLink>
          </>
        ) : (
          <>
            <ButtonLink to="/sign-up?role=seller&redirectTo=%2Fsell" size="lg">
              Create a seller account
            </ButtonLink>
            <ButtonLink to="/sign-in?redirectTo=%2Fsell" variant="secondary" size="lg">
              Sign in
            </ButtonLink>
          </>
        )}
      </div>
    </div>
  );
}
