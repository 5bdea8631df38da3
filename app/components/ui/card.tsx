import type { HTMLAttributes } from "react";
import { cx } from "./cx";

export function Card({ className, ...props }: HTMLAttributes<HTMLDivElement>) {
  return (
    <div
      className={cx("rounded-panel border border-ink-200 bg-white shadow-panel", className)}
      {...props}
    />
  );
}
