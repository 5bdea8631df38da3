// Hostile text at every form and API that takes text: NUL bytes, lone surrogates (which only JSON can carry;
// a form body turns them into U+FFFD), a megabyte, names with nothing visible, prices in hex. Each must answer
// a 4xx that names the problem, never a 500, and store nothing.
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { listings } from "~/modules/listings/schema";
import { savedSearches } from "~/modules/search/saved-searches/schema";
import { createTestUser, signInCookie, testAppOrigin, type TestUser } from "../../support/accounts";
import { createListingAs, listingsOfSeller, postForm, validListingFields } from "../../support/listings";
import { acceptedBooking, completeForm, inspectorCookie, saveDraftOverHttp } from "../../support/reports";

const db = getDatabase();
const NUL = "\u0000";
const MEGABYTE = "x".repeat(1_000_000);

let filed: Awaited<ReturnType<typeof acceptedBooking>>;
let seller: TestUser;
let cookies: {
  seller: string;
  buyer: string;
  inspector: string;
  admin: string;
};

beforeAll(async () => {
  filed = await acceptedBooking();
  seller = await createTestUser({ roles: ["seller"] });
  const admin = await createTestUser({ roles: ["admin"] });
  cookies = {
    seller: await signInCookie(seller.email, seller.password),
    buyer: await signInCookie(filed.buyer.email, filed.buyer.password),
    inspector: await inspectorCookie(filed.inspector),
    admin: await signInCookie(admin.email, admin.password),
  };
}, 60_000);

async function expectRefused(response: Response, field: RegExp) {
  const text = await response.text();
  expect(
    response.status,
    text
      .replace(/<[^>]+>/g, " ")
      .replace(/\s+/g, " ")
      .slice(0, 300),
  ).toBeGreaterThanOrEqual(400);
  expect(response.status).toBeLessThan(500);
  expect(text).toMatch(field);
}

describe("listing form", () => {
  it.each([
    ["make", `Weiler${NUL}`, /control characters/],
    ["model", MEGABYTE, /Keep the model to 80 characters/],
    ["city", "\u200B\u200B\u200B", /town or city must have letters or digits/],
    ["description", `A sound lathe with a reground bed and new bearings.${NUL}`, /control character/],
    ["serialNumber", `SN${NUL}1`, /control characters/],
    ["toolingIncluded", `chucks${NUL}`, /control character/],
    ["price", "0x10", /asking price in digits/],
    ["price", "1e4", /asking price in digits/],
    ["weight", "0x10", /weight as a number in kg/],
  ])("%s (case %#) is refused at the field and nothing is stored", async (field, value, message) => {
    const before = (await listingsOfSeller(seller.id)).length;
    await expectRefused(await postForm("/sell/new", cookies.seller, validListingFields({ [field]: value })), message);
    expect(await listingsOfSeller(seller.id)).toHaveLength(before);
  });

  it("keeps a price typed in digits", async () => {
    const id = await createListingAs(cookies.seller, { price: "9400.50" });
    const [row] = await db.select().from(listings).where(eq(listings.id, id));
    expect(row!.priceMinor).toBe(940_050);
  });
});

describe("other forms", () => {
  it("inquiry message with NUL", async () => {
    await expectRefused(
      await postForm(`/machines/${filed.listing.slug}`, cookies.buyer, {
        intent: "inquire",
        listingId: filed.listing.id,
        message: `Is the quill free of play?${NUL}`,
      }),
      /control character/,
    );
  });

  it("saved-search name with NUL, or only zero-width characters", async () => {
    await expectRefused(
      await postForm("/account/saved-searches", cookies.buyer, {
        intent: "save",
        name: `Long beds${NUL}`,
        queryString: "q=lathe",
      }),
      /control characters/,
    );
    await expectRefused(
      await postForm("/account/saved-searches", cookies.buyer, {
        intent: "save",
        name: "\u200B\u2060",
        queryString: "q=lathe",
      }),
      /letters or digits/,
    );
    expect(await db.select().from(savedSearches).where(eq(savedSearches.userId, filed.buyer.id))).toEqual([]);
  });

  it("account name with NUL, or only invisible characters", async () => {
    await expectRefused(
      await postForm("/account", cookies.buyer, {
        intent: "profile",
        name: `Mira${NUL}Holt`,
        displayUnits: "mm",
      }),
      /control characters/,
    );
    await expectRefused(
      await postForm("/account", cookies.buyer, {
        intent: "profile",
        name: "\u3164\u3164\u200D",
        displayUnits: "mm",
      }),
      /letters or digits/,
    );
  });

  it("sign-up name of zero-width characters", async () => {
    await expectRefused(
      await postForm("/sign-up", "", {
        name: "\u200B\u200C\u200D",
        email: `new-${randomUUID()}@example.test`,
        password: "a long enough password",
      }),
      /letters or digits/,
    );
  });

  it("booking slot id with NUL", async () => {
    await expectRefused(
      await postForm(`/machines/${filed.listing.slug}/book`, cookies.buyer, {
        inspectorId: filed.inspector.id,
        slotId: NUL,
        acceptTerms: "on",
      }),
      /Choose a slot/,
    );
  });

  it("/admin/users?q=%00", async () => {
    const response = await fetch(`${testAppOrigin}/admin/users?q=%00`, {
      headers: { cookie: cookies.admin },
    });
    await expectRefused(response, /control characters/);
  });

  it("a megabyte e-mail at sign-in, sign-up and the password reset, and at the auth API", async () => {
    await expectRefused(
      await postForm("/sign-in", "", {
        email: `${MEGABYTE}@example.test`,
        password: "whatever it is",
      }),
      /e-mail address/,
    );
    await expectRefused(
      await postForm("/sign-up", "", {
        name: "New person",
        email: `${MEGABYTE}@example.test`,
        password: "a long enough password",
      }),
      /e-mail address/,
    );
    await expectRefused(
      await postForm("/forgot-password", "", {
        email: `${MEGABYTE}@example.test`,
      }),
      /e-mail address/,
    );
    const api = await fetch(`${testAppOrigin}/api/auth/sign-in/email`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: testAppOrigin },
      body: JSON.stringify({
        email: `${MEGABYTE}@example.test`,
        password: "whatever it is",
      }),
    });
    expect(api.status).toBeGreaterThanOrEqual(400);
    expect(api.status).toBeLessThan(500);
  });
});

describe("report draft (JSON, where lone surrogates survive)", () => {
  it.each([
    ["notes with NUL", { notes: `Bed reground${NUL}` }],
    ["notes with a lone surrogate", { notes: "Bed reground \uD800" }],
    [
      "conditions notes with a lone low surrogate",
      {
        conditions: {
          ambientTemperatureC: "20",
          warmUpMinutes: "30",
          levelled: "yes",
          notes: "\uDC00",
        },
      },
    ],
    [
      "a test's notes with NUL",
      {
        tests: {
          ...completeForm().tests,
          "L-SP-NOSE": {
            kind: "sweep",
            readings: ["0", "2"],
            notes: `x${NUL}`,
          },
        },
      },
    ],
    [
      "an instrument description with a lone surrogate",
      {
        instruments: [
          {
            id: "i1",
            kind: "dial-indicator",
            description: "\uDBFF indicator",
            resolution: "1",
            calibrationDue: "",
          },
        ],
      },
    ],
  ])("%s is refused with a message", async (_case, override) => {
    const response = await saveDraftOverHttp(cookies.inspector, filed.bookingId, { ...completeForm(), ...override });
    expect(response.status).toBe(422);
    expect(JSON.stringify(await response.json())).toMatch(/control character|broken character/);
  });

  it("__proto__ as a test code answers like any unknown code", async () => {
    const unknown = await saveDraftOverHttp(cookies.inspector, filed.bookingId, {
      ...completeForm(),
      tests: { "NO-SUCH-TEST": { kind: "sweep", readings: ["1"] } },
    });
    const proto = await fetch(`${testAppOrigin}/inspector/bookings/${filed.bookingId}/report/draft`, {
      method: "POST",
      headers: {
        cookie: cookies.inspector,
        origin: testAppOrigin,
        "content-type": "application/json",
      },
      body: `{"form": ${JSON.stringify({ ...completeForm(), tests: {} }).replace(/"tests":\{\}/, '"tests":{"__proto__":{"kind":"sweep","readings":["1"]}}')}}`,
    });
    expect(unknown.status).toBe(422);
    expect(proto.status).toBe(422);
  });

  it("__proto__ as a measurement code at the evaluations API answers 422 like any unknown code", async () => {
    const post = (code: string) =>
      fetch(`${testAppOrigin}/api/v1/evaluations`, {
        method: "POST",
        headers: { "content-type": "application/json", origin: testAppOrigin },
        body: `{"profile": {"key": "centre-lathe-normal", "version": 1}, "units": "mm", "measurements": {"tests": {${JSON.stringify(code)}: {"kind": "sweep", "readings": [0, 2, 4, 2]}}}}`,
      });
    const unknown = await post("NO-SUCH-TEST");
    const proto = await post("__proto__");
    expect(proto.status).toBe(unknown.status);
    expect(proto.status).toBe(422);
  });
});
