import { createContext } from "react-router";
import type { Database } from "./client.server";

/** The Drizzle client, set by the root middleware and read by loaders and actions. */
export const databaseContext = createContext<Database>();
