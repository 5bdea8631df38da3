import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";

export const appOrigin = process.env.TEST_APP_ORIGIN ?? "http://localhost:3000";

/** Debian's Chromium, headless, with the switches that keep it from calling out to the network. */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    headless: true,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      "--no-first-run",
    ],
  });
}

/** A fresh context whose every request is recorded, to check that nothing leaves this machine. */
export async function newRecordedPage(browser: Browser, options: { width?: number; height?: number } = {}) {
  const context: BrowserContext = await browser.newContext({
    baseURL: appOrigin,
    viewport: { width: options.width ?? 1280, height: options.height ?? 900 },
  });
  const requests: string[] = [];
  context.on("request", (request) => requests.push(request.url()));
  const page: Page = await context.newPage();
  return { context, page, requests };
}

export function isLocal(url: string): boolean {
  if (url.startsWith("data:") || url.startsWith("blob:")) return true;
  const { hostname } = new URL(url);
  return hostname === "localhost" || hostname === "127.0.0.1" || hostname === "[::1]";
}
