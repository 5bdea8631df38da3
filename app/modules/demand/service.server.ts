// Demand for inspectors where none serves yet. A buyer or seller on a machine's booking page asks for one;
// the request is kept (one per person and region), certified inspectors working in that country hear of the
// region's first request, staff see the open demand by region, and the requesters are e-mailed as soon as
// an inspector adds the region to their profile.
import { and, count, desc, eq, isNull, max, min, sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { env } from "~/env.server";
import type { SessionUser } from "~/modules/accounts/guards.server";
import { user } from "~/modules/accounts/schema";
import { eligibleInspectors, findListingBySlug, listCertifiedInspectors, regionMatches } from "~/modules/inspections/profiles.server";
import { countryName } from "~/modules/listings/catalogue";
import { listings } from "~/modules/listings/schema";
import { queueEmail } from "~/modules/mail/mail.server";
import { renderEmail } from "~/modules/mail/render.server";
import { InspectorNowServesEmail, InspectorWantedEmail } from "./emails";
import { inspectorRequests } from "./schema";

/** Open requests one person may hold at once: enough for a buyer comparing machines across a country. */
export const OPEN_REQUESTS_PER_PERSON = 20;
/** At most this many inspectors are told of one region's first request. */
const INSPECTORS_TOLD = 50;

export class InspectorRequestRuleError extends Error {
  override name = "InspectorRequestRuleError";
}

const placeOf = (request: { region: string; country: string }) => `${request.region}, ${countryName(request.country)}`;

/** The region a machine's request is for: its region, or its town when the listing names none. */
function regionOf(listing: { region: string | null; city: string }) {
  return (listing.region?.trim() || listing.city.trim()).slice(0, 100);
}

/** Whether the viewer has asked for an inspector in this listing's region (for the booking page). */
export async function inspectorRequestFor(db: Database, viewerId: string, listing: { region: string | null; city: string; country: string }) {
  const [row] = await db
    .select({ createdAt: inspectorRequests.createdAt, servedAt: inspectorRequests.servedAt })
    .from(inspectorRequests)
    .where(
      and(
        eq(inspectorRequests.userId, viewerId),
        eq(inspectorRequests.country, listing.country),
        sql`lower(${inspectorRequests.region}) = lower(${regionOf(listing)})`,
      ),
    );
  return row ? { askedOn: row.createdAt.toISOString().slice(0, 10), served: row.servedAt !== null } : null;
}

/**
 * Records the viewer's request for an inspector in the region of the machine at `slug`. Asking twice for
 * one region keeps the first request. Refused when an inspector serves the machine already.
 */
export async function requestInspector(db: Database, requester: SessionUser, slug: string): Promise<{ recorded: boolean }> {
  const listing = await findListingBySlug(db, slug);
  if (!listing || (listing.status !== "published" && listing.sellerId !== requester.id)) {
    throw new InspectorRequestRuleError("There is no such machine, or it is not offered any more.");
  }
  if ((await eligibleInspectors(db, listing, requester.id)).length) {
    throw new InspectorRequestRuleError("A certified inspector serves this machine's region now: choose one below.");
  }
  const region = regionOf(listing);
  const origin = env().APP_ORIGIN;
  const first = await db.transaction(async (tx) => {
    // Serialises one person's requests, so the limit holds with two tabs.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`inspector-requests:${requester.id}`}))`);
    const [{ open }] = await tx
      .select({ open: count() })
      .from(inspectorRequests)
      .where(and(eq(inspectorRequests.userId, requester.id), isNull(inspectorRequests.servedAt)));
    const inserted = await tx
      .insert(inspectorRequests)
      .values({ userId: requester.id, country: listing.country, region, listingId: listing.id })
      .onConflictDoNothing()
      .returning({ id: inspectorRequests.id });
    if (!inserted.length) return null;
    if (open >= OPEN_REQUESTS_PER_PERSON) {
      throw new InspectorRequestRuleError(`You have ${OPEN_REQUESTS_PER_PERSON} open requests for inspectors already; we will write as regions are served.`);
    }
    // Inspectors hear of a region once: on its first open request.
    const [{ asking }] = await tx
      .select({ asking: count() })
      .from(inspectorRequests)
      .where(and(eq(inspectorRequests.country, listing.country), sql`lower(${inspectorRequests.region}) = lower(${region})`, isNull(inspectorRequests.servedAt)));
    return asking === 1;
  });
  if (first === null) return { recorded: false };
  if (first) {
    const inspectors = await inspectorsInCountry(db, listing.country);
    const { html, text } = await renderEmail(
      InspectorWantedEmail({ place: placeOf({ region, country: listing.country }), machine: `${listing.make} ${listing.model}`.trim(), profileUrl: `${origin}/inspector/profile` }),
    );
    for (const inspector of inspectors.slice(0, INSPECTORS_TOLD)) {
      await queueEmail({ to: inspector.email, subject: `Inspector wanted in ${placeOf({ region, country: listing.country })}`, html, text, tag: "inspector-wanted" });
    }
  }
  return { recorded: true };
}

/**
 * Certified inspectors who work in a country: one of their regions names the country, or a region or town
 * of a machine listed there.
 */
async function inspectorsInCountry(db: Database, country: string) {
  const places = await db
    .selectDistinct({ region: listings.region, city: listings.city })
    .from(listings)
    .where(eq(listings.country, country))
    .limit(2000);
  const certified = await listCertifiedInspectors(db);
  const inCountry = certified.filter(
    (inspector) =>
      regionMatches(inspector.regions, { region: null, country, city: "" }) ||
      places.some((place) => regionMatches(inspector.regions, { region: place.region, country: "", city: place.city })),
  );
  if (!inCountry.length) return [];
  const emails = await db
    .select({ id: user.id, email: user.email })
    .from(user)
    .where(sql`${user.id} in (${sql.join(
      inCountry.map((inspector) => sql`${inspector.userId}`),
      sql`, `,
    )})`);
  return emails;
}

/** Open demand by region, most asked first, for staff. */
export async function openDemandByRegion(db: Database) {
  const rows = await db
    .select({
      country: inspectorRequests.country,
      region: min(inspectorRequests.region),
      requests: count(),
      firstAsked: min(inspectorRequests.createdAt),
      lastAsked: max(inspectorRequests.createdAt),
    })
    .from(inspectorRequests)
    .where(isNull(inspectorRequests.servedAt))
    .groupBy(inspectorRequests.country, sql`lower(${inspectorRequests.region})`)
    .orderBy(desc(count()), desc(max(inspectorRequests.createdAt)))
    .limit(500);
  return rows.map((row) => ({
    country: countryName(row.country),
    region: row.region ?? "",
    requests: row.requests,
    firstAsked: row.firstAsked ? new Date(row.firstAsked).toISOString().slice(0, 10) : "",
    lastAsked: row.lastAsked ? new Date(row.lastAsked).toISOString().slice(0, 10) : "",
  }));
}

/**
 * Called where an inspector's regions change: the open requests the inspector (if certified) now serves are
 * closed, and each requester is e-mailed once, with a link to book when the machine is still offered.
 */
export async function answerInspectorRequests(db: Database, inspectorUserId: string): Promise<number> {
  const inspector = (await listCertifiedInspectors(db)).find((each) => each.userId === inspectorUserId);
  if (!inspector || !inspector.regions.length) return 0;
  const open = await db
    .select({
      id: inspectorRequests.id,
      region: inspectorRequests.region,
      country: inspectorRequests.country,
      email: user.email,
      slug: listings.slug,
      status: listings.status,
    })
    .from(inspectorRequests)
    .innerJoin(user, eq(user.id, inspectorRequests.userId))
    .leftJoin(listings, eq(listings.id, inspectorRequests.listingId))
    .where(isNull(inspectorRequests.servedAt))
    .limit(5000);
  const served = open.filter((request) => regionMatches(inspector.regions, { region: request.region, country: request.country, city: request.region }));
  const origin = env().APP_ORIGIN;
  let told = 0;
  for (const request of served) {
    const place = placeOf(request);
    const { html, text } = await renderEmail(
      InspectorNowServesEmail({ place, bookUrl: request.slug && request.status === "published" ? `${origin}/machines/${request.slug}/book` : null }),
    );
    await db.transaction(async (tx) => {
      const closed = await tx
        .update(inspectorRequests)
        .set({ servedAt: new Date() })
        .where(and(eq(inspectorRequests.id, request.id), isNull(inspectorRequests.servedAt)))
        .returning({ id: inspectorRequests.id });
      // Closed and queued together: a requester hears of it once, even with two saves at once.
      if (closed.length) await queueEmail({ to: request.email, subject: `An inspector now serves ${place}`, html, text, tag: "inspector-now-serves" }, { within: tx });
    });
    told += 1;
  }
  return told;
}
