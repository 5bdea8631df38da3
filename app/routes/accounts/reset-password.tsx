import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import { Button, TextField } from "~/components/ui";
import { AuthCard, FormMessage } from "~/modules/accounts/components/auth-card";
import { failureReply, invalidReply } from "~/modules/accounts/forms.server";
import { resetPassword } from "~/modules/accounts/service.server";
import { resetPasswordSchema } from "~/modules/accounts/validation";
import type { Route } from "./+types/reset-password";

export const meta: Route.MetaFunction = () => [{ title: "Choose a new password — Tenthmark" }];

export async function loader({ request }: Route.LoaderArgs) {
  const url = new URL(request.url);
  // better-auth's own link lands with ?error=INVALID_TOKEN when the token is bad.
  return { token: url.searchParams.get("token") ?? "", linkError: url.searchParams.has("error") };
}

export async function action({ request }: Route.ActionArgs) {
  const submission = parseWithZod(await request.formData(), { schema: resetPasswordSchema });
  if (submission.status !== "success") return invalidReply(submission, { hideFields: ["password", "confirmPassword"] });
  const outcome = await resetPassword(request, submission.value);
  if (!outcome.ok) return failureReply(submission, outcome, { hideFields: ["password", "confirmPassword"] });
  throw redirect("/sign-in?reset=1");
}

export default function ResetPassword() {
  const { token, linkError } = useLoaderData<typeof loader>();
  const actionData = useActionData<typeof action>();
  const busy = useNavigation().state === "submitting";
  const [form, fields] = useForm({
    id: "reset-password",
    lastResult: actionData?.result,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: resetPasswordSchema }),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
  });
  if (!token || linkError) {
    return (
      <AuthCard title="This link no longer works">
        <div className="space-y-4">
          <FormMessage>This reset link is incomplete, has expired or was already used.</FormMessage>
          <Link to="/forgot-password" className="font-semibold text-ink-900 underline underline-offset-4">
            Ask for a new link
          </Link>
        </div>
      </AuthCard>
    );
  }
  return (
    <AuthCard title="Choose a new password" lead="Setting a new password signs you out on every device.">
      <Form method="post" {...getFormProps(form)} className="space-y-5">
        {form.errors?.length ? (
          <FormMessage>
            {form.errors.join(" ")}{" "}
            <Link to="/forgot-password" className="underline underline-offset-4">
              Ask for a new link
            </Link>
          </FormMessage>
        ) : null}
        <input type="hidden" name="token" value={token} />
        <TextField
          label="New password"
          type="password"
          autoComplete="new-password"
          hint="At least 10 characters."
          name={fields.password.name}
          key={fields.password.key}
          errors={fields.password.errors}
          required
          minLength={10}
        />
        <TextField
          label="New password again"
          type="password"
          autoComplete="new-password"
          name={fields.confirmPassword.name}
          key={fields.confirmPassword.key}
          errors={fields.confirmPassword.errors}
          required
        />
        <Button type="submit" size="lg" disabled={busy} className="w-full sm:w-auto">
          {busy ? "Saving…" : "Save new password"}
        </Button>
      </Form>
    </AuthCard>
  );
}
