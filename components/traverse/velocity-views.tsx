/**
 * The velocity map (the cross-section with each point shaded by its velocity) and the velocity profile
 * along each line, side by side. The server draws them for the result it computed; the traverse screen
 * draws newer ones with this same component once readings change, fetched after the page is up.
 */
import { useId } from "react";
import type { LayoutJson, TraversePointJson } from "@/lib/traverse/result-types";
import type { DuctForDrawing } from "@/lib/traverse/drawing";
import { formatQuantity, type UnitSystem } from "@/lib/units";
import { CrossSection } from "./cross-section";
import { ProfileChartLater } from "./profile-chart-later";

export interface VelocityViewsProps {
  points: readonly TraversePointJson[];
  /** Points marked unreadable, [line, point] 0-based. */
  unreadable: readonly (readonly number[])[];
  layout: LayoutJson;
  duct: DuctForDrawing;
  units: UnitSystem;
  sectionTag: string;
  lines: number;
  round: boolean;
}

/** Whether there is anything to draw: at least one point with a velocity. */
export function hasVelocities(points: readonly TraversePointJson[] | undefined): boolean {
  return !!points?.some((p) => p.velocityMS !== null);
}

export function VelocityViews({ points, unreadable, layout, duct, units, sectionTag, lines, round }: VelocityViewsProps) {
  const id = useId();
  const byPoint = new Map(points.map((p) => [`${p.line}:${p.point}`, p]));
  const velocities = layout.lines.map((l, k) => l.points.map((_, i) => byPoint.get(`${k}:${i}`)?.velocityMS ?? null));
  const filled = new Map(points.filter((p) => p.filledVelocityMS !== undefined).map((p) => [`${p.line}:${p.point}`, p.filledVelocityMS!]));
  const unreadableKeys = new Set(unreadable.map(([k, i]) => `${k}:${i}`));
  return (
    <div className="grid gap-gutter lg:grid-cols-2">
      <section aria-labelledby={`${id}-map`} className="grid content-start gap-3 rounded-card border border-line bg-paper-raised p-gutter">
        <h2 id={`${id}-map`}>Velocity map</h2>
        <p className="text-sm text-ink-soft">Velocity at each point in {formatQuantity(units, "velocity", 0).replace(/^[-\d.,\s]+/, "")}; darker is faster. × unreadable, – not read, italics filled by the engine.</p>
        <CrossSection
          duct={duct}
          layout={layout}
          title={`Velocity map of ${sectionTag}`}
          values={{ velocities, unreadable: unreadableKeys, filled, format: (ms) => formatQuantity(units, "velocity", ms, { withUnit: false, decimals: units === "IP" ? 0 : 1 }) }}
        />
      </section>
      <section aria-labelledby={`${id}-chart`} className="grid content-start gap-3 rounded-card border border-line bg-paper-raised p-gutter">
        <h2 id={`${id}-chart`}>Velocity profile</h2>
        <ProfileChartLater points={points} lines={lines} units={units} round={round} label={`Velocity profile of ${sectionTag} along each ${round ? "diameter" : "line"}`} />
      </section>
    </div>
  );
}
