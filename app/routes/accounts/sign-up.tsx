import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import { Button, TextField } from "~/components/ui";
import { AuthCard, EmailAddressField, FormMessage } from "~/modules/accounts/components/auth-card";
import { failureReply, invalidReply } from "~/modules/accounts/forms.server";
import { getOptionalUser } from "~/modules/accounts/guards.server";
import { signUp } from "~/modules/accounts/service.server";
import { redirectTo as redirectToSchema, signUpSchema } from "~/modules/accounts/validation";
import type { Route } from "./+types/sign-up";

export const meta: Route.MetaFunction = () => [{ title: "Create an account — Tenthmark" }];

export async function loader({ request }: Route.LoaderArgs) {
  const url = new URL(request.url);
  const redirectTo = redirectToSchema.parse(url.searchParams.get("redirectTo") ?? undefined);
  if (await getOptionalUser(request)) throw redirect(redirectTo ?? "/account");
  const role = url.searchParams.get("role");
  return { redirectTo: redirectTo ?? "", chosen: role === "seller" || role === "inspector" ? role : "buyer" };
}

// A 429 tells the client when to try again.
export const headers: Route.HeadersFunction = ({ actionHeaders, loaderHeaders }) => (actionHeaders.has("Retry-After") ? actionHeaders : loaderHeaders);

export async function action({ request }: Route.ActionArgs) {
  const submission = parseWithZod(await request.formData(), { schema: signUpSchema });
  if (submission.status !== "success") return invalidReply(submission, { hideFields: ["password"] });
  const outcome = await signUp(request, submission.value);
  if (!outcome.ok) return failureReply(submission, outcome, { hideFields: ["password"] });
  // Inspectors go on to their application; everyone is asked to confirm their address first.
  const next = submission.value.inspects ? "/account/inspector" : (submission.value.redirectTo ?? "/account");
  throw redirect(`/verify-email?${new URLSearchParams({ redirectTo: next, sent: "1" })}`, { headers: outcome.headers });
}

const intents = [
  { name: "buys", title: "I buy machines", body: "Search by verified accuracy, watch listings and book inspections.", role: "buyer" },
  { name: "sells", title: "I sell machines", body: "List machines as a dealer or a private owner, with photos and reports.", role: "seller" },
  { name: "inspects", title: "I inspect machines", body: "Apply to be certified, then get booked for on-site geometry checks.", role: "inspector" },
] as const;

export default function SignUp() {
  const { redirectTo, chosen } = useLoaderData<typeof loader>();
  const actionData = useActionData<typeof action>();
  const busy = useNavigation().state === "submitting";
  const [form, fields] = useForm({
    id: "sign-up",
    lastResult: actionData?.result,
    defaultValue: { buys: chosen === "buyer" ? "on" : undefined, sells: chosen === "seller" ? "on" : undefined, inspects: chosen === "inspector" ? "on" : undefined },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: signUpSchema }),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
  });
  return (
    <AuthCard
      wide
      title="Create your account"
      lead="One account for buying, selling and inspecting. You can add a role later."
      footer={
        <>
          Already have an account?{" "}
          <Link to={redirectTo ? `/sign-in?redirectTo=${encodeURIComponent(redirectTo)}` : "/sign-in"} className="font-semibold text-ink-900 underline underline-offset-4">
            Sign in
          </Link>
        </>
      }
    >
      <Form method="post" {...getFormProps(form)} className="space-y-6">
        {form.errors?.length ? <FormMessage>{form.errors.join(" ")}</FormMessage> : null}
        <input type="hidden" name="redirectTo" value={redirectTo} />
        <fieldset>
          <legend className="text-sm font-semibold text-ink-800">What brings you to Tenthmark?</legend>
          <p className="text-sm text-ink-500">Choose all that apply. Every account can buy.</p>
          <div className="mt-3 grid gap-2.5">
            {intents.map((intent) => {
              const field = fields[intent.name];
              return (
                <label
                  key={intent.name}
                  className="flex cursor-pointer items-start gap-3 rounded-control border border-ink-200 bg-white p-3.5 hover:border-ink-400 has-[:checked]:border-ink-900 has-[:checked]:bg-ink-50"
                >
                  <input
                    type="checkbox"
                    name={field.name}
                    key={field.key}
                    defaultChecked={field.initialValue === "on"}
                    className="mt-1 size-4 shrink-0 accent-ink-900"
                    data-role={intent.role}
                  />
                  <span>
                    <span className="block font-bold text-ink-900">{intent.title}</span>
                    <span className="block text-sm text-ink-600">{intent.body}</span>
                  </span>
                </label>
              );
            })}
          </div>
        </fieldset>
        <TextField
          label="Your name"
          hint="Shown to the people you deal with: your own name, or your company's."
          autoComplete="name"
          name={fields.name.name}
          key={fields.name.key}
          defaultValue={fields.name.initialValue}
          errors={fields.name.errors}
          required
        />
        <EmailAddressField field={fields.email} />
        <TextField
          label="Password"
          type="password"
          autoComplete="new-password"
          hint="At least 10 characters. A short sentence is easy to remember."
          name={fields.password.name}
          key={fields.password.key}
          errors={fields.password.errors}
          required
          minLength={10}
        />
        <Button type="submit" size="lg" disabled={busy} className="w-full">
          {busy ? "Creating your account…" : "Create account"}
        </Button>
        <p className="text-xs text-ink-500">We will send a link to confirm your address. Listing machines and booking inspections need a confirmed address.</p>
      </Form>
    </AuthCard>
  );
}
