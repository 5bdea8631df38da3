import { getFormProps, getInputProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useActionData, useLoaderData } from "react-router";
import { Badge, Button, Card, TextField } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { FormMessage } from "~/modules/accounts/components/auth-card";
import { StaffNav } from "~/modules/accounts/components/staff-nav";
import { requireRole } from "~/modules/accounts/guards.server";
import { profileDraftRequestSchema } from "~/modules/profiles/editor";
import { draftNewVersion, listProfileVersions, ProfileRuleError } from "~/modules/profiles/service.server";
import { ProfileStatusBadge } from "~/modules/profiles/components/status";
import type { Route } from "./+types/profiles";
import { formatDate } from "~/modules/units/dates";

export const meta: Route.MetaFunction = () => [{ title: "Tolerance profiles — Tenthmark staff" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  await requireRole(request, "admin");
  return { profiles: await listProfileVersions(context.get(databaseContext)) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const staff = await requireRole(request, "admin");
  const submission = parseWithZod(await request.formData(), { schema: profileDraftRequestSchema });
  if (submission.status !== "success") return data({ result: submission.reply() }, { status: 422 });
  try {
    const { key, fromVersion, newKey } = submission.value;
    const draft = await draftNewVersion(context.get(databaseContext), staff, key, fromVersion, newKey ? { newKey } : {});
    return redirect(`/admin/profiles/${draft.key}/${draft.version}`);
  } catch (error) {
    if (error instanceof ProfileRuleError) {
      return data({ result: submission.reply({ formErrors: error.errors.newKey ? undefined : [error.message], fieldErrors: error.errors }) }, { status: error.status });
    }
    throw error;
  }
}

export default function ProfilesPage() {
  const { profiles } = useLoaderData<typeof loader>();
  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <StaffNav current="profiles" />
      <h1 className="mt-4 text-3xl font-extrabold tracking-tight text-ink-950">Tolerance profiles</h1>
      <p className="mt-1 max-w-3xl text-ink-600">
        The tables reports are scored against, one row per version. Draft a new version from a published one, change it, and
        ask a second staff member to publish it; from then on new reports are offered it. A published version never changes,
        and retiring one leaves the reports scored with it as they are.
      </p>
      <div className="mt-6 space-y-6">
        {profiles.map((group) => (
          <ProfileGroup key={group.key} group={group} />
        ))}
      </div>
      <CopyAsNewProfile profiles={profiles} />
    </div>
  );
}

type Group = ReturnType<typeof useLoaderData<typeof loader>>["profiles"][number];

function ProfileGroup({ group }: { group: Group }) {
  const newest = group.versions[0]!;
  const openDraft = group.versions.find((version) => version.status === "draft");
  const base = group.versions.find((version) => version.status !== "draft");
  return (
    <Card className="p-5" data-profile={group.key}>
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <div>
          <h2 className="text-lg font-bold text-ink-900">{newest.title}</h2>
          <p className="text-sm text-ink-500">
            {group.key}
            {newest.makersChart ? ` · maker's chart: ${newest.makersChart}` : ""}
          </p>
        </div>
        {openDraft ? (
          <Link to={`/admin/profiles/${group.key}/${openDraft.version}`} className="text-sm font-semibold text-ink-900 underline underline-offset-2">
            Open the draft, version {openDraft.version}
          </Link>
        ) : base ? (
          <Form method="post">
            <input type="hidden" name="key" value={group.key} />
            <input type="hidden" name="fromVersion" value={base.version} />
            <Button type="submit" size="sm" variant="secondary">
              Draft version {newest.version + 1} from v{base.version}
            </Button>
          </Form>
        ) : null}
      </div>
      <ul className="mt-4 divide-y divide-ink-100 text-sm">
        {group.versions.map((version) => (
          <li key={version.version} className="flex flex-wrap items-center justify-between gap-2 py-2">
            <Link to={`/admin/profiles/${group.key}/${version.version}`} className="font-semibold text-ink-900 underline underline-offset-2">
              Version {version.version}
            </Link>
            <span className="flex flex-wrap items-center gap-2 text-ink-600">
              <ProfileStatusBadge status={version.status} />
              {version.builtIn ? <Badge>built in</Badge> : null}
              {version.author ? <span>drafted by {version.author}</span> : null}
              {version.approver ? <span>· published by {version.approver}</span> : null}
              {version.publishedAt ? <span className="tabular">· {formatDate(version.publishedAt)}</span> : null}
            </span>
          </li>
        ))}
      </ul>
    </Card>
  );
}

function CopyAsNewProfile({ profiles }: { profiles: Group[] }) {
  const lastResult = useActionData<typeof action>()?.result;
  const [form, fields] = useForm({
    id: "copy-profile",
    lastResult,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: profileDraftRequestSchema }),
    shouldValidate: "onBlur",
  });
  const sources = profiles.flatMap((group) => group.versions.filter((version) => version.status !== "draft").map((version) => ({ key: group.key, version: version.version, title: version.title })));
  return (
    <Card className="mt-8 p-5">
      <h2 className="text-lg font-bold text-ink-900">Start a new profile</h2>
      <p className="mt-1 text-sm text-ink-600">
        Copy a published version as version 1 of a new profile, e.g. a maker's own acceptance chart for one make and model, then
        set its scope and values.
      </p>
      <Form method="post" {...getFormProps(form)} className="mt-4 grid gap-4 sm:grid-cols-[1fr_1fr_auto] sm:items-end">
        {form.errors?.length ? <div className="sm:col-span-3"><FormMessage>{form.errors.join(" ")}</FormMessage></div> : null}
        <label className="block text-sm font-semibold text-ink-800">
          Copy from
          <select
            className="mt-1 block w-full rounded-control border border-ink-300 bg-white px-3 py-2 text-base font-normal"
            name="source"
            onChange={(event) => {
              const [key, version] = event.currentTarget.value.split("@");
              const formElement = event.currentTarget.form!;
              (formElement.elements.namedItem("key") as HTMLInputElement).value = key!;
              (formElement.elements.namedItem("fromVersion") as HTMLInputElement).value = version!;
            }}
            defaultValue={sources[0] ? `${sources[0].key}@${sources[0].version}` : ""}
          >
            {sources.map((source) => (
              <option key={`${source.key}@${source.version}`} value={`${source.key}@${source.version}`}>
                {source.title} — v{source.version}
              </option>
            ))}
          </select>
        </label>
        <input type="hidden" name="key" defaultValue={sources[0]?.key ?? ""} />
        <input type="hidden" name="fromVersion" defaultValue={sources[0]?.version ?? ""} />
        <TextField label="Key of the new profile" hint="Lower-case letters, digits, hyphens" {...getInputProps(fields.newKey, { type: "text" })} key={fields.newKey.key} errors={fields.newKey.errors} />
        <Button type="submit" variant="secondary">
          Copy as a new profile
        </Button>
      </Form>
    </Card>
  );
}
