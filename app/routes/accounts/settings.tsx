import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import { Badge, Button, ButtonLink, Card, CardBody, CardHeader, TextField } from "~/components/ui";
import { FormMessage } from "~/modules/accounts/components/auth-card";
import { failureReply, invalidReply } from "~/modules/accounts/forms.server";
import { requireUser } from "~/modules/accounts/guards.server";
import { changePassword, grantRole, updateProfile } from "~/modules/accounts/service.server";
import { accountSettingsSchema, changePasswordSchema, profileSchema } from "~/modules/accounts/validation";
import type { Route } from "./+types/settings";

export const meta: Route.MetaFunction = () => [{ title: "Your account — Tenthmark" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const url = new URL(request.url);
  return { user, justVerified: url.searchParams.has("verified"), passwordChanged: url.searchParams.get("password") === "changed" };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  const formData = await request.formData();
  if (formData.get("intent") === "seller") {
    await grantRole(user.id, "seller");
    return { intent: "seller" as const, result: undefined, errors: {}, saved: "You can now list machines." };
  }
  const submission = parseWithZod(formData, { schema: accountSettingsSchema });
  const intent = formData.get("intent") === "password" ? ("password" as const) : ("profile" as const);
  const hideFields = ["currentPassword", "newPassword", "confirmPassword"];
  if (submission.status !== "success") return invalidReply(submission, { hideFields, extra: { intent, saved: null } });
  if (submission.value.intent === "profile") {
    await updateProfile(user.id, submission.value);
    return { intent, result: submission.reply(), errors: {}, saved: "Saved." };
  }
  const outcome = await changePassword(request, submission.value);
  if (!outcome.ok) return failureReply(submission, outcome, { hideFields, extra: { intent, saved: null } });
  // Changing the password ended every session, this one included: come back with the new session cookie.
  throw redirect("/account?password=changed", { headers: outcome.headers });
}

const statusText = {
  none: "Not applied",
  pending: "Application waiting for a decision",
  certified: "Certified",
  rejected: "Application not approved",
} as const;

export default function AccountSettings() {
  const { user, justVerified, passwordChanged } = useLoaderData<typeof loader>();
  const actionData = useActionData<typeof action>();
  const navigation = useNavigation();
  const submittingIntent = navigation.state === "submitting" ? navigation.formData?.get("intent") : null;

  const [profileForm, profileFields] = useForm({
    id: "profile",
    lastResult: actionData?.intent === "profile" ? actionData.result : undefined,
    defaultValue: { name: user.name, displayUnits: user.displayUnits },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: profileSchema }),
    shouldValidate: "onBlur",
  });
  const [passwordForm, passwordFields] = useForm({
    id: "password",
    lastResult: actionData?.intent === "password" ? actionData.result : undefined,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: changePasswordSchema }),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
  });

  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <h1 className="text-3xl font-extrabold tracking-tight text-ink-950">Your account</h1>
      <p className="mt-1 break-words text-ink-600">{user.email}</p>
      <div className="mt-4 flex flex-wrap gap-2" role="group" aria-label="Your roles">
        {user.roles.map((role) => (
          <Badge key={role} tone={role === "admin" ? "brass" : role === "inspector" ? "within" : "neutral"}>
            {role === "inspector" ? "certified inspector" : role}
          </Badge>
        ))}
        {user.emailVerified ? <Badge tone="within">e-mail confirmed</Badge> : <Badge tone="caution">e-mail not confirmed</Badge>}
      </div>

      <div className="mt-6 space-y-3">
        {justVerified ? <FormMessage tone="within">Your e-mail address is confirmed. You are signed in.</FormMessage> : null}
        {!user.emailVerified ? (
          <FormMessage tone="caution">
            Confirm your e-mail address to list machines and book inspections.{" "}
            <Link to="/verify-email" className="underline underline-offset-4">
              Send me a new link
            </Link>
          </FormMessage>
        ) : null}
      </div>

      <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_1fr]">
        <Card>
          <CardHeader title="Profile and units" />
          <CardBody>
            <Form method="post" {...getFormProps(profileForm)} className="space-y-5">
              <input type="hidden" name="intent" value="profile" />
              {actionData?.intent === "profile" && actionData.saved ? <FormMessage tone="within">{actionData.saved}</FormMessage> : null}
              <TextField
                label="Name"
                autoComplete="name"
                name={profileFields.name.name}
                key={profileFields.name.key}
                defaultValue={profileFields.name.initialValue}
                errors={profileFields.name.errors}
                required
              />
              <fieldset>
                <legend className="text-sm font-semibold text-ink-800">Show measurements in</legend>
                <p className="text-sm text-ink-500">Readings, tolerances and sizes everywhere on Tenthmark. They are stored in micrometres either way.</p>
                <div className="mt-2 grid gap-2 sm:grid-cols-2">
                  {[
                    { value: "mm", title: "Millimetres", example: "run-out 0.004 mm · swing 400 mm" },
                    { value: "inch", title: "Inches", example: "run-out 0.00016 in · swing 15.75 in" },
                  ].map((option) => (
                    <label
                      key={option.value}
                      className="flex cursor-pointer items-start gap-3 rounded-control border border-ink-200 bg-white p-3 hover:border-ink-400 has-[:checked]:border-ink-900 has-[:checked]:bg-ink-50"
                    >
                      <input
                        type="radio"
                        name={profileFields.displayUnits.name}
                        value={option.value}
                        defaultChecked={profileFields.displayUnits.initialValue === option.value}
                        className="mt-1 accent-ink-900"
                      />
                      <span>
                        <span className="block font-bold text-ink-900">{option.title}</span>
                        <span className="tabular block text-xs text-ink-500">{option.example}</span>
                      </span>
                    </label>
                  ))}
                </div>
                {profileFields.displayUnits.errors ? (
                  <p className="mt-1 text-sm font-medium text-beyond" role="alert">
                    {profileFields.displayUnits.errors.join(" ")}
                  </p>
                ) : null}
              </fieldset>
              <Button type="submit" disabled={submittingIntent === "profile"}>
                {submittingIntent === "profile" ? "Saving…" : "Save profile"}
              </Button>
            </Form>
          </CardBody>
        </Card>

        <Card>
          <CardHeader title="Password" />
          <CardBody>
            <Form method="post" {...getFormProps(passwordForm)} className="space-y-5">
              <input type="hidden" name="intent" value="password" />
              {passwordChanged && !actionData ? <FormMessage tone="within">Password changed. Other devices were signed out.</FormMessage> : null}
              {passwordForm.errors?.length ? <FormMessage>{passwordForm.errors.join(" ")}</FormMessage> : null}
              <TextField
                label="Current password"
                type="password"
                autoComplete="current-password"
                name={passwordFields.currentPassword.name}
                key={passwordFields.currentPassword.key}
                errors={passwordFields.currentPassword.errors}
                required
              />
              <TextField
                label="New password"
                type="password"
                autoComplete="new-password"
                hint="At least 10 characters. Other devices will be signed out."
                name={passwordFields.newPassword.name}
                key={passwordFields.newPassword.key}
                errors={passwordFields.newPassword.errors}
                required
              />
              <TextField
                label="New password again"
                type="password"
                autoComplete="new-password"
                name={passwordFields.confirmPassword.name}
                key={passwordFields.confirmPassword.key}
                errors={passwordFields.confirmPassword.errors}
                required
              />
              <Button type="submit" disabled={submittingIntent === "password"}>
                {submittingIntent === "password" ? "Changing…" : "Change password"}
              </Button>
            </Form>
          </CardBody>
        </Card>

        <Card>
          <CardHeader title="Selling" />
          <CardBody className="space-y-4">
            {user.roles.includes("seller") ? (
              <p className="text-ink-700">Your account can list machines, as a dealer or a private owner.</p>
            ) : (
              <>
                <p className="text-ink-700">Add selling to your account to list machines with photos and inspection reports.</p>
                {actionData?.intent === "seller" ? <FormMessage tone="within">{actionData.saved}</FormMessage> : null}
                <Form method="post">
                  <input type="hidden" name="intent" value="seller" />
                  <Button type="submit" variant="secondary" disabled={submittingIntent === "seller"}>
                    I sell machines too
                  </Button>
                </Form>
              </>
            )}
          </CardBody>
        </Card>

        <Card>
          <CardHeader title="Inspecting" />
          <CardBody className="space-y-4">
            <p className="text-ink-700">
              Status: <strong className="text-ink-900">{statusText[user.inspectorStatus]}</strong>
            </p>
            <ButtonLink to="/account/inspector" variant="secondary">
              {user.inspectorStatus === "none" ? "Apply as an inspector" : "Open your application"}
            </ButtonLink>
          </CardBody>
        </Card>
      </div>
    </div>
  );
}
