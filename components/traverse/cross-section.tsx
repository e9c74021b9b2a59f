/**
 * The duct's cross-section as an SVG: the outline, each traverse line from its numbered test port,
 * and every point numbered along its line. As a map (`values`), each point is shaded by its velocity
 * with the value printed on it, so the map reads without colour; unreadable points are hatched and
 * crossed, points not read yet are left open with a dash.
 */
import { useId } from "react";
import { crossSectionDrawing, type DuctForDrawing, type LayoutForDrawing } from "@/lib/traverse/drawing";

export interface MapValues {
  /** Velocity at each point (m/s), [line][point]; null where none. */
  velocities: (number | null)[][];
  /** "line:point" of points marked unreadable. */
  unreadable: ReadonlySet<string>;
  /** Points whose gap the engine filled: shown with the filled velocity, in italics. */
  filled: ReadonlyMap<string, number>;
  /** Formats a velocity without its unit (the caption gives it). */
  format: (velocityMS: number) => string;
}

export function CrossSection({ duct, layout, title, values, highlight }: { duct: DuctForDrawing; layout: LayoutForDrawing; title: string; values?: MapValues; highlight?: string | null }) {
  const id = useId();
  const d = crossSectionDrawing(duct, layout);
  const max = values ? Math.max(0, ...values.velocities.flat().filter((v): v is number => v !== null), ...values.filled.values()) : 0;
  // Map markers stay small enough that the closest neighbours do not touch; their values are printed beside them.
  const r = values ? Math.max(5, Math.min(11, d.minSpacing * 0.42)) : d.pointRadius;
  const fontSize = Math.max(8, Math.min(13, r * 1.05));
  const labelSize = 15;
  const lineWord = duct.shape === "round" ? "diameter" : "line";
  return (
    <svg viewBox={d.viewBox} role="img" aria-labelledby={`${id}-t ${id}-d`} className="h-auto w-full max-w-xl" style={{ aspectRatio: `${d.width} / ${d.height}` }}>
      <title id={`${id}-t`}>{title}</title>
      <desc id={`${id}-d`}>
        {`${layout.lineCount} ${lineWord}${layout.lineCount === 1 ? "" : "s"} of ${layout.pointsPerLine} points, each from its numbered test port; points numbered from the port.`}
        {values ? " Each point is shaded by its velocity, with the value printed on it." : ""}
      </desc>
      <defs>
        <pattern id={`${id}-hatch`} width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
          <line x1="0" y1="0" x2="0" y2="6" stroke="currentColor" strokeWidth="2" className="text-ink-soft" />
        </pattern>
      </defs>
      {d.outline.kind === "circle" ? (
        <circle cx={d.outline.cx} cy={d.outline.cy} r={d.outline.r} className="fill-paper stroke-ink" strokeWidth="3" />
      ) : (
        <rect x={d.outline.x} y={d.outline.y} width={d.outline.w} height={d.outline.h} className="fill-paper stroke-ink" strokeWidth="3" />
      )}
      {d.lines.map((l) => (
        <g key={l.line}>
          <line x1={l.x1} y1={l.y1} x2={l.x2} y2={l.y2} className="stroke-line-strong" strokeWidth="1.5" strokeDasharray="6 5" />
          {/* The port: a notch in the wall with its number outside. */}
          <rect x={l.port.x - 7} y={l.port.y - 7} width="14" height="14" className="fill-ink" transform={`rotate(45 ${l.port.x} ${l.port.y})`} />
          <text x={l.labelAt.x} y={l.labelAt.y} textAnchor="middle" dominantBaseline="central" className="fill-ink font-semibold" fontSize="17">
            {`P${l.label}`}
          </text>
        </g>
      ))}
      {d.points.map((p) => {
        const key = `${p.line}:${p.point}`;
        const v = values?.velocities[p.line]?.[p.point] ?? null;
        const blocked = values?.unreadable.has(key) ?? false;
        const filled = values?.filled.get(key);
        const shade = v !== null && max > 0 ? 0.12 + 0.78 * Math.max(0, v) / max : 0;
        const stroke = highlight === key ? "stroke-fault" : p.beyondReach ? "stroke-caution" : "stroke-ink";
        const marker = (
          <>
            <circle
              cx={p.x}
              cy={p.y}
              r={r}
              className={`${blocked ? "" : v !== null ? "fill-accent" : "fill-paper-raised"} ${stroke}`}
              fill={blocked ? `url(#${id}-hatch)` : undefined}
              fillOpacity={v !== null && !blocked ? shade : 1}
              strokeWidth={highlight === key ? 4 : p.beyondReach ? 3 : 1.5}
              strokeDasharray={values && v === null && !blocked ? "3 3" : undefined}
            />
            {p.beyondReach && <rect x={p.x - r - 3} y={p.y - r - 3} width={2 * r + 6} height={2 * r + 6} fill="none" className="stroke-caution" strokeWidth="2" />}
          </>
        );
        if (!values)
          return (
            <g key={key} data-point={key}>
              {marker}
              <text x={p.x} y={p.y} textAnchor="middle" dominantBaseline="central" fontSize={fontSize} className="fill-ink font-semibold">
                {p.point + 1}
              </text>
            </g>
          );
        // On the map the value is printed beside its marker, across the line from it (alternating sides on a
        // diameter, where points crowd at the walls), large enough to read at arm's length.
        const line = d.lines[p.line]!;
        const len = Math.hypot(line.x2 - line.x1, line.y2 - line.y1) || 1;
        const side = duct.shape === "round" && p.point % 2 === 1 ? -1 : 1;
        const nx = (-(line.y2 - line.y1) / len) * side;
        const ny = ((line.x2 - line.x1) / len) * side;
        const gap = r + 5;
        const tx = p.x + nx * gap;
        const ty = p.y + ny * gap;
        const anchor = Math.abs(nx) > 0.4 ? (nx > 0 ? "start" : "end") : "middle";
        const text = blocked ? "unreadable" : v !== null ? values.format(v) : filled !== undefined ? values.format(filled) : "–";
        return (
          <g key={key} data-point={key}>
            {marker}
            {blocked && (
              <text x={p.x} y={p.y} textAnchor="middle" dominantBaseline="central" fontSize={r * 1.4} className="fill-ink font-semibold">
                ×
              </text>
            )}
            <text
              x={tx}
              y={ty}
              textAnchor={anchor}
              dominantBaseline={Math.abs(ny) > 0.4 && anchor === "middle" ? (ny > 0 ? "hanging" : "auto") : "central"}
              fontSize={labelSize}
              fontStyle={filled !== undefined && v === null && !blocked ? "italic" : undefined}
              className="fill-ink font-semibold"
              stroke="#ffffff"
              strokeWidth="4"
              paintOrder="stroke"
            >
              {text}
            </text>
          </g>
        );
      })}
    </svg>
  );
}
