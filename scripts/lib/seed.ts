// Demo data for `npm start` on an empty database. It is an invented scenario: invented dealers, makes,
// people and places. Each domain adds its part here as it lands.
import { log } from "./output.ts";

export type DemoSignIn = { role: string; email: string; password: string };

export function demoSignIns(): DemoSignIn[] {
  return [];
}

export async function seedDemoDataIfEmpty(_databaseUrl: string) {
  log("postgres", "no demo data to load yet");
}
