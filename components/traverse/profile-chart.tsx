"use client";

/**
 * The velocity profile along each traverse line (react-chartjs-2), loaded only when the traverse
 * screen shows it. Position is the read position from the port wall; a gap the engine filled is drawn
 * with a hollow marker. The same numbers are in the grid and the map, so the chart adds shape, not data.
 */
import { CategoryScale, Chart as ChartJS, Legend, LinearScale, LineElement, PointElement, Tooltip } from "chart.js";
import { Line } from "react-chartjs-2";
import type { TraversePointJson } from "@/lib/traverse/result-types";
import { displayUnit, toDisplay, type UnitSystem } from "@/lib/units";
import { numberText } from "@/lib/units/number-text";

ChartJS.register(LinearScale, CategoryScale, PointElement, LineElement, Tooltip, Legend);

// Distinct dash patterns and marker shapes per line, so lines are told apart without colour.
const STYLES = [
  { dash: [], marker: "circle" },
  { dash: [8, 4], marker: "rect" },
  { dash: [2, 3], marker: "triangle" },
  { dash: [10, 3, 2, 3], marker: "rectRot" },
  { dash: [5, 5], marker: "star" },
  { dash: [1, 2], marker: "crossRot" },
  { dash: [12, 6], marker: "rectRounded" },
] as const;
const SHADES = ["#0d5c8c", "#111a22", "#8a5a00", "#1d6b3a", "#a3261b", "#52606d", "#083f61"];

/**
 * chart.js's own numeric tick label (decimals from the tick spacing), in en-US like every other figure
 * on the screen and without Intl, whose first number formatter costs a slow tablet a tenth of a second.
 * Velocities and distances never reach the range where chart.js switches to scientific notation.
 */
export function tickLabel(value: number | string, _index: number, ticks: readonly { value: number }[]): string {
  const v = Number(value);
  if (v === 0) return "0";
  let delta = v;
  if (ticks.length > 1) {
    delta = ticks.length > 3 ? ticks[2]!.value - ticks[1]!.value : ticks[1]!.value - ticks[0]!.value;
    if (Math.abs(delta) >= 1 && v !== Math.floor(v)) delta = v - Math.floor(v);
  }
  const logDelta = Math.log10(Math.abs(delta));
  const decimals = Number.isNaN(logDelta) ? 1 : Math.max(Math.min(-Math.floor(logDelta), 20), 0);
  return numberText(v, decimals);
}

export function ProfileChart({ points, lines, units, round, label }: { points: readonly TraversePointJson[]; lines: number; units: UnitSystem; round: boolean; label: string }) {
  const v = displayUnit(units, "velocity");
  const d = displayUnit(units, "dimension");
  const datasets = Array.from({ length: lines }, (_, k) => {
    const style = STYLES[k % STYLES.length]!;
    const onLine = points.filter((p) => p.line === k);
    return {
      label: `${round ? "Diameter" : "Line"} ${k + 1}`,
      data: onLine.map((p) => ({
        x: toDisplay(units, "dimension", p.readPositionMm),
        y: p.velocityMS !== null ? toDisplay(units, "velocity", p.velocityMS) : p.filledVelocityMS !== undefined ? toDisplay(units, "velocity", p.filledVelocityMS) : null,
      })),
      borderColor: SHADES[k % SHADES.length],
      backgroundColor: onLine.map((p) => (p.velocityMS === null ? "#ffffff" : SHADES[k % SHADES.length])),
      borderDash: [...style.dash],
      pointStyle: style.marker,
      pointRadius: 5,
      spanGaps: true,
    };
  });
  return (
    <div className="relative h-72 w-full">
      <Line
        role="img"
        aria-label={label}
        data={{ datasets }}
        options={{
          animation: false,
          maintainAspectRatio: false,
          parsing: false,
          scales: {
            x: { type: "linear", title: { display: true, text: `Distance from the port wall (${d.symbol})` }, ticks: { callback: tickLabel } },
            y: { type: "linear", beginAtZero: true, title: { display: true, text: `Velocity (${v.symbol})` }, ticks: { callback: tickLabel } },
          },
          plugins: { legend: { position: "bottom", labels: { usePointStyle: true } } },
        }}
      />
    </div>
  );
}
