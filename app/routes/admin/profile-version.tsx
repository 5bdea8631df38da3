import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useActionData, useLoaderData } from "react-router";
import { Button, ButtonLink, Card, CardBody, CardHeader, cx, TextAreaField } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { FormMessage } from "~/modules/accounts/components/auth-card";
import { StaffNav } from "~/modules/accounts/components/staff-nav";
import { requireRole } from "~/modules/accounts/guards.server";
import { ProfileStatusBadge } from "~/modules/profiles/components/status";
import { describeSource, describeTolerance, diffProfiles, profileVersionActionSchema, settingsRows, type DiffRow } from "~/modules/profiles/editor";
import {
  discardDraftVersion,
  getProfileVersion,
  ProfileRuleError,
  publishDraftVersion,
  removeDraftTest,
  retireVersion,
} from "~/modules/profiles/service.server";
import type { Route } from "./+types/profile-version";
import { formatDate } from "~/modules/units/dates";

export const meta: Route.MetaFunction = ({ data: loaded }) => [
  { title: loaded ? `${loaded.summary.title} v${loaded.summary.version} — Tenthmark staff` : "Tolerance profile — Tenthmark staff" },
];

function versionParam(value: string | undefined) {
  const version = Number(value);
  if (!Number.isInteger(version) || version < 1 || version > 10_000) throw data("There is no such version.", { status: 404 });
  return version;
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const staff = await requireRole(request, "admin");
  const found = await getProfileVersion(context.get(databaseContext), params.key, versionParam(params.version));
  if (!found) throw data("There is no such version.", { status: 404 });
  return {
    summary: found.summary,
    definition: found.definition,
    previous: found.previous ? { key: found.previous.key, version: found.previous.version } : null,
    diff: diffProfiles(found.previous?.definition ?? null, found.definition),
    isAuthor: found.summary.authorId === staff.id,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const staff = await requireRole(request, "admin");
  const db = context.get(databaseContext);
  const version = versionParam(params.version);
  const submission = parseWithZod(await request.formData(), { schema: profileVersionActionSchema });
  if (submission.status !== "success") return data({ result: submission.reply(), done: null }, { status: 422 });
  const value = submission.value;
  try {
    switch (value.intent) {
      case "publish":
        await publishDraftVersion(db, staff, params.key, version, value.revision);
        return { result: submission.reply({ resetForm: true }), done: "Published: new reports are offered this version from now on." };
      case "retire":
        await retireVersion(db, staff, params.key, version, value.reason);
        return { result: submission.reply({ resetForm: true }), done: "Retired: no new reports use this version; reports scored with it keep it." };
      case "discard":
        await discardDraftVersion(db, staff, params.key, version);
        return redirect("/admin/profiles");
      case "remove-test":
        await removeDraftTest(db, staff, params.key, version, value.code, value.revision);
        return { result: submission.reply({ resetForm: true }), done: `Removed ${value.code} from the draft.` };
    }
  } catch (error) {
    if (error instanceof ProfileRuleError) return data({ result: submission.reply({ formErrors: [error.message] }), done: null }, { status: error.status });
    throw error;
  }
}

export default function ProfileVersionPage() {
  const { summary, definition, previous, diff, isAuthor } = useLoaderData<typeof loader>();
  const actionData = useActionData<typeof action>();
  const draft = summary.status === "draft";
  const base = `/admin/profiles/${summary.key}/${summary.version}`;
  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <StaffNav current="profiles" />
      <p className="mt-4 text-sm">
        <Link to="/admin/profiles" className="text-ink-600 underline underline-offset-2">
          All profiles
        </Link>
      </p>
      <div className="mt-2 flex flex-wrap items-baseline gap-3">
        <h1 className="text-3xl font-extrabold tracking-tight text-ink-950">{summary.title}</h1>
        <ProfileStatusBadge status={summary.status} />
      </div>
      <p className="mt-1 text-ink-600">
        {summary.key} · version {summary.version}
        {summary.basedOn ? ` · drafted from ${summary.basedOn.key === summary.key ? "" : `${summary.basedOn.key} `}v${summary.basedOn.version}` : ""}
        {summary.author ? ` · by ${summary.author}` : summary.builtIn ? " · built in" : ""}
        {summary.approver ? ` · published by ${summary.approver} on ${summary.publishedAt ? formatDate(summary.publishedAt) : ""}` : ""}
        {summary.retiredAt ? ` · retired ${formatDate(summary.retiredAt)}${summary.retiredBy ? ` by ${summary.retiredBy}` : ""}` : ""}
      </p>
      {summary.retireReason ? <p className="mt-1 text-sm text-ink-700">Why retired: {summary.retireReason}</p> : null}

      <div className="mt-6 space-y-3" aria-live="polite">
        {actionData?.done ? <FormMessage tone="within">{actionData.done}</FormMessage> : null}
        {actionData?.result?.error?.[""]?.length ? <FormMessage>{actionData.result.error[""].join(" ")}</FormMessage> : null}
      </div>

      <VersionActions summary={summary} isAuthor={isAuthor} />

      <section className="mt-8" aria-labelledby="diff-heading">
        <h2 id="diff-heading" className="text-xl font-bold text-ink-900">
          {previous ? `Changes against ${previous.key === summary.key ? "" : `${previous.key} `}version ${previous.version}` : "First version"}
        </h2>
        {previous ? (
          <p className="mt-1 text-sm text-ink-600">
            {diff.tests.length === 0 && !diff.settingsChanged
              ? "No value differs from the version it was drafted from yet."
              : `${diff.tests.length} test${diff.tests.length === 1 ? "" : "s"} differ${diff.tests.length === 1 ? "s" : ""}${diff.settingsChanged ? ", and the profile's own settings" : ""}; ${diff.unchanged} unchanged. Changed values are marked.`}
          </p>
        ) : null}
        {previous && diff.settingsChanged ? <DiffTable caption="The profile" rows={diff.settings} before={`v${previous.version}`} after={`v${summary.version}`} /> : null}
        {previous
          ? diff.tests.map((test) => (
              <DiffTable
                key={test.code}
                caption={`${test.code} ${test.title}${test.kind === "added" ? " (added)" : test.kind === "removed" ? " (removed)" : ""}`}
                rows={test.rows}
                before={`v${previous.version}`}
                after={`v${summary.version}`}
              />
            ))
          : null}
      </section>

      <section className="mt-10 space-y-6" aria-labelledby="profile-heading">
        <h2 id="profile-heading" className="text-xl font-bold text-ink-900">
          This version
        </h2>
        <Card>
          <CardHeader title="Scope and rules" action={draft && isAuthor ? <ButtonLink to={`${base}/settings`} size="sm" variant="secondary">Edit scope and rules</ButtonLink> : null} />
          <CardBody>
            <dl className="divide-y divide-ink-100 text-sm">
              {settingsRows(definition).map(([label, value]) => (
                <div key={label} className="grid gap-1 py-2 sm:grid-cols-[14rem_1fr]">
                  <dt className="font-semibold text-ink-700">{label}</dt>
                  <dd className="text-ink-900">{value}</dd>
                </div>
              ))}
            </dl>
          </CardBody>
        </Card>
        <Card>
          <CardHeader title={`Tests (${definition.tests.length})`} action={draft && isAuthor ? <ButtonLink to={`${base}/tests/new`} size="sm" variant="secondary">Add a test</ButtonLink> : null} />
          <ul className="divide-y divide-ink-100 text-sm">
            {definition.tests.map((test) => (
              <li key={test.code} className="grid gap-2 px-5 py-3 md:grid-cols-[1fr_1fr_auto] md:items-start" data-test-code={test.code}>
                <div>
                  <p className="font-semibold text-ink-900">
                    {test.code} · {test.title}
                    {test.required ? "" : " (optional)"}
                  </p>
                  <p className="text-ink-600">{test.measures}</p>
                </div>
                <div>
                  <p className="text-ink-900">{describeTolerance(test.tolerance, test.unit)}</p>
                  <p className="text-xs text-ink-500">{describeSource(test.tolerance.source)}</p>
                  {test.local ? (
                    <p className="text-xs text-ink-500">
                      local {test.local.tolerance} {test.unit} over any {test.local.window} mm — {describeSource(test.local.source)}
                    </p>
                  ) : null}
                </div>
                {draft && isAuthor ? (
                  <div className="flex gap-2">
                    <ButtonLink to={`${base}/tests/${encodeURIComponent(test.code)}`} size="sm" variant="secondary" aria-label={`Edit ${test.code}`}>
                      Edit
                    </ButtonLink>
                    <Form method="post">
                      <input type="hidden" name="intent" value="remove-test" />
                      <input type="hidden" name="code" value={test.code} />
                      <input type="hidden" name="revision" value={summary.revision} />
                      <Button type="submit" size="sm" variant="quiet" aria-label={`Remove ${test.code}`}>
                        Remove
                      </Button>
                    </Form>
                  </div>
                ) : null}
              </li>
            ))}
          </ul>
        </Card>
      </section>
    </div>
  );
}

type Summary = ReturnType<typeof useLoaderData<typeof loader>>["summary"];

function VersionActions({ summary, isAuthor }: { summary: Summary; isAuthor: boolean }) {
  const lastResult = useActionData<typeof action>()?.result;
  const [retireForm, retireFields] = useForm({
    id: "retire",
    lastResult,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: profileVersionActionSchema }),
    shouldValidate: "onSubmit",
  });
  if (summary.status === "draft") {
    return (
      <Card className="mt-6 border-caution/40">
        <CardBody className="space-y-3 text-sm text-ink-700">
          {isAuthor ? (
            <>
              <p>
                You drafted this version. Change its values below; when it is ready, ask a second staff member to read the changes and
                publish it. You cannot publish your own draft.
              </p>
              <Form method="post">
                <input type="hidden" name="intent" value="discard" />
                <Button type="submit" size="sm" variant="quiet">
                  Discard this draft
                </Button>
              </Form>
            </>
          ) : (
            <>
              <p>
                Drafted by {summary.author ?? "another staff member"}. Read the changes below; publishing makes this version the one new
                reports are offered, and it can never be changed afterwards.
              </p>
              <Form method="post">
                <input type="hidden" name="intent" value="publish" />
                <input type="hidden" name="revision" value={summary.revision} />
                <Button type="submit">Publish version {summary.version}</Button>
              </Form>
            </>
          )}
        </CardBody>
      </Card>
    );
  }
  if (summary.status === "published") {
    return (
      <Card className="mt-6">
        <CardBody>
          <Form method="post" {...getFormProps(retireForm)} className="space-y-3">
            <input type="hidden" name="intent" value="retire" />
            <p className="text-sm text-ink-700">
              Retiring stops new reports from using this version; every report already scored with it keeps it and re-scores the same.
            </p>
            <TextAreaField label="Why retire it" name={retireFields.reason.name} key={retireFields.reason.key} errors={retireFields.reason.errors} rows={2} />
            <Button type="submit" size="sm" variant="secondary">
              Retire version {summary.version}
            </Button>
          </Form>
          <p className="mt-3 text-sm">
            <Link to="/admin/profiles" className="underline underline-offset-2">
              Draft a new version from the list of profiles
            </Link>
          </p>
        </CardBody>
      </Card>
    );
  }
  return null;
}

function DiffTable({ caption, rows, before, after }: { caption: string; rows: DiffRow[]; before: string; after: string }) {
  return (
    // A table wider than a phone scrolls sideways: a named region the keyboard can scroll.
    <div className="mt-4 overflow-x-auto rounded-panel border border-ink-200 bg-white" data-diff={caption.split(" ")[0]} role="region" aria-label={`Changes: ${caption}`} tabIndex={0}>
      <table className="w-full min-w-[40rem] text-left text-sm">
        <caption className="px-4 py-2 text-left font-bold text-ink-900">{caption}</caption>
        <thead className="bg-ink-50 text-ink-700">
          <tr>
            <th scope="col" className="w-48 px-4 py-2 font-semibold">
              Value
            </th>
            <th scope="col" className="px-4 py-2 font-semibold">
              {before}
            </th>
            <th scope="col" className="px-4 py-2 font-semibold">
              {after}
            </th>
          </tr>
        </thead>
        <tbody className="divide-y divide-ink-100">
          {rows.map((row) => (
            <tr key={row.label} className={cx(row.changed ? "bg-caution-soft" : "")} data-changed={row.changed ? "yes" : "no"}>
              <th scope="row" className="px-4 py-2 align-top font-semibold text-ink-700">
                {row.label}
                {row.changed ? <span className="ml-2 rounded bg-caution px-1.5 py-0.5 text-xs font-bold text-white">changed</span> : null}
              </th>
              <td className={cx("px-4 py-2 align-top", row.changed ? "text-ink-700 line-through decoration-ink-400" : "text-ink-700")}>{row.before ?? "—"}</td>
              <td className={cx("px-4 py-2 align-top", row.changed ? "font-semibold text-ink-950" : "text-ink-700")}>{row.after ?? "—"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
