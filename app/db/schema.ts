// The database schema: each domain's tables live in its module and are re-exported here, so that
// drizzle-kit and the Drizzle client see one schema.
export * from "../modules/accounts/schema";
export * from "../modules/listings/schema";
export * from "../modules/inspections/schema";
export * from "../modules/reports/schema";
export * from "../modules/search/saved-searches/schema";
export * from "../modules/search/schema";
export * from "../modules/profiles/schema";
export * from "../modules/demand/schema";
export * from "../modules/rebuilds/schema";
export * from "../modules/machines/schema";
