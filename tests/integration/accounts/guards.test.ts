import { beforeAll, describe, expect, it } from "vitest";
import { getOptionalUser, hasRole, requireOwnership, requireRole, requireUser, requireVerifiedUser, type SessionUser } from "~/modules/accounts/guards.server";
import { createTestUser, signInCookie, testAppOrigin } from "../../support/accounts";

/** A request for `path` carrying the session cookie of `cookie` (or none). */
const requestAt = (path: string, cookie?: string) => new Request(`${testAppOrigin}${path}`, { headers: cookie ? { cookie } : {} });

/** What a guard threw: a redirect Response or a `data(…, { status })` value. */
async function thrown(promise: Promise<unknown> | (() => unknown)) {
  try {
    await (typeof promise === "function" ? promise() : promise);
  } catch (error) {
    if (error instanceof Response) return { status: error.status, location: error.headers.get("location"), body: null };
    const value = error as { init?: { status?: number }; data?: unknown };
    return { status: value.init?.status, location: null, body: value.data };
  }
  throw new Error("the guard let the request through");
}

const people: Record<"buyer" | "seller" | "inspector" | "admin" | "unverified" | "pendingInspector", { id: string; cookie: string; user: SessionUser }> = {} as never;

beforeAll(async () => {
  const made = {
    buyer: await createTestUser(),
    seller: await createTestUser({ roles: ["seller"] }),
    inspector: await createTestUser({ roles: ["inspector"] }),
    admin: await createTestUser({ roles: ["admin"] }),
    unverified: await createTestUser({ verified: false, roles: ["seller"] }),
    pendingInspector: await createTestUser({ inspectorStatus: "pending" }),
  };
  for (const [key, person] of Object.entries(made)) {
    const cookie = await signInCookie(person.email, person.password);
    const user = (await getOptionalUser(requestAt("/", cookie)))!;
    people[key as keyof typeof people] = { id: person.id, cookie, user };
  }
});

describe("getOptionalUser", () => {
  it("is null when signed out, and the person with roles, units and inspector status when signed in", async () => {
    expect(await getOptionalUser(requestAt("/"))).toBeNull();
    const { user } = people.seller;
    expect(user).toMatchObject({ id: people.seller.id, emailVerified: true, displayUnits: "mm", inspectorStatus: "none" });
    expect(user.roles.sort()).toEqual(["buyer", "seller"]);
    expect(people.inspector.user.inspectorStatus).toBe("certified");
    expect(people.inspector.user.roles).toContain("inspector");
    expect(people.pendingInspector.user.inspectorStatus).toBe("pending");
    expect(people.pendingInspector.user.roles).toEqual(["buyer"]);
  });
});

describe("requireUser", () => {
  it("sends a signed-out visitor to sign in and back to the page with its query", async () => {
    const result = await thrown(requireUser(requestAt("/sell/new?category=centre_lathe")));
    expect(result.status).toBe(302);
    expect(result.location).toBe(`/sign-in?redirectTo=${encodeURIComponent("/sell/new?category=centre_lathe")}`);
  });

  it("lets a signed-in person through", async () => {
    await expect(requireUser(requestAt("/account", people.buyer.cookie))).resolves.toMatchObject({ id: people.buyer.id });
  });
});

describe("requireVerifiedUser", () => {
  it("sends a person whose address is not confirmed to the page that says so", async () => {
    const result = await thrown(requireVerifiedUser(requestAt("/sell/new", people.unverified.cookie)));
    expect(result.status).toBe(302);
    expect(result.location).toBe(`/verify-email?redirectTo=${encodeURIComponent("/sell/new")}`);
    await expect(requireVerifiedUser(requestAt("/sell/new", people.seller.cookie))).resolves.toMatchObject({ id: people.seller.id });
  });
});

describe("requireRole", () => {
  const cases = [
    ["buyer", ["buyer", "seller", "inspector", "admin", "unverified", "pendingInspector"]],
    ["seller", ["seller", "unverified"]],
    ["inspector", ["inspector"]],
    ["admin", ["admin"]],
  ] as const;
  for (const [role, allowed] of cases) {
    it(`lets only ${allowed.join(", ")} through as ${role}; everyone else gets 403 with a reason`, async () => {
      for (const [name, person] of Object.entries(people)) {
        const request = requestAt("/somewhere", person.cookie);
        if ((allowed as readonly string[]).includes(name)) {
          await expect(requireRole(request, role)).resolves.toMatchObject({ id: person.id });
          expect(hasRole(person.user, role)).toBe(true);
        } else {
          const result = await thrown(requireRole(request, role));
          expect(result.status).toBe(403);
          expect(String(result.body)).toMatch(/needs/);
          expect(hasRole(person.user, role)).toBe(false);
        }
      }
    });
  }

  it("accepts any of several roles", async () => {
    await expect(requireRole(requestAt("/x", people.inspector.cookie), ["seller", "inspector"])).resolves.toBeTruthy();
    expect((await thrown(requireRole(requestAt("/x", people.buyer.cookie), ["seller", "inspector"]))).status).toBe(403);
  });

  it("sends a signed-out visitor to sign in rather than showing 403", async () => {
    expect((await thrown(requireRole(requestAt("/admin/users"), "admin"))).status).toBe(302);
  });

  it("treats an inspector whose application is only pending as not an inspector", async () => {
    expect((await thrown(requireRole(requestAt("/x", people.pendingInspector.cookie), "inspector"))).status).toBe(403);
  });

  it("knows nobody when signed out", () => {
    expect(hasRole(null, "buyer")).toBe(false);
  });
});

describe("requireOwnership", () => {
  it("lets the owner and staff through and refuses anyone else with 403", async () => {
    const ownerId = people.seller.id;
    expect(() => requireOwnership(people.seller.user, ownerId, "this listing")).not.toThrow();
    expect(() => requireOwnership(people.admin.user, ownerId, "this listing")).not.toThrow();
    for (const other of [people.buyer, people.inspector, people.unverified]) {
      const result = await thrown(() => requireOwnership(other.user, ownerId, "this listing"));
      expect(result.status).toBe(403);
      expect(String(result.body)).toMatch(/this listing/);
    }
  });
});

describe("staff pages over HTTP", () => {
  it("answer 403 to a buyer, 302 to sign-in when signed out, and 200 to an admin", async () => {
    for (const path of ["/admin/users", "/admin/inspector-applications"]) {
      const asBuyer = await fetch(`${testAppOrigin}${path}`, { headers: { cookie: people.buyer.cookie }, redirect: "manual" });
      expect(asBuyer.status).toBe(403);
      expect(await asBuyer.text()).toMatch(/Not allowed/);
      const signedOut = await fetch(`${testAppOrigin}${path}`, { redirect: "manual" });
      expect(signedOut.status).toBe(302);
      expect(signedOut.headers.get("location")).toBe(`/sign-in?redirectTo=${encodeURIComponent(path)}`);
      const asAdmin = await fetch(`${testAppOrigin}${path}`, { headers: { cookie: people.admin.cookie }, redirect: "manual" });
      expect(asAdmin.status).toBe(200);
    }
  });
});
