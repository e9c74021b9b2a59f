"use client";

/** The system view's charts, loaded only when shown (next/dynamic), each kept out of the first load. */
import dynamic from "next/dynamic";
import { Component, type ReactNode } from "react";
import type { JunctionBar } from "./junction-chart";
import type { TerminalBar } from "./terminal-chart";

const loading = () => <p className="text-ink-soft">Loading the chart…</p>;
const TerminalChart = dynamic(() => import("./terminal-chart"), { ssr: false, loading });
const JunctionChart = dynamic(() => import("./junction-chart"), { ssr: false, loading });

class ChartBoundary extends Component<{ children: ReactNode }, { failed: boolean }> {
  state = { failed: false };
  static getDerivedStateFromError(): { failed: boolean } {
    return { failed: true };
  }
  render() {
    if (this.state.failed) return <p className="rounded-card border border-dashed border-line-strong p-3 text-ink-soft">The chart could not be loaded. The table holds the same values.</p>;
    return this.props.children;
  }
}

export function TerminalPctChart({ bars, label }: { bars: TerminalBar[]; label: string }) {
  return (
    <ChartBoundary>
      <TerminalChart bars={bars} label={label} />
    </ChartBoundary>
  );
}

export function JunctionBalanceChart({ bars, unit, label }: { bars: JunctionBar[]; unit: string; label: string }) {
  return (
    <ChartBoundary>
      <JunctionChart bars={bars} unit={unit} label={label} />
    </ChartBoundary>
  );
}
