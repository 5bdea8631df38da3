// On the seller's rebuild page: listings that look like the same machine (make, model, serial), to confirm or turn
// down; the listings already confirmed; for staff, a way to split a wrong match.
import { Form, Link } from "react-router";
import { Badge, Button } from "~/components/ui";

type Suggestion = { listingId: string; slug: string; title: string; serialNumber: string; year: number | null; place: string; status: string; listedOn: string | null; match: "same" | "close" };
type Linked = { id: string; slug: string; make: string; model: string; serialNumber: string | null; publishedAt: string | Date | null };

export function MachineMatchCard({ suggestions, linked, isStaff }: { suggestions: Suggestion[]; linked: Linked[]; isStaff: boolean }) {
  if (!suggestions.length && !linked.length) return null;
  return (
    <section aria-labelledby="machine-heading" className="mt-6 space-y-3 rounded-panel border border-ink-200 bg-white px-5 py-4 shadow-panel">
      <h2 id="machine-heading" className="text-lg font-bold text-ink-900">
        This machine's history
      </h2>
      {linked.length ? (
        <div>
          <p className="text-sm text-ink-600">Confirmed as this same machine; buyers see their signed reports and rebuild records on your listing:</p>
          <ul className="mt-2 space-y-1 text-sm">
            {linked.map((other) => (
              <li key={other.id}>
                <Link to={`/machines/${other.slug}`} className="font-semibold underline underline-offset-2">
                  {other.make} {other.model}
                </Link>{" "}
                · serial {other.serialNumber}
              </li>
            ))}
          </ul>
          {isStaff ? (
            <Form method="post" className="mt-2">
              <input type="hidden" name="intent" value="split-machine" />
              <Button type="submit" variant="secondary" size="sm">
                Staff: take this listing out of the machine's history
              </Button>
            </Form>
          ) : null}
        </div>
      ) : null}
      {suggestions.map((suggestion) => (
        <div key={suggestion.listingId} className="rounded-control border border-ink-200 px-4 py-3" data-testid="machine-suggestion">
          <p className="text-sm text-ink-800">
            Is this the same machine?{" "}
            <Link to={`/machines/${suggestion.slug}`} className="font-semibold underline underline-offset-2">
              {suggestion.title}
            </Link>
            , serial <strong>{suggestion.serialNumber}</strong>
            {suggestion.year ? `, ${suggestion.year}` : ""}, {suggestion.place}
            {suggestion.listedOn ? `, listed ${suggestion.listedOn}` : ""}.{" "}
            {suggestion.match === "close" ? <Badge tone="caution">Serial differs by one character</Badge> : <Badge>Same make, model and serial</Badge>}
          </p>
          <p className="mt-1 text-xs text-ink-500">Nothing is linked until you confirm: check the plate, since serials are often mistyped.</p>
          <div className="mt-2 flex flex-wrap gap-2">
            <Form method="post">
              <input type="hidden" name="intent" value="confirm-machine" />
              <input type="hidden" name="otherListingId" value={suggestion.listingId} />
              <Button type="submit" size="sm">
                Yes, the same machine
              </Button>
            </Form>
            <Form method="post">
              <input type="hidden" name="intent" value="refuse-machine" />
              <input type="hidden" name="otherListingId" value={suggestion.listingId} />
              <Button type="submit" variant="secondary" size="sm">
                No, another machine
              </Button>
            </Form>
          </div>
        </div>
      ))}
    </section>
  );
}
