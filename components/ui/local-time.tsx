"use client";

import { useSyncExternalStore } from "react";
import { formatDayTime } from "@/lib/day-time";

const noop = () => () => {};

/**
 * A moment in the reader's own time zone ("24 Nov 2026, 09:40"). The server does not know the
 * tablet's zone, so the first render says UTC and the browser replaces it once hydrated.
 */
export function LocalTime({ iso, className }: { iso: string; className?: string }) {
  const hydrated = useSyncExternalStore(noop, () => true, () => false);
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return <span className={className}>{iso}</span>;
  return (
    <time dateTime={d.toISOString()} className={className}>
      {hydrated ? formatDayTime(d) : `${formatDayTime(d, { utc: true })} UTC`}
    </time>
  );
}
