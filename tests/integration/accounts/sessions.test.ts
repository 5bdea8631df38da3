import { describe, expect, it } from "vitest";
import { createTestUser, signInCookie, testAppOrigin } from "../../support/accounts";

const sessionOf = (cookie: string) => fetch(`${testAppOrigin}/api/auth/get-session`, { headers: { cookie } }).then((response) => response.json());

function postAccountForm(cookie: string, fields: Record<string, string>) {
  return fetch(`${testAppOrigin}/account`, {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded", origin: testAppOrigin, cookie },
    body: new URLSearchParams(fields),
    redirect: "manual",
  });
}

describe("account settings over HTTP", () => {
  it("changing the password ends the other sessions and keeps this one", async () => {
    const person = await createTestUser();
    const laptop = await signInCookie(person.email, person.password);
    const phone = await signInCookie(person.email, person.password);
    expect((await sessionOf(phone))?.user?.id).toBe(person.id);

    const newPassword = "tailstock sits high never low";
    const response = await postAccountForm(laptop, { intent: "password", currentPassword: person.password, newPassword, confirmPassword: newPassword });
    expect(response.status).toBe(302);
    expect(response.headers.get("location")).toBe("/account?password=changed");
    const renewed = response.headers.getSetCookie().map((line) => line.split(";")[0]).join("; ");
    expect(renewed).toMatch(/session_token=/);

    expect(await sessionOf(phone)).toBeNull();
    expect((await sessionOf(renewed))?.user?.id).toBe(person.id);
    await expect(signInCookie(person.email, person.password)).rejects.toThrow(/401/);
    await expect(signInCookie(person.email, newPassword)).resolves.toMatch(/session_token=/);
  });

  it("refuses a wrong current password at its field, and changes nothing", async () => {
    const person = await createTestUser();
    const cookie = await signInCookie(person.email, person.password);
    const response = await postAccountForm(cookie, { intent: "password", currentPassword: "not-the-current-one", newPassword: "a new long password", confirmPassword: "a new long password" });
    expect(response.status).toBe(422);
    expect(await response.text()).toMatch(/That is not your current password/);
    await expect(signInCookie(person.email, person.password)).resolves.toBeTruthy();
  });

  it("saves the name and display units, and rejects units that do not exist", async () => {
    const person = await createTestUser();
    const cookie = await signInCookie(person.email, person.password);
    expect((await postAccountForm(cookie, { intent: "profile", name: "Ottilie Brandvik", displayUnits: "inch" })).status).toBe(200);
    expect((await sessionOf(cookie)).user).toMatchObject({ name: "Ottilie Brandvik", displayUnits: "inch" });
    expect((await postAccountForm(cookie, { intent: "profile", name: "Ottilie Brandvik", displayUnits: "furlong" })).status).toBe(422);
    expect((await sessionOf(cookie)).user.displayUnits).toBe("inch");
  });
});
