import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import { safeName, safeText } from "~/modules/validation/text";
import { Badge, Button, ButtonLink, Card } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { requireUser, requireVerifiedUser } from "~/modules/accounts/guards.server";
import {
  deleteSavedSearch,
  listSavedSearches,
  saveSearch,
  SavedSearchRuleError,
  setSavedSearchAlerts,
} from "~/modules/search/saved-searches/service.server";
import type { Route } from "./+types/saved-searches";
import { formatDate } from "~/modules/units/dates";

export const meta: Route.MetaFunction = () => [{ title: "Saved searches — Tenthmark" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { savedSearches: await listSavedSearches(context.get(databaseContext), user), verified: user.emailVerified };
}

const intents = z.discriminatedUnion("intent", [
  z.object({
    intent: z.literal("save"),
    name: safeName({ label: "name", max: 120, messages: { missing: "Give the search a name.", tooLong: "Keep the name under 120 characters." } }),
    queryString: safeText({ label: "search", max: 2000, messages: { tooLong: "This search is too long to save." } }),
  }),
  z.object({ intent: z.literal("delete"), savedSearchId: z.uuid() }),
  z.object({ intent: z.literal("alerts"), savedSearchId: z.uuid(), enabled: z.enum(["on", "off"]) }),
]);

export async function action({ request, context }: Route.ActionArgs) {
  const db = context.get(databaseContext);
  const parsed = intents.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ errors: z.flattenError(parsed.error).fieldErrors as Record<string, string[]> }, { status: 422 });
  const form = parsed.data;
  if (form.intent === "save") {
    const owner = await requireVerifiedUser(request);
    try {
      return { saved: await saveSearch(db, owner, form) };
    } catch (error) {
      if (error instanceof SavedSearchRuleError) return data({ errors: { queryString: [error.message] } }, { status: 422 });
      throw error;
    }
  }
  const owner = await requireUser(request);
  if (form.intent === "delete") await deleteSavedSearch(db, owner, form.savedSearchId);
  else await setSavedSearchAlerts(db, owner, form.savedSearchId, form.enabled === "on");
  return { done: form.intent };
}

export default function SavedSearches({ loaderData }: Route.ComponentProps) {
  const { savedSearches } = loaderData;
  const navigation = useNavigation();
  const busy = navigation.state !== "idle" ? navigation.formData?.get("savedSearchId") : null;
  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <nav aria-label="Breadcrumb" className="text-sm text-ink-500">
        <Link to="/account" className="font-semibold hover:text-ink-900">
          Your account
        </Link>{" "}
        / Saved searches
      </nav>
      <div className="mt-3 flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-3xl font-extrabold text-ink-900">Saved searches</h1>
          <p className="mt-1 max-w-2xl text-ink-600">
            We e-mail you once when a machine matching a saved search is listed, and once more when it is verified by an inspector: one message per machine, naming every search of yours it matches.
          </p>
        </div>
        <ButtonLink to="/machines" variant="secondary">
          Search machines
        </ButtonLink>
      </div>

      {savedSearches.length ? (
        <ul className="mt-8 space-y-3">
          {savedSearches.map((saved) => (
            <li key={saved.id}>
              <Card className="flex flex-col gap-4 p-5 sm:flex-row sm:items-center sm:justify-between" data-saved-search={saved.name}>
                <div className="min-w-0">
                  <div className="flex flex-wrap items-center gap-2">
                    <h2 className="text-lg font-bold text-ink-900">{saved.name}</h2>
                    {saved.alertsEnabled ? <Badge tone="within">E-mail alerts on</Badge> : <Badge>Alerts off</Badge>}
                  </div>
                  <p className="mt-1 text-sm text-ink-600">{saved.summary}</p>
                  <p className="mt-1 text-xs text-ink-500">Saved {formatDate(saved.createdAt)}</p>
                </div>
                <div className="flex flex-wrap gap-2">
                  <ButtonLink to={`/machines?${saved.queryString}`} size="sm" variant="secondary">
                    Show matches
                  </ButtonLink>
                  <Form method="post">
                    <input type="hidden" name="savedSearchId" value={saved.id} />
                    <input type="hidden" name="intent" value="alerts" />
                    <input type="hidden" name="enabled" value={saved.alertsEnabled ? "off" : "on"} />
                    <Button type="submit" size="sm" variant="quiet" disabled={busy === saved.id}>
                      {saved.alertsEnabled ? "Turn alerts off" : "Turn alerts on"}
                    </Button>
                  </Form>
                  <Form method="post">
                    <input type="hidden" name="savedSearchId" value={saved.id} />
                    <input type="hidden" name="intent" value="delete" />
                    <Button type="submit" size="sm" variant="quiet" disabled={busy === saved.id} aria-label={`Delete ${saved.name}`}>
                      Delete
                    </Button>
                  </Form>
                </div>
              </Card>
            </li>
          ))}
        </ul>
      ) : (
        <Card className="mt-8 p-8 text-center">
          <h2 className="text-lg font-bold text-ink-900">No saved searches yet</h2>
          <p className="mt-1 text-ink-600">Set the filters you care about on the machines page, then choose “Save this search”.</p>
        </Card>
      )}
    </div>
  );
}
