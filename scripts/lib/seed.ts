// Demo data for `npm start` on an empty database. It is an invented scenario: invented dealers, makes,
// people and places. Each domain adds its part here as it lands.
import { log } from "./output.ts";

export type DemoSignIn = { role: string; email: string; password: string };

// The demo accounts, one per role (plus an inspector whose application waits for staff). Other domains
// find their owners here by `key` (e.g. the dealer's listings) through `demoAccountId(key)`.
export const demoAccounts = [
  { key: "admin", role: "admin", name: "Maren Tolvstad (staff)", email: "staff@example.test", password: "demo-staff-4471", roles: ["admin"] },
  { key: "dealer", role: "seller", name: "Kessling & Daughters Machine Tools", email: "dealer@example.test", password: "demo-dealer-4471", roles: ["seller"] },
  { key: "buyer", role: "buyer", name: "Ilse Varga", email: "buyer@example.test", password: "demo-buyer-4471", roles: [] },
  { key: "inspector", role: "inspector", name: "Tobiah Renner", email: "inspector@example.test", password: "demo-inspector-4471", roles: ["inspector"] },
  { key: "applicant", role: "applicant", name: "Corvin Aldane", email: "applicant@example.test", password: "demo-applicant-4471", roles: [], inspectorStatus: "pending" },
] as const;

export type DemoAccountKey = (typeof demoAccounts)[number]["key"];

export function demoSignIns(): DemoSignIn[] {
  return demoAccounts.map(({ role, email, password }) => ({ role, email, password }));
}

/** The user id of a demo account (after seeding). */
export async function demoAccountId(key: DemoAccountKey): Promise<string> {
  const { findUserIdByEmail } = await import("../../app/modules/accounts/service.server.ts");
  const account = demoAccounts.find((candidate) => candidate.key === key)!;
  const id = await findUserIdByEmail(account.email);
  if (!id) throw new Error(`demo account ${account.email} is missing`);
  return id;
}

async function seedDemoAccounts() {
  // Loaded here, not at the top, so that listing the sign-ins needs no database.
  const { createAccount, findUserIdByEmail } = await import("../../app/modules/accounts/service.server.ts");
  for (const account of demoAccounts) {
    if (await findUserIdByEmail(account.email)) continue;
    await createAccount({
      name: account.name,
      email: account.email,
      password: account.password,
      verified: true,
      roles: [...account.roles],
      inspectorStatus: "inspectorStatus" in account ? account.inspectorStatus : undefined,
    });
  }
  log("postgres", `demo accounts ready (${demoAccounts.length})`);
}

// Two more dealers who own demo listings; they have no listed sign-in (the demo dealer above is the one to use).
const demoListingDealers = [
  { name: "Brandmoor Used Machinery Ltd", email: "brandmoor.sales@example.test" },
  { name: "Atelier Vernois Machines-Outils", email: "atelier.vernois@example.test" },
];

async function seedDemoListingsPart() {
  const { createAccount, findUserIdByEmail } = await import("../../app/modules/accounts/service.server.ts");
  const { seedDemoListings } = await import("../../app/modules/listings/demo.server.ts");
  const dealerIds = [await demoAccountId("dealer")];
  for (const dealer of demoListingDealers) {
    const id = (await findUserIdByEmail(dealer.email)) ?? (await createAccount({ ...dealer, password: `demo-${crypto.randomUUID()}`, verified: true, roles: ["seller"] })).id;
    dealerIds.push(id);
  }
  const written = await seedDemoListings(dealerIds);
  log("postgres", written ? `demo listings written (${written})` : "demo listings already there");
}

// A second certified inspector with no listed sign-in (the demo inspector above is the one to use).
const demoSecondInspector = { name: "Agathe Mirelle", email: "agathe.mirelle@example.test" };

async function seedDemoInspectionsPart() {
  const { createAccount, findUserIdByEmail } = await import("../../app/modules/accounts/service.server.ts");
  const { seedDemoInspections } = await import("../../app/modules/inspections/demo.server.ts");
  const account = (key: DemoAccountKey) => demoAccounts.find((candidate) => candidate.key === key)!;
  const secondId =
    (await findUserIdByEmail(demoSecondInspector.email)) ??
    (await createAccount({ ...demoSecondInspector, password: `demo-${crypto.randomUUID()}`, verified: true, roles: ["inspector"] })).id;
  const written = await seedDemoInspections({
    inspectors: [
      { id: await demoAccountId("inspector"), email: account("inspector").email },
      { id: secondId, email: demoSecondInspector.email },
    ],
    buyer: { id: await demoAccountId("buyer"), email: account("buyer").email },
  });
  log("postgres", written ? `demo inspector profiles and bookings written (${written} bookings)` : "demo inspections already there");
}

async function seedDemoReportsPart() {
  const { seedDemoReports } = await import("../../app/modules/reports/demo.server.ts");
  const person = async (key: DemoAccountKey) => {
    const account = demoAccounts.find((candidate) => candidate.key === key)!;
    return { id: await demoAccountId(key), email: account.email, name: account.name };
  };
  const written = await seedDemoReports({ inspector: await person("inspector"), buyer: await person("buyer") });
  log("postgres", written ? `demo accuracy reports signed (${written})` : "demo reports already there");
}

export async function seedDemoDataIfEmpty(_databaseUrl: string) {
  await seedDemoAccounts();
  await seedDemoListingsPart();
  await seedDemoInspectionsPart();
  await seedDemoReportsPart();
}
