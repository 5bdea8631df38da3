// better-auth on our PostgreSQL through its Drizzle adapter. Sessions, verification tokens and rate-limit
// counters all live in the database, so the app servers keep no state of their own.
import { betterAuth } from "better-auth";
import { APIError, createAuthMiddleware } from "better-auth/api";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { getDatabase } from "~/db/client.server";
import { env, sessionSecret } from "~/env.server";
import { CLIENT_ADDRESS_HEADER } from "./limits.server";
import { account, rateLimit, session, user, verification } from "./schema";
import { sendPasswordResetEmail, sendVerificationEmail } from "./emails.server";

export const MIN_PASSWORD_LENGTH = 10;

/** The session cookies' name prefix (`tenthmark.session_token`, `__Secure-` first over https). */
export const SESSION_COOKIE_PREFIX = "tenthmark";

/** The origins a form may post from: the public one, and its 127.0.0.1 twin for local work. */
export function trustedOrigins(origin = env().APP_ORIGIN): string[] {
  const url = new URL(origin);
  const twins = new Set([url.origin]);
  if (url.hostname === "localhost") twins.add(url.origin.replace("localhost", "127.0.0.1"));
  return [...twins];
}

/**
 * The claims of an e-mail token, read without checking its signature (better-auth checks that next). Only
 * used to refuse tokens of flows Tenthmark does not offer.
 */
function unverifiedClaims(token: unknown): Record<string, unknown> | null {
  if (typeof token !== "string") return null;
  try {
    return JSON.parse(Buffer.from(token.split(".")[1] ?? "", "base64url").toString("utf8")) as Record<string, unknown>;
  } catch {
    return null;
  }
}

/**
 * Tenthmark offers no change of e-mail address. better-auth's /verify-email would still carry one out for any
 * correctly signed token naming an `updateTo` address, whether or not changing e-mail is switched on, so
 * such tokens are refused here before better-auth reads them. A confirmation link carries exactly the
 * address and the account.
 */
const refuseOtherFlowsAtVerifyEmail = createAuthMiddleware(async (context) => {
  if (context.path !== "/verify-email") return;
  const claims = unverifiedClaims(context.query?.token);
  if (!claims) return;
  const allowed = new Set(["email", "userId", "iat", "exp"]);
  if (Object.keys(claims).some((claim) => !allowed.has(claim))) {
    throw new APIError("BAD_REQUEST", { code: "INVALID_TOKEN", message: "This link is not an e-mail confirmation link." });
  }
});

function createAuth() {
  const settings = env();
  const secure = settings.APP_ORIGIN.startsWith("https://");
  return betterAuth({
    appName: "Tenthmark",
    baseURL: settings.APP_ORIGIN,
    basePath: "/api/auth",
    secret: sessionSecret(settings),
    trustedOrigins: trustedOrigins(settings.APP_ORIGIN),
    telemetry: { enabled: false },
    database: drizzleAdapter(getDatabase(), { provider: "pg", schema: { user, session, account, verification, rateLimit } }),
    // Flows the product does not offer are off, and their endpoints answer 404.
    disabledPaths: ["/change-email", "/update-user", "/delete-user"],
    hooks: { before: refuseOtherFlowsAtVerifyEmail },
    user: {
      changeEmail: { enabled: false },
      deleteUser: { enabled: false },
      additionalFields: {
        displayUnits: { type: "string", required: false, defaultValue: "mm", input: false },
      },
    },
    session: { expiresIn: 60 * 60 * 24 * 30, updateAge: 60 * 60 * 24 },
    emailAndPassword: {
      enabled: true,
      minPasswordLength: MIN_PASSWORD_LENGTH,
      maxPasswordLength: 128,
      // People may sign in before verifying; selling and booking check verification (requireVerifiedUser).
      requireEmailVerification: false,
      autoSignIn: true,
      revokeSessionsOnPasswordReset: true,
      resetPasswordTokenExpiresIn: 60 * 60,
      sendResetPassword: async ({ user, token }) => sendPasswordResetEmail(user, token),
    },
    emailVerification: {
      sendOnSignUp: true,
      autoSignInAfterVerification: true,
      expiresIn: 60 * 60 * 24,
      sendVerificationEmail: async ({ user, token }) => sendVerificationEmail(user, token),
    },
    rateLimit: {
      // On in every environment, in PostgreSQL so that every app server counts the same requests.
      enabled: true,
      storage: "database",
      window: 60,
      max: 600,
      // Per client address (or one shared bucket when it cannot be known: no TRUSTED_PROXIES, as in local
      // runs): a flood guard. Guessing passwords is limited per account in limits.server.ts.
      customRules: {
        "/sign-in/email": { window: 60, max: settings.SIGN_IN_REQUESTS_PER_MINUTE },
        "/sign-up/email": { window: 60, max: 120 },
        "/request-password-reset": { window: 60, max: 60 },
        "/send-verification-email": { window: 60, max: 60 },
        "/change-password": { window: 60, max: 60 },
      },
    },
    advanced: {
      // The client address as our auth route worked it out (limits.server.ts: X-Forwarded-For only through
      // TRUSTED_PROXIES); the route removes any value a client sent under this name.
      ipAddress: { ipAddressHeaders: [CLIENT_ADDRESS_HEADER] },
      cookiePrefix: SESSION_COOKIE_PREFIX,
      // Secure only when the app is served over https: the local production build runs on http://localhost.
      useSecureCookies: secure,
      defaultCookieAttributes: { httpOnly: true, sameSite: "lax", secure },
    },
    logger: { level: "warn" },
  });
}

export type Auth = ReturnType<typeof createAuth>;

let auth: Auth | undefined;

/** The process's one better-auth instance. */
export function getAuth(): Auth {
  auth ??= createAuth();
  return auth;
}
