import { useState } from "react";
import { Link, useFetcher } from "react-router";
import { Button } from "~/components/ui/button";

type SaveReply = { saved?: { id: string; name: string }; errors?: Record<string, string[]> };

/**
 * The name field and button that save the current search with e-mail alerts (confirmed accounts only).
 * The search page loads it on its own, so that visitors, who cannot save, do not download it.
 */
export default function SaveSearchForm({ queryString, summary }: { queryString: string; summary: string }) {
  const fetcher = useFetcher<SaveReply>();
  const [name, setName] = useState(summary);
  const saved = fetcher.data?.saved;
  if (saved) {
    return (
      <p className="mt-1 text-sm text-ink-700" role="status">
        Saved as “{saved.name}”. We will e-mail you when a machine matching it is listed or verified.{" "}
        <Link to="/account/saved-searches" className="font-semibold underline underline-offset-2">
          Your saved searches
        </Link>
      </p>
    );
  }
  return (
    <div className="mt-3 flex flex-col gap-2 sm:flex-row sm:items-start">
      <label className="min-w-0 flex-1">
        <span className="sr-only">Name of the saved search</span>
        <input
          value={name}
          onChange={(event) => setName(event.target.value)}
          maxLength={120}
          className="block w-full rounded-(--radius-control) border border-ink-300 bg-white px-3 py-2 text-base shadow-xs focus:outline-none focus:ring-2 focus:ring-brass-400"
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
  );
}
