import type { MiddlewareFunction } from "react-router";
import { getDatabase } from "./client.server";
import { databaseContext } from "./context";

/** Hands the process's one Drizzle client to every loader and action through the router context. */
export const databaseMiddleware: MiddlewareFunction<Response> = ({ context }, next) => {
  context.set(databaseContext, getDatabase());
  return next();
};
