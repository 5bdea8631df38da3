import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import { Button, TextField } from "~/components/ui";
import { AuthCard, EmailAddressField, FormMessage } from "~/modules/accounts/components/auth-card";
import { failureReply, invalidReply } from "~/modules/accounts/forms.server";
import { getOptionalUser } from "~/modules/accounts/guards.server";
import { signInWithPassword } from "~/modules/accounts/service.server";
import { redirectTo as redirectToSchema, signInSchema } from "~/modules/accounts/validation";
import type { Route } from "./+types/sign-in";

export const meta: Route.MetaFunction = () => [{ title: "Sign in — Tenthmark" }];

export async function loader({ request }: Route.LoaderArgs) {
  const url = new URL(request.url);
  const redirectTo = redirectToSchema.parse(url.searchParams.get("redirectTo") ?? undefined);
  if (await getOptionalUser(request)) throw redirect(redirectTo ?? "/account");
  return { redirectTo: redirectTo ?? "", passwordChanged: url.searchParams.has("reset") };
}

// A 429 tells the client when to try again.
export const headers: Route.HeadersFunction = ({ actionHeaders, loaderHeaders }) => (actionHeaders.has("Retry-After") ? actionHeaders : loaderHeaders);

export async function action({ request }: Route.ActionArgs) {
  const submission = parseWithZod(await request.formData(), { schema: signInSchema });
  if (submission.status !== "success") return invalidReply(submission, { hideFields: ["password"] });
  const outcome = await signInWithPassword(request, submission.value);
  if (!outcome.ok) return failureReply(submission, outcome, { hideFields: ["password"], asFormError: true });
  throw redirect(submission.value.redirectTo ?? "/", { headers: outcome.headers });
}

export default function SignIn() {
  const { redirectTo, passwordChanged } = useLoaderData<typeof loader>();
  const actionData = useActionData<typeof action>();
  const busy = useNavigation().state === "submitting";
  const [form, fields] = useForm({
    id: "sign-in",
    lastResult: actionData?.result,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: signInSchema }),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
  });
  const signUpHref = redirectTo ? `/sign-up?redirectTo=${encodeURIComponent(redirectTo)}` : "/sign-up";
  return (
    <AuthCard
      title="Sign in"
      lead="Welcome back. Sign in to list machines, book inspections or file reports."
      footer={
        <>
          New to Tenthmark?{" "}
          <Link to={signUpHref} className="font-semibold text-ink-900 underline underline-offset-4">
            Create an account
          </Link>
        </>
      }
    >
      <Form method="post" {...getFormProps(form)} className="space-y-5">
        {passwordChanged ? <FormMessage tone="within">Your password was changed. Sign in with the new one.</FormMessage> : null}
        {form.errors?.length ? <FormMessage>{form.errors.join(" ")}</FormMessage> : null}
        <input type="hidden" name="redirectTo" value={redirectTo} />
        <EmailAddressField field={fields.email} />
        <TextField
          label="Password"
          type="password"
          autoComplete="current-password"
          name={fields.password.name}
          key={fields.password.key}
          errors={fields.password.errors}
          required
        />
        <div className="flex flex-wrap items-center justify-between gap-3">
          <Button type="submit" size="lg" disabled={busy} className="w-full sm:w-auto">
            {busy ? "Signing in…" : "Sign in"}
          </Button>
          <Link to="/forgot-password" className="text-sm font-semibold text-ink-700 underline underline-offset-4">
            Forgot your password?
          </Link>
        </div>
      </Form>
    </AuthCard>
  );
}
