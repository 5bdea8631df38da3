// `npm run bench`: runs every benchmark of the product and prints one table. Each benchmark module in this
// folder exports a `run…Bench()` function and writes its own JSON under bench/results/.
import { readdirSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";

const folder = import.meta.dirname;
const modules = readdirSync(folder).filter((file) => file.endsWith(".ts") && file !== "run.ts" && !file.startsWith("lib"));

let failed = false;
for (const file of modules.sort()) {
  const module = await import(pathToFileURL(path.join(folder, file)).href);
  const runner = Object.entries(module).find(([name, value]) => /^run\w*Bench$/.test(name) && typeof value === "function");
  if (!runner) continue;
  console.log(`\n== ${file} ==`);
  try {
    await (runner[1] as () => Promise<unknown>)();
  } catch (error) {
    failed = true;
    console.error(`${file} failed: ${error instanceof Error ? error.message : String(error)}`);
  }
}
process.exit(failed ? 1 : 0);
