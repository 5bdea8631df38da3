import { Badge } from "~/components/ui";
import { labelOf } from "~/modules/listings/catalogue";
import { listingStatuses } from "~/modules/listings/statuses";

const tones = { draft: "neutral", published: "within", sold: "brass", withdrawn: "caution" } as const;

export function StatusBadge({ status }: { status: string }) {
  return <Badge tone={tones[status as keyof typeof tones] ?? "neutral"}>{labelOf(listingStatuses, status)}</Badge>;
}
