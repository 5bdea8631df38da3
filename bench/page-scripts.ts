// The scripts a first visit to a page downloads, from a production build's React Router manifest, each
// gzipped at level 9 as the system bench measures them: a quick check of the search page's 120 KB budget
// without a full bench run. `npm run build && npx tsx bench/page-scripts.ts [build-folder] [route id]`.
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

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  const [buildFolder = "build", routeId = "routes/search/machines"] = process.argv.slice(2);
  const scripts = pageScripts(buildFolder, routeId);
  for (const script of scripts) console.log(`${String(script.gzipBytes).padStart(8)}  ${script.url}`);
  const total = scripts.reduce((sum, script) => sum + script.gzipBytes, 0);
  console.log(`${String(total).padStart(8)}  bytes gzip in ${scripts.length} scripts (${routeId}; the search page's budget is 120 000)`);
}
