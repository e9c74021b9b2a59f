"use client";

/**
 * Junction balance per system (react-chartjs-2): the trunk's mass flow beside the sum of its branches',
 * both as standard volume flow. Loaded lazily; the table beside it holds the same numbers.
 */
import { BarElement, CategoryScale, Chart as ChartJS, Legend, LinearScale, Tooltip } from "chart.js";
import { Bar } from "react-chartjs-2";

ChartJS.register(BarElement, CategoryScale, LinearScale, Tooltip, Legend);

export interface JunctionBar {
  label: string;
  parent: number;
  children: number;
}

export default function JunctionChart({ bars, unit, label }: { bars: JunctionBar[]; unit: string; label: string }) {
  return (
    <div className="relative h-64 w-full">
      <Bar
        role="img"
        aria-label={label}
        data={{
          labels: bars.map((b) => b.label),
          datasets: [
            { label: "Trunk", data: bars.map((b) => b.parent), backgroundColor: "#0d5c8c", borderColor: "#083f61", borderWidth: 1 },
            { label: "Sum of branches", data: bars.map((b) => b.children), backgroundColor: "rgba(138, 90, 0, 0.35)", borderColor: "#8a5a00", borderWidth: 2, borderDash: [4, 3] } as never,
          ],
        }}
        options={{
          animation: false,
          maintainAspectRatio: false,
          scales: { y: { beginAtZero: true, title: { display: true, text: `Standard airflow by mass (${unit})` } } },
          plugins: { legend: { position: "bottom" } },
        }}
      />
    </div>
  );
}
