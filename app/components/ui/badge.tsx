import type { ReactNode } from "react";
import { cx } from "./cx";

type Tone = "neutral" | "within" | "beyond" | "caution" | "brass";

// The tones are in app/app.css (`ui-badge-…`).
export function Badge({ tone = "neutral", children, className }: { tone?: Tone; children: ReactNode; className?: string }) {
  return (
    <span
      className={cx("ui-badge", `ui-badge-${tone}`, className)}
    >
      {children}
    </span>
  );
}
