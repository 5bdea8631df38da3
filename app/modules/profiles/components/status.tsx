import { Badge } from "~/components/ui";

const LABELS = { draft: ["draft", "caution"], published: ["published", "within"], retired: ["retired", "neutral"] } as const;

export function ProfileStatusBadge({ status }: { status: "draft" | "published" | "retired" }) {
  const [label, tone] = LABELS[status];
  return <Badge tone={tone}>{label}</Badge>;
}
