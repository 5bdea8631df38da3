// Who is signed in and what they may do. Called in every loader and action that needs it.
import { getSessionCookie } from "better-auth/cookies";
import { data, redirect } from "react-router";
import { getAuth, SESSION_COOKIE_PREFIX } from "./auth.server";
import { inspectorStatusOf, rolesOf, type InspectorStatus } from "./service.server";
import type { DisplayUnits, Role } from "./validation";

export type { Role } from "./validation";

export type SessionUser = {
  id: string;
  email: string;
  name: string;
  emailVerified: boolean;
  roles: Role[];
  displayUnits: DisplayUnits;
  inspectorStatus: InspectorStatus;
};

// Loaders of one request share its Request object: look the session up once per request.
const perRequest = new WeakMap<Request, Promise<SessionUser | null>>();

/**
 * Whether the request carries a session cookie at all (better-auth's own first check). Without one nobody is
 * signed in: most visitors to public pages are spared the session look-up, and may be sent a shared page.
 */
export function hasSessionCookie(request: Request): boolean {
  return Boolean(getSessionCookie(request.headers, { cookiePrefix: SESSION_COOKIE_PREFIX }));
}

async function loadUser(request: Request): Promise<SessionUser | null> {
  if (!hasSessionCookie(request)) return null;
  const found = await getAuth().api.getSession({ headers: request.headers });
  if (!found) return null;
  const { user } = found;
  const roles = await rolesOf([user.id]);
  const statuses = await inspectorStatusOf([user.id], roles);
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    emailVerified: user.emailVerified,
    roles: roles.get(user.id)!,
    displayUnits: (user as { displayUnits?: string }).displayUnits === "inch" ? "inch" : "mm",
    inspectorStatus: statuses.get(user.id)!,
  };
}

export function getOptionalUser(request: Request): Promise<SessionUser | null> {
  let pending = perRequest.get(request);
  if (!pending) {
    pending = loadUser(request);
    perRequest.set(request, pending);
  }
  return pending;
}

/** The path and query of this request, to come back to after signing in. */
function currentPath(request: Request) {
  const url = new URL(request.url);
  // A data request of a client-side navigation carries `.data` and `_routes`: come back to the page itself.
  const pathname = url.pathname.replace(/\.data$/, "").replace(/^\/_root$/, "/");
  url.searchParams.delete("_routes");
  const search = url.searchParams.toString();
  return `${pathname || "/"}${search ? `?${search}` : ""}`;
}

export async function requireUser(request: Request): Promise<SessionUser> {
  const user = await getOptionalUser(request);
  if (!user) throw redirect(`/sign-in?${new URLSearchParams({ redirectTo: currentPath(request) })}`);
  return user;
}

/** Selling, booking and applying need a confirmed address: the page says so and offers a new link. */
export async function requireVerifiedUser(request: Request): Promise<SessionUser> {
  const user = await requireUser(request);
  if (!user.emailVerified) throw redirect(`/verify-email?${new URLSearchParams({ redirectTo: currentPath(request) })}`);
  return user;
}

export function hasRole(user: SessionUser | null, role: Role): boolean {
  return Boolean(user?.roles.includes(role));
}

const roleNames: Record<Role, string> = {
  buyer: "a buyer's account",
  seller: "a seller's account",
  inspector: "a certified inspector's account",
  admin: "a staff account",
};

/** Signed in and holding one of the roles; otherwise a 403 page that says what is needed. */
export async function requireRole(request: Request, role: Role | Role[]): Promise<SessionUser> {
  const user = await requireUser(request);
  const wanted = Array.isArray(role) ? role : [role];
  if (wanted.some((candidate) => hasRole(user, candidate))) return user;
  throw data(`This page needs ${wanted.map((candidate) => roleNames[candidate]).join(" or ")}. You are signed in as ${user.email}, which does not have it.`, { status: 403 });
}

/** Staff may act on anything; everyone else only on what is theirs. */
export function requireOwnership(user: SessionUser, ownerId: string, what = "this"): void {
  if (user.id === ownerId || hasRole(user, "admin")) return;
  throw data(`Only the owner of ${what} can do that. You are signed in as ${user.email}.`, { status: 403 });
}
