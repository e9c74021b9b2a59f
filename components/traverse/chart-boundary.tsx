"use client";

/**
 * Keeps the traverse screen up when the lazily loaded chart cannot be fetched (no network before it
 * was ever loaded): the chart's place says so, and the grid, map and numbers go on working.
 */
import { Component, type ReactNode } from "react";

export class ChartBoundary extends Component<{ children: ReactNode }, { failed: boolean }> {
  state = { failed: false };

  static getDerivedStateFromError(): { failed: boolean } {
    return { failed: true };
  }

  render() {
    if (this.state.failed)
      return (
        <p className="rounded-card border border-dashed border-line-strong p-3 text-ink-soft">
          The profile chart could not be loaded without network. The map and the grid show the same values; reopen the page when the connection returns to see the chart.
        </p>
      );
    return this.props.children;
  }
}
