"use client";

/**
 * % of design per terminal (react-chartjs-2), with the tolerance band drawn as a shaded strip between
 * its lower and upper limits. Loaded only when the system view shows it; the table beside it holds the
 * same numbers for screen readers.
 */
import { BarController, BarElement, CategoryScale, Chart as ChartJS, Filler, Legend, LinearScale, LineController, LineElement, PointElement, Tooltip } from "chart.js";
import { Chart } from "react-chartjs-2";

ChartJS.register(BarController, BarElement, LineController, LineElement, PointElement, CategoryScale, LinearScale, Filler, Tooltip, Legend);

export interface TerminalBar {
  label: string;
  pct: number;
  lowerPct: number;
  upperPct: number;
  outside: boolean;
}

export default function TerminalChart({ bars, label }: { bars: TerminalBar[]; label: string }) {
  return (
    <div className="relative h-72 w-full">
      <Chart
        type="bar"
        role="img"
        aria-label={label}
        data={{
          labels: bars.map((b) => b.label),
          datasets: [
            {
              type: "line" as const,
              label: "Lower limit",
              data: bars.map((b) => b.lowerPct),
              borderColor: "#52606d",
              borderDash: [6, 4],
              pointRadius: 0,
              fill: false,
              stepped: "middle" as const,
            },
            {
              type: "line" as const,
              label: "Upper limit (band shaded)",
              data: bars.map((b) => b.upperPct),
              borderColor: "#52606d",
              borderDash: [6, 4],
              backgroundColor: "rgba(29, 107, 58, 0.12)",
              pointRadius: 0,
              fill: "-1",
              stepped: "middle" as const,
            },
            {
              type: "bar" as const,
              label: "% of design (outside the band: hatched outline)",
              data: bars.map((b) => b.pct),
              backgroundColor: bars.map((b) => (b.outside ? "rgba(163, 38, 27, 0.25)" : "rgba(13, 92, 140, 0.7)")),
              borderColor: bars.map((b) => (b.outside ? "#a3261b" : "#0d5c8c")),
              borderWidth: bars.map((b) => (b.outside ? 3 : 1)),
            },
          ],
        }}
        options={{
          animation: false,
          maintainAspectRatio: false,
          scales: { y: { beginAtZero: true, suggestedMax: 130, title: { display: true, text: "% of design (standard air)" } } },
          plugins: { legend: { position: "bottom" } },
        }}
      />
    </div>
  );
}
