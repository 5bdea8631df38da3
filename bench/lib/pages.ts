// What a page costs a browser: every script response's body gzipped with zlib at level 9 and summed
// (what a visitor downloads with a cold cache), and the Largest Contentful Paint on localhost, from
// headless Chromium (Debian's, with the switches the browser tests use).
import { gzipSync } from "node:zlib";
import type { Browser } from "playwright-core";
import { launchBrowser } from "../../tests/support/browser.ts";

export type PageScript = { url: string; bytes: number; gzipBytes: number };

export type PageOutcome = {
  name: string;
  path: string;
  status: number;
  scripts: PageScript[];
  scriptBytes: number;
  scriptGzipBytes: number;
  /** Median over the loads, each in a fresh context (cold cache). */
  lcpMs: number;
  lcpSamplesMs: number[];
  lcpElement: string;
};

declare global {
  interface Window {
    __benchLcp?: { startTime: number; element: string };
  }
}

async function loadOnce(browser: Browser, url: string) {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  try {
    await context.addInitScript(() => {
      new PerformanceObserver((list) => {
        for (const entry of list.getEntries() as (PerformanceEntry & { element?: Element | null; url?: string })[]) {
          const element = entry.element ? `${entry.element.tagName.toLowerCase()}${entry.url ? ` ${new URL(entry.url).pathname}` : ""}` : "(removed)";
          window.__benchLcp = { startTime: entry.startTime, element };
        }
      }).observe({ type: "largest-contentful-paint", buffered: true });
    });
    const page = await context.newPage();
    const scripts = new Map<string, Promise<PageScript | null>>();
    page.on("response", (response) => {
      const type = response.request().resourceType();
      const contentType = response.headers()["content-type"] ?? "";
      if (type !== "script" && !/javascript/.test(contentType)) return;
      if (scripts.has(response.url())) return;
      scripts.set(
        response.url(),
        response
          .body()
          .then((body) => ({ url: new URL(response.url()).pathname, bytes: body.length, gzipBytes: gzipSync(body, { level: 9 }).length }))
          .catch(() => null),
      );
    });
    const response = await page.goto(url, { waitUntil: "load" });
    await page.waitForLoadState("networkidle");
    await page.waitForTimeout(300);
    const lcp = await page.evaluate(() => window.__benchLcp ?? { startTime: Number.NaN, element: "(none)" });
    const collected = (await Promise.all(scripts.values())).filter((script): script is PageScript => script !== null);
    return { status: response?.status() ?? 0, lcp, scripts: collected };
  } finally {
    await context.close();
  }
}

export async function measurePages(origin: string, pages: { name: string; path: string }[], loads = 3): Promise<PageOutcome[]> {
  const browser = await launchBrowser();
  try {
    const outcomes: PageOutcome[] = [];
    for (const { name, path } of pages) {
      const samples: Awaited<ReturnType<typeof loadOnce>>[] = [];
      for (let i = 0; i < loads; i++) samples.push(await loadOnce(browser, `${origin}${path}`));
      const first = samples[0]!;
      const lcps = samples.map((sample) => sample.lcp.startTime).sort((a, b) => a - b);
      const scripts = first.scripts.sort((a, b) => b.gzipBytes - a.gzipBytes);
      outcomes.push({
        name,
        path,
        status: first.status,
        scripts,
        scriptBytes: scripts.reduce((sum, script) => sum + script.bytes, 0),
        scriptGzipBytes: scripts.reduce((sum, script) => sum + script.gzipBytes, 0),
        lcpMs: lcps[Math.floor(lcps.length / 2)]!,
        lcpSamplesMs: samples.map((sample) => sample.lcp.startTime),
        lcpElement: samples.at(-1)!.lcp.element,
      });
    }
    return outcomes;
  } finally {
    await browser.close();
  }
}
