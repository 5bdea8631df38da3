import { data, Link } from "react-router";
import { Badge, ButtonLink } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { getOptionalUser } from "~/modules/accounts/guards.server";
import { MAX_COMPARED } from "~/modules/listings/compare";
import { compareMachines, comparisonView, parseComparedSlugs } from "~/modules/listings/compare.server";
import type { DisplayUnits } from "~/modules/units/format";
import type { Route } from "./+types/compare";

export const meta: Route.MetaFunction = () => [{ title: "Compare machines — Tenthmark" }, { name: "robots", content: "noindex" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const parsed = parseComparedSlugs(new URL(request.url).searchParams);
  if (!parsed.ok) throw data(parsed.message, { status: 400 });
  const viewer = await getOptionalUser(request);
  const units: DisplayUnits = viewer?.displayUnits ?? "mm";
  return comparisonView(await compareMachines(context.get(databaseContext), parsed.slugs), units);
}

export default function CompareMachines({ loaderData }: Route.ComponentProps) {
  const { columns, specs, figures } = loaderData;
  const slugs = columns.map((column) => column.slug);
  const without = (slug: string) => {
    const params = new URLSearchParams();
    for (const other of slugs) if (other !== slug) params.append("m", other);
    return `/compare${params.size ? `?${params}` : ""}`;
  };
  const cell = "min-w-[11rem] border-b border-ink-100 px-3 py-2.5 align-top";
  const head = "sticky left-0 z-10 min-w-[9rem] max-w-[11rem] border-b border-ink-100 bg-white px-3 py-2.5 text-left align-top text-sm font-semibold text-ink-600";
  const group = "bg-ink-50 px-3 py-2 text-left text-sm font-bold text-ink-700";

  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6 sm:py-10">
      <nav aria-label="Breadcrumb" className="text-sm text-ink-500">
        <Link to="/machines" className="font-semibold hover:text-ink-900">
          Machines
        </Link>{" "}
        / Compare
      </nav>
      <h1 className="mt-2 text-3xl font-extrabold text-ink-900">Compare machines</h1>
      {columns.length ? (
        <p className="mt-2 max-w-3xl text-ink-600">
          Up to {MAX_COMPARED} machines side by side. For each measured figure, the smallest deviation among them is marked “Best of these”: lower is
          better. The address of this page shows the same comparison to anyone you send it to.
        </p>
      ) : (
        <div className="mt-4 max-w-3xl space-y-3 text-ink-700">
          <p>No machines chosen yet. Tick “Compare” on up to {MAX_COMPARED} machines in the search results or among your watched machines, then compare the ticked machines.</p>
          <ButtonLink to="/machines" variant="secondary">
            Search machines
          </ButtonLink>
        </div>
      )}

      {columns.length ? (
        // The table scrolls inside its frame on a narrow screen; the frame is positioned so that the screen-reader
        // texts (absolutely placed) of columns out of view are clipped with them instead of widening the page.
        <div className="relative mt-6 overflow-x-auto rounded-panel border border-ink-200 bg-white" data-testid="comparison">
          <table className="w-full border-collapse text-sm">
            <caption className="sr-only">Specifications and verified figures of the compared machines, one machine per column</caption>
            <thead>
              <tr>
                <td className={head} />
                {columns.map((column) => (
                  <th key={column.slug} scope="col" className={`${cell} text-left`} data-compared={column.slug}>
                    {column.available ? (
                      <div className="space-y-2">
                        {column.photoUrl ? <img src={column.photoUrl} alt="" className="aspect-[4/3] w-full max-w-[14rem] rounded-control object-cover" width={224} height={168} /> : null}
                        <Link to={`/machines/${column.slug}`} className="block text-base font-bold text-ink-900 underline-offset-2 hover:underline">
                          {column.title}
                        </Link>
                        <p className="text-xs font-normal text-ink-500">Offered by {column.sellerName}</p>
                        {column.status === "sold" ? <Badge tone="caution">Sold</Badge> : null}
                      </div>
                    ) : (
                      <div className="space-y-1">
                        <p className="text-base font-bold text-ink-500">Unavailable</p>
                        <p className="text-xs font-normal text-ink-500">No longer offered, or the link is mistyped.</p>
                      </div>
                    )}
                    <Link to={without(column.slug)} className="mt-2 inline-block text-xs font-semibold text-ink-700 underline underline-offset-2">
                      Remove<span className="sr-only"> {column.available ? column.title : "the unavailable machine"} from the comparison</span>
                    </Link>
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              <tr>
                <th scope="rowgroup" colSpan={columns.length + 1} className={group}>
                  Specification
                </th>
              </tr>
              {specs.map((row) => (
                <tr key={row.label}>
                  <th scope="row" className={head}>
                    {row.label}
                  </th>
                  {row.values.map((value, index) => (
                    <td key={slugs[index]} className={`${cell} tabular ${value ? "text-ink-900" : "text-ink-400"}`}>
                      {columns[index]!.available ? (value ?? "not given") : "—"}
                    </td>
                  ))}
                </tr>
              ))}
              <tr>
                <th scope="rowgroup" colSpan={columns.length + 1} className={group}>
                  Verified accuracy (lower is better)
                </th>
              </tr>
              <tr>
                <th scope="row" className={head}>
                  Current report
                </th>
                {columns.map((column) => (
                  <td key={column.slug} className={cell}>
                    {!column.available ? (
                      "—"
                    ) : column.report ? (
                      <Link to={column.report.href} className="font-semibold text-ink-900 underline underline-offset-2">
                        {column.report.text}
                      </Link>
                    ) : (
                      <span className="text-ink-500">Not yet verified</span>
                    )}
                  </td>
                ))}
              </tr>
              {figures.map((row) => (
                <tr key={row.label}>
                  <th scope="row" className={head}>
                    {row.label}
                  </th>
                  {row.cells.map((figure, index) =>
                    figure === null || figure === "not measured" ? (
                      <td key={slugs[index]} className={`${cell} text-ink-400`}>
                        {figure ?? "—"}
                      </td>
                    ) : (
                      <td key={slugs[index]} className={`${cell} tabular`} data-best={figure.best || undefined}>
                        <span className={figure.best ? "font-extrabold text-within" : "text-ink-900"}>{figure.text}</span>
                        {figure.best ? <span className="ml-2 whitespace-nowrap rounded-full bg-within-soft px-2 py-0.5 text-xs font-bold text-within">✓ Best of these</span> : null}
                        <span className="block text-xs text-ink-500">report of {figure.reportDate}</span>
                      </td>
                    ),
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {columns.length && !figures.length ? <p className="mt-4 text-sm text-ink-600">None of these machines has a verified figure yet.</p> : null}
    </div>
  );
}
