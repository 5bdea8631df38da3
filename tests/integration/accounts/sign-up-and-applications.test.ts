import { randomUUID } from "node:crypto";
import { describe, expect, it } from "vitest";
import { getOptionalUser } from "~/modules/accounts/guards.server";
import { latestApplicationOf } from "~/modules/accounts/service.server";
import { createTestUser, signInCookie, testAppOrigin } from "../../support/accounts";
import { latestEmailTo } from "../../support/mailbox";

function postForm(path: string, fields: Record<string, string | string[]>, cookie?: string) {
  const body = new URLSearchParams();
  for (const [name, value] of Object.entries(fields)) for (const item of [value].flat()) body.append(name, item);
  return fetch(`${testAppOrigin}${path}`, {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded", origin: testAppOrigin, ...(cookie ? { cookie } : {}) },
    body,
    redirect: "manual",
  });
}

const cookieOf = (response: Response) => response.headers.getSetCookie().map((line) => line.split(";")[0]).join("; ");

describe("the sign-up form", () => {
  it("creates a signed-in seller, queues the confirmation e-mail with a plain-text part, and refuses the same address twice", async () => {
    const email = `signup-${randomUUID().slice(0, 8)}@example.test`;
    const fields = { name: "Wendeline Harrow Tools", email, password: "ten or more characters", sells: "on" };
    const response = await postForm("/sign-up", fields);
    expect(response.status).toBe(302);
    expect(response.headers.get("location")).toBe(`/verify-email?${new URLSearchParams({ redirectTo: "/account", sent: "1" })}`);
    const user = await getOptionalUser(new Request(testAppOrigin, { headers: { cookie: cookieOf(response) } }));
    expect(user).toMatchObject({ email, emailVerified: false, inspectorStatus: "none" });
    expect(user!.roles.sort()).toEqual(["buyer", "seller"]);

    const message = await latestEmailTo(email, { matching: (candidate) => candidate.tag === "verify-email" });
    expect(message.html).toMatch(/<html/i);
    expect(message.text).toMatch(new RegExp(`${testAppOrigin}/verify-email\\?token=`));
    expect(message.text).not.toMatch(/<[a-z]/i);

    const again = await postForm("/sign-up", fields);
    expect(again.status).toBe(422);
    expect(await again.text()).toMatch(/An account with this address already exists/);
  });

  it("answers 422 at the fields for bad input and creates nothing", async () => {
    const email = `bad-${randomUUID().slice(0, 8)}@example.test`;
    const response = await postForm("/sign-up", { name: "X", email, password: "short" });
    expect(response.status).toBe(422);
    const page = await response.text();
    expect(page).toMatch(/Enter at least 2 characters/);
    expect(page).toMatch(/Use at least 10 characters/);
    const signIn = await fetch(`${testAppOrigin}/api/auth/sign-in/email`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: testAppOrigin },
      body: JSON.stringify({ email, password: "short" }),
    });
    expect(signIn.status).toBe(401);
  });

  it("sends someone who inspects on to the inspector application after confirming", async () => {
    const response = await postForm("/sign-up", { name: "Rasmus Quell", email: `insp-${randomUUID().slice(0, 8)}@example.test`, password: "ten or more characters", inspects: "on" });
    expect(response.headers.get("location")).toBe(`/verify-email?${new URLSearchParams({ redirectTo: "/account/inspector", sent: "1" })}`);
  });
});

describe("inspector applications", () => {
  const application = {
    qualifications: "Twelve years as a machine-tool fitter; scraping and bearing work on centre lathes; own a 1 µm test indicator and a 300 mm mandrel.",
    regions: "Lower Feldmark\nThe Ostry valley",
    categories: ["centre_lathe", "toolroom_lathe"],
  };

  it("needs a confirmed address", async () => {
    const person = await createTestUser({ verified: false });
    const response = await postForm("/account/inspector", application, await signInCookie(person.email, person.password));
    expect(response.status).toBe(302);
    expect(response.headers.get("location")).toMatch(/^\/verify-email\?redirectTo=%2Faccount%2Finspector/);
  });

  it("are checked, stored as pending, refused twice, and rejected by staff only with a reason that is e-mailed", async () => {
    const person = await createTestUser();
    const cookie = await signInCookie(person.email, person.password);
    const empty = await postForm("/account/inspector", { qualifications: "short", regions: "" }, cookie);
    expect(empty.status).toBe(422);
    const emptyPage = await empty.text();
    expect(emptyPage).toMatch(/at least 40 characters/);
    expect(emptyPage).toMatch(/Choose at least one kind of machine/);

    expect((await postForm("/account/inspector", application, cookie)).status).toBe(200);
    const pending = await getOptionalUser(new Request(testAppOrigin, { headers: { cookie } }));
    expect(pending?.inspectorStatus).toBe("pending");
    const twice = await postForm("/account/inspector", application, cookie);
    expect(twice.status).toBe(409);

    const admin = await createTestUser({ roles: ["admin"] });
    const adminCookie = await signInCookie(admin.email, admin.password);
    const applicationId = (await latestApplicationOf(person.id))?.id;
    expect(applicationId).toBeTruthy();
    const list = await fetch(`${testAppOrigin}/admin/inspector-applications`, { headers: { cookie: adminCookie } });
    expect(await list.text()).toContain(`data-application="${applicationId}"`);

    // A buyer cannot decide.
    expect((await postForm("/admin/inspector-applications", { applicationId: applicationId!, decision: "approve" }, cookie)).status).toBe(403);
    expect((await postForm("/admin/inspector-applications", { applicationId: applicationId!, decision: "reject" }, adminCookie)).status).toBe(422);
    const rejected = await postForm("/admin/inspector-applications", { applicationId: applicationId!, decision: "reject", reason: "Send a copy of your calibration certificate." }, adminCookie);
    expect(rejected.status).toBe(200);
    const after = await getOptionalUser(new Request(testAppOrigin, { headers: { cookie } }));
    expect(after?.inspectorStatus).toBe("rejected");
    expect(after?.roles).not.toContain("inspector");
    const message = await latestEmailTo(person.email, { matching: (candidate) => candidate.tag === "inspector-decision" });
    expect(message.text).toMatch(/Send a copy of your calibration certificate/);
    // Deciding twice changes nothing.
    expect((await postForm("/admin/inspector-applications", { applicationId: applicationId!, decision: "approve" }, adminCookie)).status).toBe(409);
  });
});
