import { data, Form, Link } from "react-router";
import { Button, Card } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { savedSearchForToken, unsubscribeWithToken } from "~/modules/search/saved-searches/service.server";
import type { Route } from "./+types/unsubscribe";

export const meta: Route.MetaFunction = () => [{ title: "Stop saved-search alerts — Tenthmark" }, { name: "robots", content: "noindex" }];

// The link in an alert: GET shows what will stop (mail scanners follow links, so a GET changes nothing);
// POST stops it, from the button here or from a mail client's one-click unsubscribe.
export async function loader({ request, context }: Route.LoaderArgs) {
  const token = new URL(request.url).searchParams.get("token") ?? "";
  const found = await savedSearchForToken(context.get(databaseContext), token);
  // A cut-short or forged link shows the page that says so, as a 404.
  return data({ token, found: found ? { names: found.names, alertsEnabled: found.alertsEnabled } : null }, { status: found ? 200 : 404 });
}

export async function action({ request, context }: Route.ActionArgs) {
  // The page's button sends the token in the form; a mail client's one-click POST keeps it in the address.
  const hasForm = /^(application\/x-www-form-urlencoded|multipart\/form-data)/.test(request.headers.get("content-type") ?? "");
  const fromForm = hasForm ? (await request.formData()).get("token") : null;
  const token = typeof fromForm === "string" && fromForm ? fromForm : (new URL(request.url).searchParams.get("token") ?? "");
  const stopped = await unsubscribeWithToken(context.get(databaseContext), token);
  return data({ stopped }, { status: stopped ? 200 : 404 });
}

/** “A”, “A” and “B”, “A”, “B” and “C”. */
function quoted(names: string[]) {
  const each = names.map((name) => `“${name}”`);
  return each.length <= 1 ? (each[0] ?? "") : `${each.slice(0, -1).join(", ")} and ${each.at(-1)}`;
}

export default function Unsubscribe({ loaderData, actionData }: Route.ComponentProps) {
  const { token, found } = loaderData;
  const several = (found?.names.length ?? 0) > 1;
  return (
    <div className="mx-auto max-w-xl px-4 py-16 sm:px-6">
      <Card className="p-6 sm:p-8">
        {actionData?.stopped || (found && !found.alertsEnabled) ? (
          <>
            <h1 className="text-2xl font-extrabold text-ink-900">Alerts stopped</h1>
            <p className="mt-2 text-ink-700">
              You will get no more e-mails for {found ? quoted(found.names) : "this saved search"}. {several ? "The searches are" : "The search itself is"} still saved; turn alerts on again
              under{" "}
              <Link to="/account/saved-searches" className="font-semibold underline underline-offset-2">
                Saved searches
              </Link>
              .
            </p>
          </>
        ) : found ? (
          <>
            <h1 className="text-2xl font-extrabold text-ink-900">Stop alerts for {quoted(found.names)}?</h1>
            <p className="mt-2 text-ink-700">We will stop e-mailing you about new machines that match {several ? "these saved searches" : "this saved search"}.</p>
            <Form method="post" className="mt-6">
              <input type="hidden" name="token" value={token} />
              <Button type="submit">Stop these alerts</Button>
            </Form>
          </>
        ) : (
          <>
            <h1 className="text-2xl font-extrabold text-ink-900">This link does not work</h1>
            <p className="mt-2 text-ink-700">
              The saved search may have been deleted, or the link was cut short. Manage your alerts under{" "}
              <Link to="/account/saved-searches" className="font-semibold underline underline-offset-2">
                Saved searches
              </Link>
              .
            </p>
          </>
        )}
      </Card>
    </div>
  );
}
