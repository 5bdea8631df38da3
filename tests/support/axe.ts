// axe-core in a page under our Content-Security-Policy. The policy refuses any <script> a test adds to the
// page (playwright's addScriptTag, an inline script); a string evaluated through the DevTools protocol
// (Runtime.evaluate, which page.evaluate sends) runs outside the page's policy, so axe goes in that way.
import type { AxeResults } from "axe-core";
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import type { BrowserContext, Page } from "playwright-core";
import { signInCookie, testAppOrigin } from "./accounts";

const axeSource = readFileSync(createRequire(import.meta.url).resolve("axe-core/axe.min.js"), "utf8");

/** WCAG 2.0, 2.1 and 2.2, levels A and AA: the rules axe-core tags with these. */
export const WCAG_22_AA = ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"];

/** Every WCAG 2.2 A/AA violation axe-core finds on the page as it is now, one readable line per element. */
export async function wcagViolations(page: Page): Promise<string[]> {
  if (!(await page.evaluate(() => "axe" in window))) await page.evaluate(axeSource);
  const results = await page.evaluate(
    (tags) => (window as unknown as { axe: { run: (context: Document, options: object) => Promise<AxeResults> } }).axe.run(document, { runOnly: { type: "tag", values: tags }, resultTypes: ["violations"] }),
    WCAG_22_AA,
  );
  const found = results.violations.flatMap((violation) =>
    violation.nodes.map((node) => `${violation.id} (${violation.impact}) ${node.target.join(" ")}: ${node.failureSummary?.replace(/\s+/g, " ").slice(0, 300)}`),
  );
  // A name on an element with no role is not announced by screen readers (ARIA 1.2 prohibits it on generic
  // elements); axe-core only lists it for review, so it is looked for here.
  const unnamed = await page.evaluate(() =>
    [...document.querySelectorAll("span[aria-label]:not([role]), div[aria-label]:not([role]), p[aria-label]:not([role])")].map((element) => `${element.tagName.toLowerCase()} "${element.getAttribute("aria-label")}"`),
  );
  return [...found, ...unnamed.map((element) => `aria-label on an element with no role (not announced): ${element}`)];
}

/** Signs the context in as this person, through the real sign-in endpoint. */
export async function signInContext(context: BrowserContext, user: { email: string; password: string }) {
  const header = await signInCookie(user.email, user.password);
  await context.addCookies(
    header.split("; ").map((pair) => {
      const at = pair.indexOf("=");
      return { name: pair.slice(0, at), value: pair.slice(at + 1), url: testAppOrigin };
    }),
  );
}
