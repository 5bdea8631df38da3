/**
 * The Tenthmark mark: a ruled scale whose one long graduation is picked out in brass — a tenth of a
 * thousandth is the reading the trade cares about. The scale is a file (`public/mark.svg`, ink-900, ink-200
 * and brass-300), not markup: every page's script would carry its drawing.
 */
export function NameMark({ className }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 ${className ?? ""}`}>
      <img src="/mark.svg" alt="" width={28} height={28} className="size-7" />
      <span className="text-lg font-extrabold tracking-tight text-ink-900">
        Tenth<span className="text-brass-600">mark</span>
      </span>
    </span>
  );
}
