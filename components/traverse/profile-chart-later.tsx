"use client";

/**
 * The velocity profile chart (chart.js), fetched after the page is up (later-parts.ts) and drawn once
 * its place comes near the screen: it sits well below the grid, and laying out and drawing a chart is
 * a long piece of work for a slow tablet while the page is starting. Its place keeps the chart's
 * height, so nothing moves when it appears.
 */
import { useEffect, useRef, useState, type ComponentProps } from "react";
import { laterPart } from "@/components/ui/later-part";
import { loadChart } from "./later-parts";

const Chart = laterPart(loadChart, (m) => m.ProfileChart, {
  loading: "Loading the profile chart…",
  unavailable: "The profile chart could not be loaded without network. The map and the grid show the same values; reload the page when the connection returns to see the chart.",
});

export function ProfileChartLater(props: ComponentProps<typeof Chart>) {
  const place = useRef<HTMLDivElement>(null);
  const [near, setNear] = useState(false);
  useEffect(() => {
    const el = place.current;
    if (near || !el) return;
    const watch = new IntersectionObserver((entries) => entries.some((e) => e.isIntersecting) && setNear(true), { rootMargin: "50% 0px" });
    watch.observe(el);
    return () => watch.disconnect();
  }, [near]);
  return (
    <div ref={place} className="min-h-72">
      {near ? <Chart {...props} /> : <p className="text-ink-soft">Loading the profile chart…</p>}
    </div>
  );
}
