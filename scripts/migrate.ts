// `npm run db:migrate`: applies the migrations to a PostgreSQL of your own (production) as the owner role
// (DATABASE_OWNER_URL), then grants the app's role (the user of DATABASE_URL) what it may do with the tables.
// `npm start` and `npm test` do this themselves for their local clusters.
import path from "node:path";
import { roleOf } from "./lib/database-roles.ts";
import { runMigrations } from "./lib/migrate.ts";

const root = path.resolve(import.meta.dirname, "..");
try {
  process.loadEnvFile(path.join(root, ".env"));
} catch {
  // no .env: the environment alone
}
const ownerUrl = process.env.DATABASE_OWNER_URL;
const appUrl = process.env.DATABASE_URL;
if (!ownerUrl || !appUrl) {
  console.error("Set DATABASE_OWNER_URL (the role that owns the tables) and DATABASE_URL (the app's role, which owns none).");
  process.exit(1);
}
if (roleOf(ownerUrl) === roleOf(appUrl)) {
  console.error("DATABASE_OWNER_URL and DATABASE_URL name the same role: the app must connect as a role that owns no table.");
  process.exit(1);
}
await runMigrations(ownerUrl, roleOf(appUrl));
