import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, useActionData, useNavigation } from "react-router";
import { Button } from "~/components/ui";
import { AuthCard, EmailAddressField, FormMessage } from "~/modules/accounts/components/auth-card";
import { failureReply, invalidReply } from "~/modules/accounts/forms.server";
import { requestPasswordReset } from "~/modules/accounts/service.server";
import { forgotPasswordSchema } from "~/modules/accounts/validation";
import type { Route } from "./+types/forgot-password";

export const meta: Route.MetaFunction = () => [{ title: "Reset your password — Tenthmark" }];

// A 429 tells the client when to try again.
export const headers: Route.HeadersFunction = ({ actionHeaders, loaderHeaders }) => (actionHeaders.has("Retry-After") ? actionHeaders : loaderHeaders);

export async function action({ request }: Route.ActionArgs) {
  const submission = parseWithZod(await request.formData(), { schema: forgotPasswordSchema });
  if (submission.status !== "success") return invalidReply(submission);
  const outcome = await requestPasswordReset(request, submission.value.email);
  if (!outcome.ok) return failureReply(submission, outcome);
  return { result: submission.reply(), errors: {}, sentTo: submission.value.email };
}

export default function ForgotPassword() {
  const actionData = useActionData<typeof action>();
  const busy = useNavigation().state === "submitting";
  const [form, fields] = useForm({
    id: "forgot-password",
    lastResult: actionData?.result,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: forgotPasswordSchema }),
    shouldValidate: "onBlur",
  });
  const sentTo = actionData && "sentTo" in actionData ? actionData.sentTo : null;
  return (
    <AuthCard
      title="Reset your password"
      lead="Enter the address you signed up with, and we will send a link to choose a new password."
      footer={
        <Link to="/sign-in" className="font-semibold text-ink-900 underline underline-offset-4">
          Back to sign in
        </Link>
      }
    >
      {sentTo ? (
        <FormMessage tone="within">
          If an account uses {sentTo}, a link to choose a new password is on its way. It works once, for one hour.
        </FormMessage>
      ) : (
        <Form method="post" {...getFormProps(form)} className="space-y-5">
          {form.errors?.length ? <FormMessage>{form.errors.join(" ")}</FormMessage> : null}
          <EmailAddressField field={fields.email} />
          <Button type="submit" size="lg" disabled={busy} className="w-full sm:w-auto">
            {busy ? "Sending…" : "Send me a link"}
          </Button>
        </Form>
      )}
    </AuthCard>
  );
}
