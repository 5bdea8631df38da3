import { useEffect, useRef, useState } from "react";
import { Link, useFetcher, useLocation, useSearchParams, type ShouldRevalidateFunctionArgs } from "react-router";
import { Button, ButtonLink } from "~/components/ui/button";
import { Card } from "~/components/ui/card";
import { cx } from "~/components/ui/cx";
import { databaseContext } from "~/db/context";
import { getOptionalUser } from "~/modules/accounts/guards.server";
import { filterChoices } from "~/modules/search/choices";
import { FilterPanel } from "~/modules/search/components/filter-panel";
import { ResultCard } from "~/modules/search/components/result-card";
import { draftFromParams, paramsFromDraft, type DraftKey, type SearchDraft } from "~/modules/search/components/search-form";
import { parseListingSearchParams } from "~/modules/search/search-params.server";
import { searchMachines, type MachineSearch } from "~/modules/search/service.server";
import type { DisplayUnits } from "~/modules/units/format";
import type { Route } from "./+types/machines";

export const meta: Route.MetaFunction = () => [
  { title: "Machines for sale, searchable by verified accuracy — Tenthmark" },
  { name: "description", content: "Used lathes and machine tools for sale. Filter by inspected spindle run-out, axial slip, parallelism and grade." },
];

// Rendered once per search answer for visitors without a session (app/modules/http/rendered-pages.server.ts).
export const handle = { keepRendered: true };

export async function loader({ request, context }: Route.LoaderArgs) {
  const viewer = await getOptionalUser(request);
  const units: DisplayUnits = viewer?.displayUnits ?? "mm";
  const account = viewer ? { verified: viewer.emailVerified } : null;
  const parsed = parseListingSearchParams(new URL(request.url).searchParams);
  const choices = filterChoices();
  if (!parsed.success) return { units, account, choices, search: null, errors: parsed.errors };
  const search = await searchMachines(context.get(databaseContext), parsed.query, { units, after: parsed.after });
  return { units, account, choices, search, errors: null };
}

// After the first page, the page fetches its results from the API itself: a change of the search alone
// needs no loader run.
export function shouldRevalidate({ currentUrl, nextUrl, formMethod, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  if (!formMethod && currentUrl.pathname === nextUrl.pathname) return false;
  return defaultShouldRevalidate;
}

type Answer = { key: string; search: MachineSearch | null; errors: Record<string, string[]> | null; failed: boolean };


export default function MachineSearchPage({ loaderData }: Route.ComponentProps) {
  const { units, account } = loaderData;
  const location = useLocation();
  const [searchParams, setSearchParams] = useSearchParams();
  const [answer, setAnswer] = useState<Answer>({ key: location.search, search: loaderData.search, errors: loaderData.errors, failed: false });
  const [loading, setLoading] = useState(false);
  const [draft, setDraft] = useState<SearchDraft>(() => draftFromParams(searchParams, units));
  const [filtersOpen, setFiltersOpen] = useState(false);
  const [attempt, setAttempt] = useState(0);
  const resultsHeadingRef = useRef<HTMLHeadingElement>(null);

  // The address is the state: back, forward and shared links set the form from it.
  useEffect(() => {
    setDraft(draftFromParams(new URLSearchParams(location.search), units));
  }, [location.search, units]);

  useEffect(() => {
    if (answer.key === location.search && !answer.failed) return;
    const controller = new AbortController();
    const params = new URLSearchParams(location.search);
    params.set("units", units);
    setLoading(true);
    fetch(`/api/v1/listings?${params}`, { signal: controller.signal, headers: { accept: "application/json" } })
      .then(async (response) => {
        if (response.status === 400) {
          const body = (await response.json()) as { errors: Record<string, string[]> };
          setAnswer({ key: location.search, search: null, errors: body.errors, failed: false });
        } else if (response.ok) {
          setAnswer({ key: location.search, search: (await response.json()) as MachineSearch, errors: null, failed: false });
        } else {
          setAnswer((previous) => ({ ...previous, key: location.search, failed: true }));
        }
      })
      .catch((error: unknown) => {
        if (!controller.signal.aborted) setAnswer((previous) => ({ ...previous, key: location.search, failed: true }));
        if (!(error instanceof Error)) throw error;
      })
      .finally(() => {
        if (!controller.signal.aborted) setLoading(false);
      });
    return () => controller.abort();
    // `answer` is read only to skip the first page, which the server already rendered.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [location.search, units, attempt]);

  // The compact list view is kept in the address (`view=list`), across filter changes too.
  const list = searchParams.get("view") === "list";
  function commit(next: SearchDraft = draft) {
    const params = paramsFromDraft(next, units);
    if (list) params.set("view", "list");
    if (params.toString() === new URLSearchParams(location.search).toString()) return;
    setSearchParams(params, { preventScrollReset: true });
  }

  function change(key: DraftKey, value: SearchDraft[DraftKey], now: boolean) {
    const next = { ...draft, [key]: value } as SearchDraft;
    setDraft(next);
    if (now) commit(next);
  }

  const { search, errors } = answer;
  const activeFilters = [...searchParams.keys()].filter((key) => !["q", "sort", "page", "perPage", "currency", "units", "view"].includes(key)).length;
  // The address with one parameter changed; 1 (the first page) and "" (cards) are the defaults, left out.
  const linkWith = (key: string, value: string | number) => {
    const params = new URLSearchParams(location.search);
    if (value && value !== 1) params.set(key, String(value));
    else params.delete(key);
    return `?${params}`;
  };

  return (
    <div className="mx-auto max-w-6xl px-4 py-8 sm:px-6 sm:py-10">
      <form
        method="get"
        action="/machines"
        onSubmit={(event) => {
          event.preventDefault();
          commit();
          setFiltersOpen(false);
          // Closing the drawer hides the button that had focus: carry focus on to what the filters changed,
          // once the drawer is gone, so that the heading is scrolled into view where it now stands.
          if (filtersOpen) requestAnimationFrame(() => resultsHeadingRef.current?.focus());
        }}
      >
        <div className="search-head">
          <div>
            <h1 className="text-3xl font-extrabold text-ink-900">Machines for sale</h1>
            <p className="mt-1 max-w-2xl text-ink-600">
              Filter on what an inspector measured: spindle run-out, axial slip, parallelism, centre height. Figures in{" "}
              {units === "inch" ? "inches" : "µm"}; change your units in{" "}
              <Link to="/account" className="ui-text-link">
                account settings
              </Link>
              .
            </p>
          </div>
          <ButtonLink to="/sell/new" variant="secondary">
            Sell a machine
          </ButtonLink>
        </div>

        <div className="mt-6 flex gap-2">
          <label className="min-w-0 flex-1">
            <span className="sr-only">Search words</span>
            <input
              type="search"
              name="q"
              value={draft.q}
              onChange={(event) => change("q", event.target.value, false)}
              placeholder="Make, model, town… e.g. toolroom D1-4"
              className="search-words"
            />
          </label>
          <Button type="submit" size="lg">
            Search
          </Button>
        </div>

        <div className="search-layout">
          <aside aria-label="Filters">
            <button
              type="button"
              className="search-filters-toggle"
              aria-expanded={filtersOpen}
              aria-controls="search-filters"
              onClick={() => setFiltersOpen((open) => !open)}
            >
              <span>Filters{activeFilters ? ` (${activeFilters})` : ""}</span>
              <span aria-hidden="true">{filtersOpen ? "▴" : "▾"}</span>
            </button>
            <div id="search-filters" className={cx("mt-3 lg:mt-0 lg:block", filtersOpen ? "block" : "hidden")}>
              <FilterPanel
                draft={draft}
                units={units}
                facets={search?.facets ?? null}
                choices={loaderData.choices}
                errors={errors}
                onChange={change}
                onCommit={() => commit()}
                onClear={() => {
                  const cleared = draftFromParams(new URLSearchParams(), units);
                  setDraft(cleared);
                  commit(cleared);
                }}
              />
            </div>
          </aside>

          <section aria-label="Results" aria-busy={loading} className={cx("min-w-0 transition-opacity", loading && "opacity-60")}>
            {search?.notice ? (
              <p role="status" className="search-message border-caution/30 bg-caution-soft" data-testid="search-notice">
                {search.notice}
              </p>
            ) : null}
            {answer.failed ? (
              <p role="alert" className="search-message search-failed">
                The results could not be loaded. Check your connection and try again.
                <Button size="sm" variant="secondary" onClick={() => setAttempt((count) => count + 1)}>
                  Try again
                </Button>
              </p>
            ) : null}

            <div className="search-row">
              <h2 ref={resultsHeadingRef} tabIndex={-1} className="text-sm font-semibold text-ink-700" aria-live="polite" data-testid="result-count">
                {search ? (search.totalHits === 1 ? "1 machine" : `${search.totalHits} machines`) : errors ? "Check the filters" : ""}
                {search?.summary && search.summary !== "Every machine" ? <span className="font-normal text-ink-500"> · {search.summary}</span> : null}
              </h2>
              <Link to={linkWith("view", list ? "" : "list")} className="ui-text-link ml-auto hidden text-sm md:block">
                {list ? "Card view" : "List view"}
              </Link>
              <label className="search-inline-label">
                Sort
                <select
                  name="sort"
                  value={draft.sort || (draft.q ? "relevance" : "newest")}
                  onChange={(event) => change("sort", event.target.value, true)}
                  className="ui-control w-auto border-ink-300 py-1.5 pl-2 pr-8 text-sm"
                >
                  {draft.q ? <option value="relevance">Best match</option> : null}
                  {loaderData.choices.sorts.map((sort) => (
                    <option key={sort.value} value={sort.value}>
                      {sort.label}
                    </option>
                  ))}
                </select>
              </label>
            </div>

            {errors ? (
              <Card className="mt-4 p-6 text-sm text-ink-700" role="alert">
                <p className="font-semibold text-ink-900">Some filters are not valid:</p>
                <ul className="mt-2 list-disc pl-5">
                  {Object.values(errors).flat().map((message) => (
                    <li key={message}>{message}</li>
                  ))}
                </ul>
              </Card>
            ) : null}

            {search && search.hits.length ? (
              <p className="mt-3 text-sm text-ink-600">
                Tick up to four machines, then{" "}
                <button type="submit" form="compare-form" className="ui-text-link text-ink-900">
                  compare the ticked machines
                </button>
                .
              </p>
            ) : null}
            {search && search.hits.length ? (
              <ul className="search-results" data-view={list ? "list" : "cards"} data-testid="results">
                {search.hits.map((hit) => (
                  <li key={hit.id}>
                    <ResultCard hit={hit} />
                  </li>
                ))}
              </ul>
            ) : null}

            {search && !search.hits.length ? (
              <Card className="mt-4 p-6 sm:p-8" data-testid="empty-results">
                <h3 className="text-lg font-bold text-ink-900">{search.emptyBecause ?? "No machines match this search"}.</h3>
                {search.suggestions.length ? (
                  <>
                    <p className="mt-2 text-sm text-ink-600">Widen one filter:</p>
                    <ul className="mt-3 flex flex-col gap-2">
                      {search.suggestions.map((suggestion) => (
                        <li key={suggestion.filter}>
                          <Link to={`?${suggestion.queryString}`} className="search-suggestion">
                            {suggestion.text}
                          </Link>
                        </li>
                      ))}
                    </ul>
                  </>
                ) : (
                  <p className="mt-2 text-sm text-ink-600">Nothing is listed that comes close yet. Save the search and we will e-mail you when a machine matches.</p>
                )}
              </Card>
            ) : null}

            {search && search.totalPages > 1 ? (
              <nav aria-label="Pages" className="search-pages">
                {search.page > 1 ? (
                  <Link to={linkWith("page", search.page - 1)} rel="prev" className="search-page-link">
                    ← Previous
                  </Link>
                ) : null}
                {Array.from({ length: search.totalPages }, (_, index) => index + 1)
                  .filter((page) => page === 1 || page === search.totalPages || Math.abs(page - search.page) <= 2)
                  .map((page) => (
                    <Link
                      key={page}
                      to={linkWith("page", page)}
                      aria-current={page === search.page ? "page" : undefined}
                      className="search-page-link min-w-10 text-center tabular"
                    >
                      {page}
                    </Link>
                  ))}
                {search.page < search.totalPages ? (
                  <Link to={linkWith("page", search.page + 1)} rel="next" className="search-page-link">
                    Next →
                  </Link>
                ) : null}
              </nav>
            ) : null}

            {search ? <SaveSearch key={search.queryString} account={account} queryString={search.queryString} summary={search.summary} /> : null}
          </section>
        </div>
      </form>
      {/* Apart from the filters' form, so that ticking a machine is no filter; its checkboxes name it. */}
      <form id="compare-form" method="get" action="/compare" hidden />
    </div>
  );
}

type SaveReply = { saved?: { id: string; name: string }; errors?: Record<string, string[]> };

/** Save the current search with e-mail alerts: signed-in, confirmed accounts only. */
function SaveSearch({ account, queryString, summary }: { account: { verified: boolean } | null; queryString: string; summary: string }) {
  const fetcher = useFetcher<SaveReply>();
  const [name, setName] = useState(summary);
  const location = useLocation();
  const here = `/machines${location.search}`;
  const saved = fetcher.data?.saved;
  return (
    <div className="search-panel" data-testid="save-search">
      <h2 className="text-base font-bold text-ink-900">Hear about new matches</h2>
      {!account ? (
        <p className="mt-1 text-sm text-ink-600">
          <Link to={`/sign-in?${new URLSearchParams({ redirectTo: here })}`} className="ui-text-link text-ink-900">
            Sign in
          </Link>{" "}
          to save this search and get an e-mail when a matching machine is listed or verified.
        </p>
      ) : !account.verified ? (
        <p className="mt-1 text-sm text-ink-600">
          <Link to={`/verify-email?${new URLSearchParams({ redirectTo: here })}`} className="ui-text-link text-ink-900">
            Confirm your e-mail address
          </Link>{" "}
          to save searches with alerts.
        </p>
      ) : saved ? (
        <p className="mt-1 text-sm text-ink-700" role="status">
          Saved as “{saved.name}”. We will e-mail you when a machine matching it is listed or verified.{" "}
          <Link to="/account/saved-searches" className="ui-text-link">
            Your saved searches
          </Link>
        </p>
      ) : (
        <div className="mt-3 flex flex-col gap-2 sm:flex-row sm:items-start">
          <label className="min-w-0 flex-1">
            <input
              value={name}
              onChange={(event) => setName(event.target.value)}
              maxLength={120}
              className="ui-control border-ink-300"
              aria-label="Name of the saved search"
            />
            {fetcher.data?.errors ? (
              <span className="mt-1 block text-sm font-medium text-beyond" role="alert">
                {Object.values(fetcher.data.errors).flat().join(" ")}
              </span>
            ) : null}
          </label>
          <Button
            variant="secondary"
            disabled={fetcher.state !== "idle"}
            onClick={() => fetcher.submit({ intent: "save", name, queryString }, { method: "post", action: "/account/saved-searches" })}
          >
            {fetcher.state !== "idle" ? "Saving…" : "Save this search"}
          </Button>
        </div>
      )}
    </div>
  );
}
