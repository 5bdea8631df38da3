// Accounts: signing up, in and out, verification, passwords, settings, roles and inspector applications.
// Sign-in and sign-up from our own pages go through better-auth's HTTP handler (not `auth.api`), so that its
// rate limiter counts them exactly like calls to /api/auth.
import { and, asc, desc, eq, ilike, inArray, or, sql } from "drizzle-orm";
import { getDatabase } from "~/db/client.server";
import { env } from "~/env.server";
import { getAuth } from "./auth.server";
import { sendInspectorDecisionEmail } from "./emails.server";
import { CLIENT_ADDRESS_HEADER, clientAddress, clientKey, reserveSignInAttempt, settleSignInAttempt } from "./limits.server";
import { inspectorApplication, user, userRole } from "./schema";
import { emailAddress, type DisplayUnits, type Role } from "./validation";

export type Failure = {
  ok: false;
  status: number;
  code: string;
  message: string;
  /** The form field the message belongs to, when it belongs to one. */
  field?: string;
  retryAfterSeconds?: number;
};
export type Success<T = object> = { ok: true; headers: Headers } & T;

/** The Set-Cookie lines of a better-auth answer, ready to hand on with a redirect. */
function cookieHeaders(response: Response): Headers {
  const headers = new Headers();
  for (const cookie of response.headers.getSetCookie()) headers.append("Set-Cookie", cookie);
  return headers;
}

// Headers of the visitor's request that better-auth needs: their session, their browser (their address is
// worked out by us, see withClientAddress).
const forwardedHeaders = ["cookie", "user-agent", "accept-language"];

/** The request's headers with the client address as we trust it, and none of the client's own claims of one. */
function withClientAddress(request: Request, headers: Headers): Headers {
  headers.delete("x-forwarded-for");
  headers.delete(CLIENT_ADDRESS_HEADER);
  const address = clientAddress(request);
  if (address) headers.set(CLIENT_ADDRESS_HEADER, address);
  return headers;
}

/** Calls one better-auth endpoint through its HTTP handler, on behalf of the visitor's request. */
async function callAuthEndpoint(request: Request, path: string, body?: object, method: "GET" | "POST" = "POST") {
  const headers = withClientAddress(request, new Headers({ origin: env().APP_ORIGIN }));
  for (const name of forwardedHeaders) {
    const value = request.headers.get(name);
    if (value) headers.set(name, value);
  }
  if (body) headers.set("content-type", "application/json");
  const internal = new Request(`${env().APP_ORIGIN}/api/auth${path}`, { method, headers, body: body ? JSON.stringify(body) : undefined });
  const response = await getAuth().handler(internal);
  let payload: { code?: string; message?: string; [key: string]: unknown } = {};
  if (response.headers.get("content-type")?.includes("application/json")) payload = await response.clone().json();
  return { response, payload };
}

function tooManyRequests(response: Response, message: string): Failure {
  const retryAfterSeconds = Number(response.headers.get("x-retry-after") ?? 60) || 60;
  return { ok: false, status: 429, code: "TOO_MANY_REQUESTS", message, retryAfterSeconds };
}

function unexpected(response: Response, payload: { code?: string; message?: string }): never {
  throw new Error(`better-auth answered ${response.status} ${payload.code ?? ""} ${payload.message ?? ""}`.trim());
}

const minutes = (seconds: number) => Math.max(1, Math.ceil(seconds / 60));

export function wrongPasswordLimitMessage(retryAfterSeconds: number) {
  const wait = retryAfterSeconds < 90 ? `${retryAfterSeconds} seconds` : `${minutes(retryAfterSeconds)} minutes`;
  return `Too many wrong passwords for this account. Wait ${wait} and try again, or reset your password.`;
}

const signInOutcome = (status: number) => (status === 200 ? "signed-in" : status === 401 || status === 400 ? "wrong-password" : "not-checked");

/**
 * Signs in with e-mail and password, counting wrong passwords per account (limits.server.ts).
 * The only door for password sign-in: our page and /api/auth/sign-in/email both come here.
 */
export async function signInWithPassword(request: Request, input: { email: string; password: string }): Promise<Success<{ userId: string }> | Failure> {
  const email = input.email.trim().toLowerCase();
  const limit = await reserveSignInAttempt(email, clientKey(request));
  if (limit.limited) return { ok: false, status: 429, code: "TOO_MANY_ATTEMPTS", message: wrongPasswordLimitMessage(limit.retryAfterSeconds), retryAfterSeconds: limit.retryAfterSeconds };

  let result: Awaited<ReturnType<typeof callAuthEndpoint>> | undefined;
  try {
    result = await callAuthEndpoint(request, "/sign-in/email", { email, password: input.password, rememberMe: true });
  } finally {
    await settleSignInAttempt(email, limit.attemptId, result ? signInOutcome(result.response.status) : "not-checked");
  }
  const { response, payload } = result;
  if (response.status === 200) return { ok: true, headers: cookieHeaders(response), userId: (payload.user as { id: string }).id };
  if (response.status === 429) return tooManyRequests(response, "Too many sign-in attempts from your network. Wait a minute and try again.");
  if (response.status === 401 || response.status === 400) {
    return { ok: false, status: 401, code: "INVALID_EMAIL_OR_PASSWORD", message: "That e-mail address and password do not match an account. Check both and try again.", field: "password" };
  }
  return unexpected(response, payload);
}

/** A JSON value with every `token` field taken out (better-auth puts the session token in several answers). */
function withoutTokens(value: unknown, depth = 0): unknown {
  if (depth > 4 || value === null || typeof value !== "object") return value;
  if (Array.isArray(value)) return value.map((item) => withoutTokens(item, depth + 1));
  return Object.fromEntries(Object.entries(value).filter(([key]) => key !== "token").map(([key, item]) => [key, withoutTokens(item, depth + 1)]));
}

/**
 * better-auth answers sign-in, sign-up, get-session and list-sessions with the session token in the JSON body,
 * where any script on the page could read it; the HttpOnly cookie is the only place it belongs.
 */
async function withoutSessionTokens(response: Response): Promise<Response> {
  if (!response.headers.get("content-type")?.includes("application/json")) return response;
  const text = await response.text();
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch {
    return new Response(text, response);
  }
  const headers = new Headers(response.headers);
  headers.delete("content-length");
  return new Response(JSON.stringify(withoutTokens(body)), { status: response.status, statusText: response.statusText, headers });
}

/**
 * The /api/auth/* resource route: better-auth's handler, given the client address as we trust it, with our
 * wrong-password limit on sign-in, and no session token in any body it answers with.
 */
export async function handleAuthRequest(incoming: Request): Promise<Response> {
  return withoutSessionTokens(await handleAuthEndpoint(incoming));
}

async function handleAuthEndpoint(incoming: Request): Promise<Response> {
  const request = new Request(incoming, { headers: withClientAddress(incoming, new Headers(incoming.headers)) });
  const url = new URL(request.url);
  if (request.method === "POST" && url.pathname === "/api/auth/sign-in/email") {
    const body = (await request
      .clone()
      .json()
      .catch(() => null)) as { email?: unknown } | null;
    // The address is read as our forms read it, so that a megabyte or a NUL is a 400, not a failed insert.
    const address = body?.email === undefined ? null : emailAddress.safeParse(body.email);
    if (address && !address.success) return Response.json({ code: "INVALID_EMAIL", message: address.error.issues[0]!.message }, { status: 400 });
    const email = address?.data ?? null;
    if (email) {
      const limit = await reserveSignInAttempt(email, clientKey(incoming));
      if (limit.limited) {
        return Response.json(
          { code: "TOO_MANY_ATTEMPTS", message: wrongPasswordLimitMessage(limit.retryAfterSeconds) },
          { status: 429, headers: { "Retry-After": String(limit.retryAfterSeconds), "X-Retry-After": String(limit.retryAfterSeconds) } },
        );
      }
      let status = 0;
      try {
        const response = await getAuth().handler(request);
        status = response.status;
        return response;
      } finally {
        await settleSignInAttempt(email, limit.attemptId, signInOutcome(status));
      }
    }
  }
  return getAuth().handler(request);
}

export type SignUpInput = { name: string; email: string; password: string; sells: boolean };

/** Creates the account (and signs it in); the verification e-mail is queued by better-auth's hook. */
export async function signUp(request: Request, input: SignUpInput): Promise<Success<{ userId: string }> | Failure> {
  const { response, payload } = await callAuthEndpoint(request, "/sign-up/email", { name: input.name, email: input.email, password: input.password });
  if (response.status === 429) return tooManyRequests(response, "Too many accounts were created from your network just now. Wait a minute and try again.");
  if (response.status === 422 || payload.code === "USER_ALREADY_EXISTS" || payload.code === "USER_ALREADY_EXISTS_USE_ANOTHER_EMAIL") {
    return { ok: false, status: 422, code: "USER_ALREADY_EXISTS", field: "email", message: "An account with this address already exists. Sign in, or reset its password." };
  }
  if (response.status === 400 && payload.code?.startsWith("PASSWORD")) {
    return { ok: false, status: 422, code: payload.code, field: "password", message: payload.message ?? "Choose another password." };
  }
  if (response.status !== 200) return unexpected(response, payload);
  const userId = (payload.user as { id: string }).id;
  if (input.sells) await grantRole(userId, "seller");
  return { ok: true, headers: cookieHeaders(response), userId };
}

export async function signOut(request: Request): Promise<Headers> {
  const { response, payload } = await callAuthEndpoint(request, "/sign-out", {});
  if (response.status !== 200 && response.status !== 401) unexpected(response, payload);
  return cookieHeaders(response);
}

/** Confirms an address from the link in the e-mail; signs the person in when they were not. */
export async function verifyEmailToken(request: Request, token: string): Promise<Success | Failure> {
  const { response, payload } = await callAuthEndpoint(request, `/verify-email?token=${encodeURIComponent(token)}`, undefined, "GET");
  if (response.status === 200) return { ok: true, headers: cookieHeaders(response) };
  if (response.status === 401 || response.status === 400) {
    return { ok: false, status: 400, code: payload.code ?? "INVALID_TOKEN", message: "This confirmation link has expired or was already used. Sign in and ask for a new one." };
  }
  return unexpected(response, payload);
}

/** Queues a new verification e-mail for the signed-in person. */
export async function resendVerificationEmail(request: Request, email: string): Promise<Success | Failure> {
  const { response, payload } = await callAuthEndpoint(request, "/send-verification-email", { email });
  if (response.status === 429) return tooManyRequests(response, "You asked for several e-mails just now. Wait a minute and try again.");
  if (response.status === 200) return { ok: true, headers: new Headers() };
  if (response.status === 400) return { ok: false, status: 400, code: payload.code ?? "ALREADY_VERIFIED", message: payload.message ?? "This address is already confirmed." };
  return unexpected(response, payload);
}

/** Queues a reset link when the address has an account; says nothing either way, to keep accounts private. */
export async function requestPasswordReset(request: Request, email: string): Promise<Success | Failure> {
  const { response, payload } = await callAuthEndpoint(request, "/request-password-reset", { email, redirectTo: `${env().APP_ORIGIN}/reset-password` });
  if (response.status === 429) return tooManyRequests(response, "You asked for several links just now. Wait a minute and try again.");
  if (response.status !== 200) return unexpected(response, payload);
  return { ok: true, headers: new Headers() };
}

/** Sets a new password from a reset link; every session of the account ends. */
export async function resetPassword(request: Request, input: { token: string; password: string }): Promise<Success | Failure> {
  const { response, payload } = await callAuthEndpoint(request, "/reset-password", { token: input.token, newPassword: input.password });
  if (response.status === 200) return { ok: true, headers: new Headers() };
  if (response.status === 400 && (payload.code === "INVALID_TOKEN" || payload.code === "TOKEN_EXPIRED")) {
    return { ok: false, status: 400, code: payload.code, message: "This reset link has expired or was already used. Ask for a new one." };
  }
  if (response.status === 400 && payload.code?.startsWith("PASSWORD")) {
    return { ok: false, status: 422, code: payload.code, field: "password", message: payload.message ?? "Choose another password." };
  }
  return unexpected(response, payload);
}

/** Changes the password of the signed-in person and ends their other sessions. */
export async function changePassword(request: Request, input: { currentPassword: string; newPassword: string }): Promise<Success | Failure> {
  const { response, payload } = await callAuthEndpoint(request, "/change-password", { ...input, revokeOtherSessions: true });
  if (response.status === 200) return { ok: true, headers: cookieHeaders(response) };
  if (response.status === 429) return tooManyRequests(response, "Too many attempts just now. Wait a minute and try again.");
  if (response.status === 400 && payload.code === "INVALID_PASSWORD") {
    return { ok: false, status: 422, code: "INVALID_PASSWORD", field: "currentPassword", message: "That is not your current password." };
  }
  if (response.status === 400 && payload.code?.startsWith("PASSWORD")) {
    return { ok: false, status: 422, code: payload.code, field: "newPassword", message: payload.message ?? "Choose another password." };
  }
  return unexpected(response, payload);
}

export async function updateProfile(userId: string, input: { name: string; displayUnits: DisplayUnits }) {
  await getDatabase().update(user).set({ name: input.name, displayUnits: input.displayUnits, updatedAt: new Date() }).where(eq(user.id, userId));
}

// ---- Roles ----

export async function grantRole(userId: string, role: Exclude<Role, "buyer">) {
  await getDatabase().insert(userRole).values({ userId, role }).onConflictDoNothing();
}

export async function revokeRole(userId: string, role: Exclude<Role, "buyer">) {
  await getDatabase()
    .delete(userRole)
    .where(and(eq(userRole.userId, userId), eq(userRole.role, role)));
}

export type InspectorStatus = "none" | "pending" | "certified" | "rejected";

/** Every account is a buyer; the other roles are granted. */
export async function rolesOf(userIds: string[]): Promise<Map<string, Role[]>> {
  const roles = new Map<string, Role[]>(userIds.map((id) => [id, ["buyer"]]));
  if (!userIds.length) return roles;
  const rows = await getDatabase().select().from(userRole).where(inArray(userRole.userId, userIds)).orderBy(asc(userRole.role));
  for (const row of rows) if (row.role !== "buyer") roles.get(row.userId)!.push(row.role);
  return roles;
}

/** Where each person stands as an inspector: certified by role, else their latest application. */
export async function inspectorStatusOf(userIds: string[], roles: Map<string, Role[]>): Promise<Map<string, InspectorStatus>> {
  const statuses = new Map<string, InspectorStatus>(userIds.map((id) => [id, roles.get(id)?.includes("inspector") ? "certified" : "none"]));
  const open = userIds.filter((id) => statuses.get(id) === "none");
  if (!open.length) return statuses;
  const rows = await getDatabase()
    .selectDistinctOn([inspectorApplication.userId], { userId: inspectorApplication.userId, status: inspectorApplication.status })
    .from(inspectorApplication)
    .where(inArray(inspectorApplication.userId, open))
    .orderBy(inspectorApplication.userId, desc(inspectorApplication.createdAt));
  for (const row of rows) statuses.set(row.userId, row.status === "pending" ? "pending" : row.status === "rejected" ? "rejected" : "none");
  return statuses;
}

// ---- Accounts made by the server (demo data, tests) ----

export type NewAccount = {
  name: string;
  email: string;
  password: string;
  verified?: boolean;
  roles?: Role[];
  inspectorStatus?: InspectorStatus;
  displayUnits?: DisplayUnits;
};

/** Creates an account without e-mail or rate limit, through better-auth's own adapter and password hashing. */
export async function createAccount(input: NewAccount): Promise<{ id: string }> {
  const context = await getAuth().$context;
  const hash = await context.password.hash(input.password);
  const created = await context.internalAdapter.createUser({
    name: input.name,
    email: input.email.toLowerCase(),
    emailVerified: input.verified ?? true,
    displayUnits: input.displayUnits ?? "mm",
  }, { method: "admin" });
  await context.internalAdapter.linkAccount({ userId: created.id, providerId: "credential", accountId: created.id, password: hash });
  const roles = new Set(input.roles ?? []);
  const inspectorStatus = input.inspectorStatus ?? (roles.has("inspector") ? "certified" : "none");
  for (const role of roles) if (role !== "buyer" && role !== "inspector") await grantRole(created.id, role);
  if (inspectorStatus !== "none") {
    await getDatabase()
      .insert(inspectorApplication)
      .values({
        userId: created.id,
        qualifications: "Machine-tool fitter with years of geometry checks on centre lathes; owns a calibrated 1 µm dial test indicator and a test mandrel set.",
        regions: ["Westmarch"],
        categories: ["centre_lathe"],
        status: inspectorStatus === "certified" ? "approved" : inspectorStatus,
        decidedAt: inspectorStatus === "pending" ? null : new Date(),
        decisionReason: inspectorStatus === "rejected" ? "Could not confirm the qualifications given." : null,
      });
    if (inspectorStatus === "certified") await grantRole(created.id, "inspector");
  }
  return { id: created.id };
}

export async function findUserIdByEmail(email: string): Promise<string | null> {
  const [row] = await getDatabase().select({ id: user.id }).from(user).where(eq(user.email, email.toLowerCase()));
  return row?.id ?? null;
}

// ---- Inspector applications ----

export type ApplicationInput = { qualifications: string; regions: string[]; categories: string[] };

export async function latestApplicationOf(userId: string) {
  const [row] = await getDatabase()
    .select()
    .from(inspectorApplication)
    .where(eq(inspectorApplication.userId, userId))
    .orderBy(desc(inspectorApplication.createdAt))
    .limit(1);
  return row ?? null;
}

export async function submitInspectorApplication(userId: string, input: ApplicationInput): Promise<{ ok: true } | Failure> {
  const roles = (await rolesOf([userId])).get(userId)!;
  if (roles.includes("inspector")) return { ok: false, status: 409, code: "ALREADY_CERTIFIED", message: "You are already a certified inspector." };
  const inserted = await getDatabase()
    .insert(inspectorApplication)
    .values({ userId, qualifications: input.qualifications, regions: input.regions, categories: input.categories })
    .onConflictDoNothing()
    .returning({ id: inspectorApplication.id });
  if (!inserted.length) return { ok: false, status: 409, code: "ALREADY_PENDING", message: "Your application is already waiting for a decision." };
  return { ok: true };
}

export async function listPendingApplications() {
  return getDatabase()
    .select({
      id: inspectorApplication.id,
      userId: inspectorApplication.userId,
      name: user.name,
      email: user.email,
      emailVerified: user.emailVerified,
      qualifications: inspectorApplication.qualifications,
      regions: inspectorApplication.regions,
      categories: inspectorApplication.categories,
      createdAt: inspectorApplication.createdAt,
    })
    .from(inspectorApplication)
    .innerJoin(user, eq(user.id, inspectorApplication.userId))
    .where(eq(inspectorApplication.status, "pending"))
    .orderBy(asc(inspectorApplication.createdAt));
}

/** An admin's approval (grants the inspector role) or rejection, with the reason e-mailed to the applicant. */
export async function decideApplication(
  adminId: string,
  input: { applicationId: string; decision: "approve" | "reject"; reason?: string },
): Promise<{ ok: true; approved: boolean } | Failure> {
  const approved = input.decision === "approve";
  const reason = input.reason?.trim() || null;
  const decided = await getDatabase().transaction(async (tx) => {
    const [application] = await tx
      .update(inspectorApplication)
      .set({ status: approved ? "approved" : "rejected", decisionReason: reason, decidedBy: adminId, decidedAt: new Date() })
      .where(and(eq(inspectorApplication.id, input.applicationId), eq(inspectorApplication.status, "pending")))
      .returning({ userId: inspectorApplication.userId });
    if (!application) return null;
    if (approved) await tx.insert(userRole).values({ userId: application.userId, role: "inspector" }).onConflictDoNothing();
    const [applicant] = await tx.select({ email: user.email, name: user.name }).from(user).where(eq(user.id, application.userId));
    return applicant!;
  });
  if (!decided) return { ok: false, status: 409, code: "ALREADY_DECIDED", message: "This application was already decided, or does not exist." };
  await sendInspectorDecisionEmail(decided, { approved, reason });
  return { ok: true, approved };
}

// ---- Admin: people ----

export async function listUsers(options: { search?: string; role?: Role; limit?: number; offset?: number } = {}) {
  const conditions = [];
  if (options.search) {
    const pattern = `%${options.search.replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
    conditions.push(or(ilike(user.name, pattern), ilike(user.email, pattern)));
  }
  if (options.role && options.role !== "buyer") {
    conditions.push(sql`exists (select 1 from ${userRole} where ${userRole.userId} = ${user.id} and ${userRole.role} = ${options.role})`);
  }
  const where = conditions.length ? and(...conditions) : undefined;
  const limit = options.limit ?? 50;
  const [rows, [total]] = await Promise.all([
    getDatabase()
      .select({ id: user.id, name: user.name, email: user.email, emailVerified: user.emailVerified, createdAt: user.createdAt })
      .from(user)
      .where(where)
      .orderBy(desc(user.createdAt))
      .limit(limit)
      .offset(options.offset ?? 0),
    getDatabase().select({ count: sql<number>`count(*)::int` }).from(user).where(where),
  ]);
  const ids = rows.map((row) => row.id);
  const roles = await rolesOf(ids);
  const statuses = await inspectorStatusOf(ids, roles);
  return {
    total: total?.count ?? 0,
    users: rows.map((row) => ({ ...row, roles: roles.get(row.id)!, inspectorStatus: statuses.get(row.id)! })),
  };
}
