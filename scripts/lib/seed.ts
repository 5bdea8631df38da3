// Demo data for `npm start` on an empty database. It is an invented scenario: invented dealers, makes,
// people and places. The scenario lives in app/demo/ (one file per part), called in story order; every row is
// written through the domains' functions (bookings paid on the payments stand-in, reports scored by the
// engine and signed), so the demo shows what the product itself writes.
//
// Dates are relative to the moment of seeding (whole days back from midnight UTC), not to a fixed calendar
// date: the product judges report age, slot times, checkout expiry and refund notice against the real
// clock, so a fixed date would leave every report expired and every slot in the past a year from now.
import { log } from "./output.ts";

export type DemoSignIn = {
  role: string;
  name: string;
  email: string;
  password: string;
  /** One account per role is printed by `npm start`; the README lists them all. */
  printed: boolean;
};

type DemoAccount = {
  key: string;
  role: string;
  name: string;
  email: string;
  password: string;
  roles: readonly ("admin" | "seller" | "inspector")[];
  inspectorStatus?: "pending";
  displayUnits?: "mm" | "inch";
  printed?: true;
};

// Other domains find their people here by `key` (e.g. a dealer's listings) through `demoAccountId(key)`.
export const demoAccounts = [
  { key: "admin", role: "admin", name: "Maren Tolvstad (staff)", email: "staff@example.test", password: "demo-staff-4471", roles: ["admin"], printed: true },
  // A second staff member: a tolerance profile drafted by one is published by the other (four eyes).
  { key: "reviewer", role: "admin (second staff)", name: "Edvin Saltholm (staff)", email: "staff.review@example.test", password: "demo-review-4471", roles: ["admin"] },
  { key: "dealer", role: "seller (dealer)", name: "Kessling & Daughters Machine Tools", email: "dealer@example.test", password: "demo-dealer-4471", roles: ["seller"], printed: true },
  { key: "buyer", role: "buyer", name: "Ilse Varga", email: "buyer@example.test", password: "demo-buyer-4471", roles: [], printed: true },
  { key: "inspector", role: "inspector", name: "Tobiah Renner", email: "inspector@example.test", password: "demo-inspector-4471", roles: ["inspector"], printed: true },
  { key: "applicant", role: "applicant", name: "Corvin Aldane", email: "applicant@example.test", password: "demo-applicant-4471", roles: [], inspectorStatus: "pending", printed: true },
  { key: "brandmoor", role: "seller (dealer)", name: "Brandmoor Used Machinery Ltd", email: "brandmoor.sales@example.test", password: "demo-brandmoor-4471", roles: ["seller"], displayUnits: "inch" },
  { key: "vernois", role: "seller (dealer)", name: "Atelier Vernois Machines-Outils", email: "atelier.vernois@example.test", password: "demo-vernois-4471", roles: ["seller"] },
  { key: "hollerbeck", role: "seller (dealer)", name: "Hollerbeck Maschinenhandel GmbH", email: "hollerbeck@example.test", password: "demo-hollerbeck-4471", roles: ["seller"] },
  { key: "rietmolen", role: "seller (dealer)", name: "Rietmolen Machinehandel B.V.", email: "rietmolen@example.test", password: "demo-rietmolen-4471", roles: ["seller"] },
  { key: "private", role: "seller (private)", name: "Per Åslund", email: "per.aslund@example.test", password: "demo-private-4471", roles: ["seller"] },
  { key: "mirelle", role: "inspector", name: "Agathe Mirelle", email: "agathe.mirelle@example.test", password: "demo-mirelle-4471", roles: ["inspector"] },
  { key: "beckstrand", role: "inspector", name: "Jorun Beckstrand", email: "jorun.beckstrand@example.test", password: "demo-beckstrand-4471", roles: ["inspector"] },
  { key: "rafe", role: "buyer", name: "Rafe Dunmore", email: "rafe.dunmore@example.test", password: "demo-rafe-4471", roles: [], displayUnits: "inch" },
  { key: "greta", role: "buyer", name: "Greta Solvang", email: "greta.solvang@example.test", password: "demo-greta-4471", roles: [] },
] as const satisfies readonly DemoAccount[];

export type DemoAccountKey = (typeof demoAccounts)[number]["key"];

/** Every demo sign-in, the printed ones (one per role) first. */
export function demoSignIns(): DemoSignIn[] {
  return demoAccounts
    .map((account) => ({ role: account.role, name: account.name, email: account.email, password: account.password, printed: "printed" in account }))
    .sort((a, b) => Number(b.printed) - Number(a.printed));
}

/** The user id of a demo account (after seeding). */
export async function demoAccountId(key: DemoAccountKey): Promise<string> {
  const { findUserIdByEmail } = await import("../../app/modules/accounts/service.server.ts");
  const account = demoAccounts.find((candidate) => candidate.key === key)!;
  const id = await findUserIdByEmail(account.email);
  if (!id) throw new Error(`demo account ${account.email} is missing`);
  return id;
}

type Person = { id: string; email: string; name: string };

async function seedDemoAccounts(): Promise<Record<DemoAccountKey, Person>> {
  // Loaded here, not at the top, so that listing the sign-ins needs no database.
  const { createAccount } = await import("../../app/modules/accounts/service.server.ts");
  const people = {} as Record<DemoAccountKey, Person>;
  for (const account of demoAccounts) {
    const { id } = await createAccount({
      name: account.name,
      email: account.email,
      password: account.password,
      verified: true,
      roles: [...account.roles],
      inspectorStatus: "inspectorStatus" in account ? account.inspectorStatus : undefined,
      displayUnits: "displayUnits" in account ? account.displayUnits : "mm",
    });
    people[account.key] = { id, email: account.email, name: account.name };
  }
  return people;
}

/** A demo person as a signed-in session would see them, for the services that take one. */
function sessionOf(person: Person, roles: Array<"admin" | "seller" | "inspector"> = []) {
  return { ...person, emailVerified: true, roles, displayUnits: "mm" as const, inspectorStatus: "none" as const };
}

// The demo buyer's saved searches: what a buyer of a used lathe would keep (query strings as the search page writes them).
const demoSavedSearches = [
  { name: "Verified centre lathes, spindle run-out ≤ 5 µm", queryString: "category=centre_lathe&verified=1&runoutMax=5" },
  { name: "Toolroom lathes graded A or B", queryString: "category=toolroom_lathe&grade=A&grade=B" },
  { name: "Centre lathes in the UK under £10,000", queryString: "category=centre_lathe&country=GB&currency=GBP&priceMax=10000" },
  { name: "Axial slip ≤ 3 µm, report under six months", queryString: "verified=1&axialSlipMax=3&reportAgeMax=183", alerts: false },
];

async function seedDemoWatchesAndSearches(people: Record<DemoAccountKey, Person>) {
  const { getDatabase } = await import("../../app/db/client.server.ts");
  const { listings } = await import("../../app/modules/listings/schema.ts");
  const { sendInquiry, setWatch } = await import("../../app/modules/listings/service.server.ts");
  const { saveSearch, setSavedSearchAlerts } = await import("../../app/modules/search/saved-searches/service.server.ts");
  const { inArray } = await import("drizzle-orm");
  const db = getDatabase();
  const buyer = sessionOf(people.buyer);
  const rows = await db.select({ id: listings.id, model: listings.model }).from(listings).where(inArray(listings.model, ["KD 320", "VH 6 Toolroom", "Series 14 x 40", "L 360 Universal"]));
  const byModel = new Map(rows.map((row) => [row.model, row.id]));
  for (const model of ["KD 320", "VH 6 Toolroom", "Series 14 x 40"]) await setWatch(db, buyer, byModel.get(model)!, true);
  await sendInquiry(db, buyer, byModel.get("L 360 Universal")!, {
    message: "Good afternoon. Could the lathe be shown cutting on a Saturday morning, and would you load it onto a flatbed with a tail lift? I would collect from Falkenmoor myself.",
  });
  for (const search of demoSavedSearches) {
    const saved = await saveSearch(db, buyer, search);
    if (search.alerts === false) await setSavedSearchAlerts(db, buyer, saved!.id, false);
  }
  return demoSavedSearches.length;
}

/**
 * Loads the demo scenario when the database has no accounts yet; otherwise leaves it alone (a database
 * someone has used is never topped up). The app's modules read DATABASE_URL and the stand-ins' variables,
 * which `npm start` sets before calling this. Returns false when the database was not empty.
 */
export async function seedDemoDataIfEmpty(_databaseUrl: string): Promise<boolean> {
  const { getDatabase } = await import("../../app/db/client.server.ts");
  const { user } = await import("../../app/modules/accounts/schema.ts");
  const { count } = await import("drizzle-orm");
  const db = getDatabase();
  const [{ accounts }] = await db.select({ accounts: count() }).from(user);
  if (accounts > 0) {
    log("postgres", `the database has ${accounts} account(s): demo data not loaded (delete the data folder to start over with it)`);
    return false;
  }
  const started = Date.now();
  const took = (since: number) => `${((Date.now() - since) / 1000).toFixed(1)} s`;
  const now = new Date();

  let step = Date.now();
  const people = await seedDemoAccounts();
  log("postgres", `demo accounts ready (${demoAccounts.length}) in ${took(step)}`);

  step = Date.now();
  const { seedDemoListings } = await import("../../app/demo/listings.server.ts");
  const written = await seedDemoListings(
    { dealer: people.dealer.id, brandmoor: people.brandmoor.id, vernois: people.vernois.id, hollerbeck: people.hollerbeck.id, rietmolen: people.rietmolen.id, private: people.private.id },
    now,
  );
  log("postgres", `demo listings written (${written}, with photos) in ${took(step)}`);

  step = Date.now();
  const { seedDemoInspections } = await import("../../app/demo/inspections.server.ts");
  const inspectors = { renner: people.inspector, mirelle: people.mirelle, beckstrand: people.beckstrand };
  const inspections = await seedDemoInspections(inspectors, { buyer: people.buyer, otherBuyers: [people.rafe, people.greta] }, now);
  log("postgres", `demo inspector profiles and bookings written (${inspections.bookings}: ${inspections.states.join(", ")}) in ${took(step)}`);

  step = Date.now();
  const { seedDemoReports } = await import("../../app/demo/reports.server.ts");
  const bookers = {
    buyer: people.buyer,
    rafe: people.rafe,
    greta: people.greta,
    dealer: people.dealer,
    brandmoor: people.brandmoor,
    vernois: people.vernois,
    hollerbeck: people.hollerbeck,
    rietmolen: people.rietmolen,
  };
  let reports = await seedDemoReports({ inspectors, bookers }, "archive", now);
  // The saved searches come before the newest report, so that its signing owes the buyer an alert.
  const searches = await seedDemoWatchesAndSearches(people);
  reports += await seedDemoReports({ inspectors, bookers }, "fresh", now);
  log("postgres", `demo accuracy reports signed (${reports}, one corrected) and ${searches} saved searches in ${took(step)}`);

  step = Date.now();
  const { seedDemoRebuild } = await import("../../app/demo/rebuilds.server.ts");
  await seedDemoRebuild(people.dealer, now);
  log("postgres", `demo rebuild record and machine history written in ${took(step)}`);

  // The listings must be searchable as soon as the app answers; the app's own start-up re-index runs later.
  step = Date.now();
  const { reindexAllListings } = await import("../../app/modules/search/indexing.server.ts");
  const { indexed } = await reindexAllListings(db);
  log("search", `demo listings indexed (${indexed}) in ${took(step)}`);

  // The seed only queued jobs (mail, index updates, the newest payout); the app's workers run them.
  const { stopQueue } = await import("../../app/modules/jobs/queue.server.ts");
  await stopQueue();
  log("postgres", `demo scenario loaded in ${took(started)}`);
  return true;
}
