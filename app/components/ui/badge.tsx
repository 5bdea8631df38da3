import type { ReactNode } from "react";
import { cx } from "./cx";

type Tone = "neutral" | "within" | "beyond" | "caution" | "brass";

const tones: Record<Tone, string> = {
  neutral: "bg-ink-100 text-ink-700 ring-ink-200",
  within: "bg-within-soft text-within ring-within/25",
  beyond: "bg-beyond-soft text-beyond ring-beyond/25",
  caution: "bg-caution-soft text-caution ring-caution/25",
  brass: "bg-brass-100 text-brass-700 ring-brass-200",
};

export function Badge({ tone = "neutral", children, className }: { tone?: Tone; children: ReactNode; className?: string }) {
  return (
    <span
      className={cx(
        "inline-flex items-center gap-1 whitespace-nowrap rounded-full px-2.5 py-0.5 text-xs font-semibold ring-1 ring-inset",
        tones[tone],
        className,
      )}
    >
      {children}
    </span>
  );
}
