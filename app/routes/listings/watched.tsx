import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import { Badge, Button, ButtonLink, Card } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { requireUser } from "~/modules/accounts/guards.server";
import { listWatchedMachines, setWatchDigests, stopWatching } from "~/modules/listings/watchlist.server";
import type { Route } from "./+types/watched";
import { formatDate } from "~/modules/units/dates";

export const meta: Route.MetaFunction = () => [{ title: "Watched machines — Tenthmark" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const viewer = await requireUser(request);
  return listWatchedMachines(context.get(databaseContext), viewer);
}

const intents = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("unwatch"), listingId: z.uuid() }),
  z.object({ intent: z.literal("digest"), enabled: z.enum(["on", "off"]) }),
]);

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = await requireUser(request);
  const parsed = intents.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ errors: z.flattenError(parsed.error).fieldErrors as Record<string, string[]> }, { status: 422 });
  const db = context.get(databaseContext);
  if (parsed.data.intent === "unwatch") await stopWatching(db, viewer, parsed.data.listingId);
  else await setWatchDigests(db, viewer, parsed.data.enabled === "on");
  return { done: parsed.data.intent };
}

export default function WatchedMachines({ loaderData }: Route.ComponentProps) {
  const { machines, digestsOn } = loaderData;
  const navigation = useNavigation();
  const busy = navigation.state !== "idle" ? navigation.formData?.get("listingId") : null;
  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <nav aria-label="Breadcrumb" className="text-sm text-ink-500">
        <Link to="/account" className="font-semibold hover:text-ink-900">
          Your account
        </Link>{" "}
        / Watched machines
      </nav>
      <div className="mt-3 flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-3xl font-extrabold text-ink-900">Watched machines</h1>
          <p className="mt-1 max-w-2xl text-ink-600">
            {digestsOn
              ? "We e-mail you at most once a day when a machine here drops in price, is newly verified, or is sold or withdrawn."
              : "The daily e-mail about these machines is off."}
          </p>
        </div>
        <Form method="post">
          <input type="hidden" name="intent" value="digest" />
          <input type="hidden" name="enabled" value={digestsOn ? "off" : "on"} />
          <Button type="submit" size="sm" variant="secondary">
            {digestsOn ? "Turn the daily e-mail off" : "Turn the daily e-mail on"}
          </Button>
        </Form>
      </div>

      {machines.some((machine) => machine.href) ? (
        <form method="get" action="/compare" id="compare-form" className="mt-8 flex flex-wrap items-center gap-3 text-sm text-ink-600">
          Tick up to four machines to see them side by side.
          <Button type="submit" size="sm" variant="secondary">
            Compare the ticked machines
          </Button>
        </form>
      ) : null}
      {machines.length ? (
        <ul className="mt-4 space-y-3" data-testid="watched-machines">
          {machines.map((machine) => (
            <li key={machine.listingId}>
              <Card className="flex gap-4 p-4" data-watched={machine.title}>
                <div className="h-16 w-20 shrink-0 overflow-hidden rounded-control bg-ink-100 sm:h-20 sm:w-28">
                  {machine.photoUrl ? <img src={machine.photoUrl} alt="" className="h-full w-full object-cover" loading="lazy" /> : null}
                </div>
                <div className="flex min-w-0 flex-1 flex-col gap-3 sm:flex-row sm:items-center sm:justify-between">
                  <div className="min-w-0">
                    <h2 className="text-base font-bold text-ink-900 sm:text-lg">
                      {machine.href ? (
                        <Link to={machine.href} className="hover:underline">
                          {machine.title}
                        </Link>
                      ) : (
                        machine.title
                      )}
                      {machine.year ? <span className="font-normal text-ink-500"> · {machine.year}</span> : null}
                    </h2>
                    <p className="text-sm text-ink-600">{machine.place}</p>
                    {machine.href ? (
                      <label className="mt-1 flex w-fit items-center gap-2 text-sm font-semibold text-ink-700">
                        <input type="checkbox" name="m" value={machine.href.replace(/^\/machines\//, "")} form="compare-form" className="size-4 accent-ink-900" />
                        Compare<span className="sr-only"> {machine.title}</span>
                      </label>
                    ) : null}
                    <p className="mt-1 flex flex-wrap items-center gap-2 text-sm">
                      <span className="font-bold text-ink-900 tabular">{machine.price}</span>
                      <Badge tone={machine.status === "published" ? "neutral" : "caution"}>{machine.statusLabel}</Badge>
                      {machine.grade ? <Badge tone="within">Verified · grade {machine.grade}</Badge> : <Badge>Not yet verified</Badge>}
                      <span className="text-xs text-ink-500">Watched since {formatDate(machine.watchedOn)}</span>
                    </p>
                  </div>
                  <Form method="post" className="shrink-0">
                    <input type="hidden" name="intent" value="unwatch" />
                    <input type="hidden" name="listingId" value={machine.listingId} />
                    <Button type="submit" size="sm" variant="quiet" disabled={busy === machine.listingId} aria-label={`Stop watching ${machine.title}`}>
                      Stop watching
                    </Button>
                  </Form>
                </div>
              </Card>
            </li>
          ))}
        </ul>
      ) : (
        <Card className="mt-8 p-8 text-center">
          <h2 className="text-lg font-bold text-ink-900">You watch no machines yet</h2>
          <p className="mt-1 text-ink-600">Open a machine and choose “Watch this machine” to follow its price and verification here.</p>
          <ButtonLink to="/machines" variant="secondary" className="mt-4">
            Search machines
          </ButtonLink>
        </Card>
      )}
    </div>
  );
}
