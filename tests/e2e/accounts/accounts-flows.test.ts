import { randomUUID } from "node:crypto";
import type { Browser } from "playwright-core";
import { eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDatabase } from "~/db/client.server";
import { WRONG_PASSWORD_LIMIT } from "~/modules/accounts/limits.server";
import { passwordFailure } from "~/modules/accounts/schema";
import { createTestUser, signInPage } from "../../support/accounts";
import { appOrigin, launchBrowser, newRecordedPage } from "../../support/browser";
import { latestEmailTo, linkIn } from "../../support/mailbox";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("signing up as a seller", () => {
  it("creates the account, e-mails a confirmation link, and the link confirms the address and signs in", async () => {
    const email = `seller-${randomUUID().slice(0, 8)}@example.test`;
    const { context, page } = await newRecordedPage(browser, { width: 390, height: 844 });
    await page.goto("/sign-up?role=seller");
    await expect(page.locator('input[data-role="seller"]').isChecked()).resolves.toBe(true);
    await page.getByLabel("Your name").fill("Halvard Ostberg Machinery");
    await page.getByLabel("E-mail address").fill(email);
    await page.getByLabel("Password").fill("a lathe with a true spindle");
    await page.getByRole("button", { name: "Create account" }).click();
    await page.waitForURL((url) => url.pathname === "/verify-email");
    await expect(page.getByText(`We sent a link to`).textContent()).resolves.toContain(email);
    await context.close();

    const message = await latestEmailTo(email, { matching: (candidate) => candidate.tag === "verify-email" });
    expect(message.subject).toMatch(/Confirm your e-mail address/);
    expect(message.text).toMatch(/Confirm my address/i);
    const link = linkIn(message, `${appOrigin}/verify-email?token=`);

    // A fresh browser, as when the e-mail is opened on another device.
    const fresh = await newRecordedPage(browser);
    await fresh.page.goto(link);
    await fresh.page.waitForURL((url) => url.pathname === "/account");
    await fresh.page.getByText("Your e-mail address is confirmed").waitFor();
    await expect(fresh.page.getByLabel("Your roles").textContent()).resolves.toMatch(/seller.*e-mail confirmed/);
    await expect(fresh.page.locator('[data-slot="account"]').first().textContent()).resolves.toContain("Halvard Ostberg Machinery");
    await fresh.context.close();
  });
});

describe("signing in", () => {
  it("says clearly when the password is wrong, and signs in with the right one", async () => {
    const person = await createTestUser();
    const { context, page } = await newRecordedPage(browser);
    await page.goto("/sign-in");
    await page.getByLabel("E-mail address").fill(person.email);
    await page.getByLabel("Password", { exact: true }).fill("not my password at all");
    await page.getByRole("button", { name: "Sign in" }).click();
    const alert = page.getByRole("alert");
    await alert.waitFor();
    await expect(alert.textContent()).resolves.toMatch(/e-mail address and password do not match an account/);
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await expect(page.getByLabel("E-mail address").inputValue()).resolves.toBe(person.email);

    await page.getByLabel("Password", { exact: true }).fill(person.password);
    await Promise.all([page.waitForURL((url) => url.pathname !== "/sign-in"), page.getByRole("button", { name: "Sign in" }).click()]);
    await page.locator("[data-slot=account] summary").first().waitFor();
    await context.close();
  });

  it("after five wrong passwords asks to wait seconds, not to come back later, and then lets the owner in", async () => {
    const person = await createTestUser();
    const { context, page } = await newRecordedPage(browser, { width: 390, height: 844 });
    await page.goto("/sign-in");
    await page.getByLabel("E-mail address").fill(person.email);
    const alert = page.getByRole("alert");
    for (let attempt = 1; attempt <= WRONG_PASSWORD_LIMIT + 1; attempt++) {
      await page.getByLabel("Password", { exact: true }).fill(`not my password ${attempt}`);
      await Promise.all([page.waitForResponse((response) => response.request().method() === "POST"), page.getByRole("button", { name: "Sign in" }).click()]);
    }
    await expect(alert.textContent()).resolves.toMatch(/Too many wrong passwords for this account\. Wait (2\d|30) seconds and try again, or reset your password/);
    if (process.env.SCREENSHOT_DIR) await page.screenshot({ path: `${process.env.SCREENSHOT_DIR}/sign-in-wait-phone.png`, fullPage: true });

    // The wait is over (moved into the past rather than slept through).
    await getDatabase()
      .update(passwordFailure)
      .set({ failedAt: sql`${passwordFailure.failedAt} - interval '31 seconds'` })
      .where(eq(passwordFailure.email, person.email));
    await page.getByLabel("Password", { exact: true }).fill(person.password);
    await Promise.all([page.waitForURL((url) => url.pathname !== "/sign-in"), page.getByRole("button", { name: "Sign in" }).click()]);
    expect((await context.cookies()).some((cookie) => cookie.name.endsWith("session_token"))).toBe(true);
    await context.close();
  });

  it("sends a signed-out visitor to sign in and back to the page they asked for", async () => {
    const person = await createTestUser();
    const { context, page } = await newRecordedPage(browser);
    await page.goto("/account");
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    expect(new URL(page.url()).searchParams.get("redirectTo")).toBe("/account");
    await page.getByLabel("E-mail address").fill(person.email);
    await page.getByLabel("Password", { exact: true }).fill(person.password);
    await Promise.all([page.waitForURL((url) => url.pathname === "/account"), page.getByRole("button", { name: "Sign in" }).click()]);
    await page.getByRole("heading", { name: "Your account" }).waitFor();

    await page.locator("[data-slot=account] summary").first().click();
    await Promise.all([page.waitForURL((url) => url.pathname === "/"), page.getByRole("button", { name: "Sign out" }).first().click()]);
    await page.goto("/account");
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await context.close();
  });
});

describe("resetting a forgotten password", () => {
  it("e-mails a link, sets the new password, and only the new one signs in", async () => {
    const person = await createTestUser();
    const newPassword = "spindle nose runout within";
    const { context, page } = await newRecordedPage(browser);
    await page.goto("/sign-in");
    await page.getByRole("link", { name: "Forgot your password?" }).click();
    await page.waitForURL((url) => url.pathname === "/forgot-password");
    await page.getByLabel("E-mail address").fill(person.email);
    await page.getByRole("button", { name: "Send me a link" }).click();
    await page.getByText("is on its way").waitFor();

    const message = await latestEmailTo(person.email, { matching: (candidate) => candidate.tag === "password-reset" });
    await page.goto(linkIn(message, `${appOrigin}/reset-password?token=`));
    await page.getByLabel("New password", { exact: true }).fill(newPassword);
    await page.getByLabel("New password again").fill("something else entirely");
    await page.getByRole("button", { name: "Save new password" }).click();
    await page.getByText("The two passwords differ.").waitFor();
    await page.getByLabel("New password again").fill(newPassword);
    await Promise.all([page.waitForURL((url) => url.pathname === "/sign-in"), page.getByRole("button", { name: "Save new password" }).click()]);
    await page.getByText("Your password was changed").waitFor();

    await page.getByLabel("E-mail address").fill(person.email);
    await page.getByLabel("Password", { exact: true }).fill(person.password);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByText("do not match an account").waitFor();

    await page.getByLabel("Password", { exact: true }).fill(newPassword);
    await Promise.all([page.waitForURL((url) => url.pathname !== "/sign-in"), page.getByRole("button", { name: "Sign in" }).click()]);
    await page.locator("[data-slot=account] summary").first().waitFor();
    await context.close();
  });
});

describe("staff pages", () => {
  it("show a buyer a 403 page that says why", async () => {
    const buyer = await createTestUser();
    const { context, page } = await newRecordedPage(browser);
    await signInPage(page, buyer.email, buyer.password);
    const response = await page.goto("/admin/inspector-applications");
    expect(response?.status()).toBe(403);
    await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toBe("Not allowed");
    await page.getByText("needs a staff account").waitFor();
    await context.close();
  });

  it("let an admin approve a pending inspector application with a reason", async () => {
    const admin = await createTestUser({ roles: ["admin"] });
    const applicant = await createTestUser({ inspectorStatus: "pending", name: `Applicant ${randomUUID().slice(0, 6)}` });
    const { context, page } = await newRecordedPage(browser);
    await signInPage(page, admin.email, admin.password, "/admin/inspector-applications");
    const card = page.locator("[data-application]", { hasText: applicant.name });
    await card.getByRole("button", { name: "Reject" }).click();
    await card.getByText("Give the applicant a reason").waitFor();
    await card.getByLabel("Reason (sent to the applicant)").fill("Welcome aboard; your mandrel set is well documented.");
    await card.getByRole("button", { name: "Approve and certify" }).click();
    await card.getByText("now a certified inspector").waitFor();
    const message = await latestEmailTo(applicant.email, { matching: (candidate) => candidate.tag === "inspector-decision" });
    expect(message.text).toMatch(/your mandrel set is well documented/);
    await context.close();
  });
});
