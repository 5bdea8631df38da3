/**
 * The Tenthmark mark: a ruled scale whose one long graduation is picked out in brass — a tenth of a
 * thousandth is the reading the trade cares about.
 */
export function NameMark({ className }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 ${className ?? ""}`}>
      <svg viewBox="0 0 28 28" className="size-7" aria-hidden="true">
        <rect x="1" y="1" width="26" height="26" rx="6" fill="var(--color-ink-900)" />
        {[6, 10, 14, 18, 22].map((x) => (
          <rect key={x} x={x - 0.75} y={x === 14 ? 6 : 13} width="1.5" height={x === 14 ? 16 : 9} rx="0.75" fill={x === 14 ? "var(--color-brass-300)" : "var(--color-ink-200)"} />
        ))}
      </svg>
      <span className="text-lg font-extrabold tracking-tight text-ink-900">
        Tenth<span className="text-brass-600">mark</span>
      </span>
    </span>
  );
}
