// Small sketches beside each correction: not to scale (the tilt is exaggerated so it can be seen), labelled with
// the figures the card computed. Plain SVG: nothing to download.
import type { ReactNode } from "react";

function Sketch({ title, children, height = 150 }: { title: string; children: ReactNode; height?: number }) {
  return (
    <svg viewBox={`0 0 320 ${height}`} role="img" aria-label={title} className="h-auto w-full text-ink-700" data-testid="planner-sketch">
      <title>{title}</title>
      <defs>
        <marker id="planner-arrow" viewBox="0 0 10 10" refX="8" refY="5" markerWidth="6" markerHeight="6" orient="auto-start-reverse">
          <path d="M0 0 10 5 0 10z" fill="#845710" />
        </marker>
      </defs>
      {children}
    </svg>
  );
}

const accent = "#845710";

/** Side view (vertical) or plan view (horizontal) of a part on two pads, the mandrel leaning, the pad to move. */
export function TiltSketch({ plane, pad, direction, label }: { plane: "vertical" | "horizontal"; pad: "nose" | "rear" | null; direction: "up" | "back" | "front" | null; label: string }) {
  // The mandrel as read (the correction brings it back to the dashed line). Vertical: up is higher; plan view:
  // up is the back, down the front (tool side).
  const readsHigh = plane === "vertical" ? pad === "rear" : direction === "front";
  const tip = pad === null ? 84 : readsHigh ? 66 : 102;
  const rearX = 50;
  const noseX = 170;
  return (
    <Sketch title={`${plane === "vertical" ? "Side" : "Plan"} view: ${label}`}>
      <text x="8" y="14" fontSize="10" fill="currentColor">{plane === "vertical" ? "Side view (not to scale)" : "Plan view from above (not to scale)"}</text>
      {plane === "vertical" ? <line x1="20" y1="118" x2="300" y2="118" stroke="currentColor" strokeWidth="2" /> : null}
      <rect x="30" y="70" width="160" height="40" rx="4" fill="#f1dbad" stroke="currentColor" />
      <text x="110" y="94" fontSize="11" textAnchor="middle" fill="currentColor">part</text>
      <line x1="190" y1="84" x2="300" y2={tip} stroke="currentColor" strokeWidth="5" strokeLinecap="round" />
      <line x1="190" y1="84" x2="300" y2="84" stroke="currentColor" strokeDasharray="4 3" strokeWidth="1" />
      <text x="300" y={tip - 6} fontSize="10" textAnchor="end" fill="currentColor">mandrel, free end</text>
      <rect x={rearX - 12} y="110" width="24" height="8" fill="currentColor" />
      <rect x={noseX - 12} y="110" width="24" height="8" fill="currentColor" />
      <text x={rearX} y="136" fontSize="10" textAnchor="middle" fill="currentColor">rear pad</text>
      <text x={noseX} y="136" fontSize="10" textAnchor="middle" fill="currentColor">nose pad</text>
      {/* The arrow comes in from the lower right, clear of the pad's label. */}
      {pad ? (
        plane === "vertical" ? (
          <line x1={(pad === "rear" ? rearX : noseX) + 52} y1="134" x2={(pad === "rear" ? rearX : noseX) + 16} y2="120" stroke={accent} strokeWidth="2.5" markerEnd="url(#planner-arrow)" />
        ) : (
          <line x1={noseX + 30} y1={direction === "back" ? 96 : 60} x2={noseX + 30} y2={direction === "back" ? 60 : 96} stroke={accent} strokeWidth="2.5" markerEnd="url(#planner-arrow)" />
        )
      ) : null}
      <text x="8" y="30" fontSize="11" fontWeight="bold" fill={accent}>{label}</text>
      {plane === "horizontal" ? <text x="8" y="146" fontSize="10" fill="currentColor">front (tool side) ↓ · back ↑</text> : null}
    </Sketch>
  );
}

/** The seating from the shim's line to the rocking edge, each pad with its depth as a bar. */
export function ScrapingSketch({ pads, distance, labels }: { pads: { position: number; depth: number }[]; distance: number; labels: string[] }) {
  const deepest = Math.max(...pads.map((pad) => pad.depth), 1e-9);
  const x = (position: number) => 30 + (position / distance) * 260;
  return (
    <Sketch title={`Scraping depth per pad, deepest ${labels[pads.findIndex((pad) => pad.depth === deepest)] ?? ""}`} height={160}>
      <text x="8" y="14" fontSize="10" fill="currentColor">Seating seen from the side; depth exaggerated</text>
      <line x1="30" y1="50" x2="290" y2="50" stroke="currentColor" strokeWidth="2" />
      <line x1="30" y1="50" x2="290" y2="110" stroke={accent} strokeWidth="1.5" strokeDasharray="5 3" />
      <text x="30" y="40" fontSize="10" fill="currentColor">shim's line (not scraped)</text>
      <text x="290" y="40" fontSize="10" textAnchor="end" fill="currentColor">rocking edge</text>
      {pads.map((pad, i) => (
        <g key={i}>
          <rect x={x(pad.position) - 5} y="50" width="10" height={(pad.depth / deepest) * 60} fill={accent} opacity="0.75" />
          <text x={x(pad.position)} y={126 + (i % 2) * 14} fontSize="9" textAnchor="middle" fill="currentColor">{labels[i]}</text>
        </g>
      ))}
    </Sketch>
  );
}

/** Plan view of the bar between centres, tapered, the tailstock's move. */
export function SetOverSketch({ direction, label }: { direction: "front" | "back" | null; label: string }) {
  const tailWide = direction === "front"; // larger at the tailstock end
  return (
    <Sketch title={`Plan view: ${label}`}>
      <text x="8" y="14" fontSize="10" fill="currentColor">Plan view from above (not to scale)</text>
      <polygon points={direction === null ? "60,62 260,62 260,98 60,98" : tailWide ? "60,66 260,58 260,102 60,94" : "60,58 260,66 260,94 60,102"} fill="#f1dbad" stroke="currentColor" />
      <polygon points="30,80 58,68 58,92" fill="currentColor" />
      <polygon points="290,80 262,68 262,92" fill="currentColor" />
      <text x="30" y="120" fontSize="10" fill="currentColor">headstock centre</text>
      <text x="290" y="120" fontSize="10" textAnchor="end" fill="currentColor">tailstock centre</text>
      {direction ? <line x1="300" y1={direction === "front" ? 50 : 112} x2="300" y2={direction === "front" ? 112 : 50} stroke={accent} strokeWidth="2.5" markerEnd="url(#planner-arrow)" /> : null}
      <text x="8" y="32" fontSize="11" fontWeight="bold" fill={accent}>{label}</text>
      <text x="8" y="146" fontSize="10" fill="currentColor">front (tool side) ↓ · back ↑</text>
    </Sketch>
  );
}

/** The adjusting nut seen end-on with the back-off angle, and the axial movement it gives. */
export function NutSketch({ angle, label }: { angle: number; label: string }) {
  const radians = (Math.min(angle, 359) * Math.PI) / 180;
  const r = 44;
  const endX = 80 + r * Math.sin(radians);
  const endY = 80 - r * Math.cos(radians);
  return (
    <Sketch title={`Nut backed off ${Math.round(angle * 10) / 10}°: ${label}`}>
      <circle cx="80" cy="80" r="52" fill="#f1dbad" stroke="currentColor" />
      <circle cx="80" cy="80" r="22" fill="white" stroke="currentColor" />
      <line x1="80" y1="80" x2="80" y2="36" stroke="currentColor" strokeDasharray="3 2" />
      <line x1="80" y1="80" x2={endX} y2={endY} stroke={accent} strokeWidth="2" />
      <path d={`M 80 36 A ${r} ${r} 0 ${radians > Math.PI ? 1 : 0} 1 ${endX} ${endY}`} fill="none" stroke={accent} strokeWidth="2.5" markerEnd="url(#planner-arrow)" />
      <text x="80" y="146" fontSize="10" textAnchor="middle" fill="currentColor">nut, end-on</text>
      <rect x="180" y="60" width="60" height="40" fill="#f1dbad" stroke="currentColor" />
      <line x1="245" y1="80" x2="300" y2="80" stroke={accent} strokeWidth="2.5" markerEnd="url(#planner-arrow)" />
      <text x="240" y="50" fontSize="11" fontWeight="bold" textAnchor="middle" fill={accent}>{label}</text>
      <text x="210" y="118" fontSize="10" textAnchor="middle" fill="currentColor">axial movement</text>
    </Sketch>
  );
}
