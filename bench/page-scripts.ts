// The scripts a first visit to a page downloads, from a production build's React Router manifest, each
// gzipped at level 9 as the system bench measures them: a quick check of the pages' script budgets without
// a server or a browser (`npm run bench:pages` builds and runs it). Scripts a page imports lazily (a signed-in
// visitor's question form, a surface test's colour map) are not in its manifest entry, as a first visit does
// not load them.
//   npx tsx bench/page-scripts.ts [build-folder]             each measured page against its budget
//   npx tsx bench/page-scripts.ts [build-folder] [route id]  one route's scripts, largest last
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { gzipSync } from "node:zlib";

type Manifest = { entry: { module: string; imports: string[] }; routes: Record<string, { module: string; imports?: string[] }> };

export function pageScripts(buildFolder: string, routeId: string) {
  const assets = path.join(buildFolder, "client", "assets");
  const file = readdirSync(assets).find((name) => name.startsWith("manifest-"));
  if (!file) throw new Error(`no React Router manifest in ${assets}: build first (npm run build)`);
  const text = readFileSync(path.join(assets, file), "utf8");
  const manifest = JSON.parse(text.slice(text.indexOf("{"), text.lastIndexOf("}") + 1)) as Manifest;
  const route = manifest.routes[routeId];
  if (!route) throw new Error(`no route "${routeId}" in the manifest; ids look like ${Object.keys(manifest.routes).slice(0, 3).join(", ")}`);
  const urls = new Set([manifest.entry.module, ...manifest.entry.imports]);
  for (const each of [manifest.routes.root!, route]) for (const url of [each.module, ...(each.imports ?? [])]) urls.add(url);
  return [...urls].map((url) => ({ url, gzipBytes: gzipSync(readFileSync(path.join(buildFolder, "client", url)), { level: 9 }).length }));
}

/** The routes of the pages the system bench loads in Chromium, with the budget of each (bytes, gzip level 9). */
export const PAGE_SCRIPT_BUDGETS = [
  { name: "home page", route: "routes/home", budget: null },
  // The search page's 120 KB with 5 KB to spare, so that features can land.
  { name: "search page", route: "routes/search/machines", budget: 115_000 },
  { name: "listing page", route: "routes/listings/machine", budget: 130_000 },
  { name: "report page", route: "routes/reports/report", budget: 130_000 },
  { name: "report entry form", route: "routes/reports/entry", budget: null },
] as const;

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  const [buildFolder = "build", routeId] = process.argv.slice(2);
  if (routeId) {
    const scripts = pageScripts(buildFolder, routeId).sort((a, b) => a.gzipBytes - b.gzipBytes);
    for (const script of scripts) console.log(`${String(script.gzipBytes).padStart(8)}  ${script.url}`);
    const total = scripts.reduce((sum, script) => sum + script.gzipBytes, 0);
    console.log(`${String(total).padStart(8)}  bytes gzip in ${scripts.length} scripts (${routeId})`);
  } else {
    console.log("| page | scripts | JavaScript (gzip) | budget | |\n|---|---|---|---|---|");
    for (const page of PAGE_SCRIPT_BUDGETS) {
      const scripts = pageScripts(buildFolder, page.route);
      const total = scripts.reduce((sum, script) => sum + script.gzipBytes, 0);
      const met = page.budget === null ? null : total < page.budget;
      const verdict = met === null ? "no budget" : met ? "met" : "MISSED";
      console.log(`| ${page.name} | ${scripts.length} | ${total.toLocaleString("en")} bytes | ${page.budget === null ? "—" : `< ${page.budget.toLocaleString("en")}`} | ${verdict} |`);
    }
  }
}
