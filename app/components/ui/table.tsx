import type { HTMLAttributes, TdHTMLAttributes, ThHTMLAttributes } from "react";
import { cx } from "./cx";

/**
 * A table that scrolls sideways on a phone instead of squeezing its columns. The scrolling box is a named
 * region in the tab order, so that a keyboard can scroll it too (WCAG 2.1.1).
 */
export function Table({ className, caption, children, ...props }: HTMLAttributes<HTMLTableElement> & { caption?: string }) {
  return (
    <div className="overflow-x-auto rounded-panel border border-ink-200 bg-white" role="region" aria-label={caption} tabIndex={0}>
      <table className={cx("min-w-full divide-y divide-ink-200 text-sm", className)} {...props}>
        {caption ? <caption className="sr-only">{caption}</caption> : null}
        {children}
      </table>
    </div>
  );
}

export function Th({ className, ...props }: ThHTMLAttributes<HTMLTableCellElement>) {
  return (
    <th
      scope="col"
      className={cx("bg-ink-50 px-4 py-2.5 text-left text-xs font-bold uppercase tracking-wide text-ink-600", className)}
      {...props}
    />
  );
}

export function Td({ className, ...props }: TdHTMLAttributes<HTMLTableCellElement>) {
  return <td className={cx("px-4 py-2.5 align-top text-ink-800", className)} {...props} />;
}

export function Tr({ className, ...props }: HTMLAttributes<HTMLTableRowElement>) {
  return <tr className={cx("border-t border-ink-100 first:border-t-0", className)} {...props} />;
}
