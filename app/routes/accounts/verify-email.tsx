import { data, Form, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import { Button, ButtonLink } from "~/components/ui";
import { AuthCard, FormMessage } from "~/modules/accounts/components/auth-card";
import { getOptionalUser, requireUser } from "~/modules/accounts/guards.server";
import { resendVerificationEmail, verifyEmailToken } from "~/modules/accounts/service.server";
import { redirectTo as redirectToSchema } from "~/modules/accounts/validation";
import type { Route } from "./+types/verify-email";

export const meta: Route.MetaFunction = () => [{ title: "Confirm your e-mail address — Tenthmark" }];

export async function loader({ request }: Route.LoaderArgs) {
  const url = new URL(request.url);
  const token = url.searchParams.get("token");
  const redirectTo = redirectToSchema.parse(url.searchParams.get("redirectTo") ?? undefined);
  if (token) {
    const outcome = await verifyEmailToken(request, token);
    if (outcome.ok) throw redirect("/account?verified=1", { headers: outcome.headers });
    return data({ state: "invalid" as const, message: outcome.message, email: null, redirectTo: "", justSent: false }, { status: 400 });
  }
  const user = await getOptionalUser(request);
  if (user?.emailVerified) throw redirect(redirectTo ?? "/account");
  return { state: "waiting" as const, message: null, email: user?.email ?? null, redirectTo: redirectTo ?? "", justSent: url.searchParams.has("sent") };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  if (user.emailVerified) throw redirect("/account");
  const outcome = await resendVerificationEmail(request, user.email);
  if (!outcome.ok) return data({ sent: false, message: outcome.message }, { status: outcome.status });
  return { sent: true, message: `We sent a new link to ${user.email}.` };
}

export default function VerifyEmail() {
  const { state, message, email, redirectTo, justSent } = useLoaderData<typeof loader>();
  const actionData = useActionData<typeof action>();
  const busy = useNavigation().state === "submitting";
  if (state === "invalid") {
    return (
      <AuthCard title="This link no longer works">
        <div className="space-y-5">
          <FormMessage>{message}</FormMessage>
          <ButtonLink to="/verify-email" variant="secondary">
            Ask for a new link
          </ButtonLink>
        </div>
      </AuthCard>
    );
  }
  return (
    <AuthCard
      title="Confirm your e-mail address"
      lead={
        redirectTo && !justSent
          ? "The page you asked for needs a confirmed e-mail address: that is how buyers, sellers and inspectors know they can reach each other."
          : undefined
      }
    >
      <div className="space-y-5">
        {actionData ? <FormMessage tone={actionData.sent ? "within" : "beyond"}>{actionData.message}</FormMessage> : null}
        {email ? (
          <p className="text-ink-700">
            {justSent ? "We sent a link to " : "Open the link we sent to "}
            <strong className="text-ink-900">{email}</strong>
            {justSent ? ". Open it to confirm your address; it works for 24 hours." : " to confirm your address. It works for 24 hours."}
          </p>
        ) : (
          <p className="text-ink-700">Sign in, and we will send you a new confirmation link.</p>
        )}
        <p className="text-sm text-ink-500">Nothing arrived? Look in your spam folder, or ask for a new link.</p>
        {email ? (
          <Form method="post">
            <Button type="submit" variant="secondary" disabled={busy}>
              {busy ? "Sending…" : "Send a new link"}
            </Button>
          </Form>
        ) : (
          <ButtonLink to="/sign-in?redirectTo=%2Fverify-email">Sign in</ButtonLink>
        )}
      </div>
    </AuthCard>
  );
}
