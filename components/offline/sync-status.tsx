"use client";

/**
 * Where a technician's entry is, in words and a shape (never colour alone): saved on this device,
 * saving, saved, changed elsewhere, or not saved. The main sentence sits in a polite live region so a
 * screen reader hears changes; the retry countdown stays outside it so it is not read every second.
 */
import { useEffect, useState } from "react";
import { usePendingChanges } from "@/lib/offline/offline-context";
import type { SyncError, SyncState } from "@/lib/offline/types";

export interface SyncStatusProps {
  syncState: SyncState;
  error?: SyncError | null;
  nextAttemptAt?: number | null;
  online?: boolean;
  deviceError?: string | null;
  /** Shown with the "error" state: a 44 px "Try again" button. */
  retry?: () => void;
  /** What is being saved, for the sentence: "readings", "conditions". Default "your entries". */
  what?: string;
  /** true: an entry kept on the device only until it is sent on purpose (a form before "Record"). */
  notSentYet?: boolean;
  className?: string;
}

const TONE: Record<SyncState, string> = {
  "saved-on-device": "border-caution bg-caution-soft text-ink",
  saving: "border-accent bg-accent-soft text-ink",
  saved: "border-ok bg-ok-soft text-ink",
  conflict: "border-fault bg-fault-soft text-ink",
  error: "border-fault bg-fault-soft text-ink",
};

const ICON_COLOUR: Record<SyncState, string> = {
  "saved-on-device": "text-caution",
  saving: "text-accent-strong",
  saved: "text-ok",
  conflict: "text-fault",
  error: "text-fault",
};

export const SYNC_LABELS: Record<SyncState, string> = {
  "saved-on-device": "Saved on this device",
  saving: "Saving…",
  saved: "Saved",
  conflict: "Changed elsewhere",
  error: "Not saved to the server",
};

/** Distinct shapes: a tablet, circling arrows, a tick, two diverging arrows, an exclamation mark. */
export function SyncIcon({ state, size = 22 }: { state: SyncState; size?: number }) {
  const stroke = { fill: "none", stroke: "currentColor", strokeWidth: 1.8, strokeLinecap: "round" as const, strokeLinejoin: "round" as const };
  return (
    <svg viewBox="0 0 24 24" width={size} height={size} aria-hidden="true" className={`shrink-0 ${ICON_COLOUR[state]}`}>
      {state === "saved-on-device" && (
        <>
          <rect x="5" y="2.5" width="14" height="19" rx="2" {...stroke} />
          <path d="M10.5 18.5h3" {...stroke} />
          <path d="M9 10.5l2.2 2.2L15.5 8" {...stroke} />
        </>
      )}
      {state === "saving" && (
        <>
          <path d="M19 12a7 7 0 01-12.2 4.7M5 12a7 7 0 0112.2-4.7" {...stroke} />
          <path d="M17.5 3.5v4h-4M6.5 20.5v-4h4" {...stroke} />
        </>
      )}
      {state === "saved" && (
        <>
          <circle cx="12" cy="12" r="9" {...stroke} />
          <path d="M7.5 12.5l3 3 6-6.5" {...stroke} strokeWidth={2.2} />
        </>
      )}
      {state === "conflict" && (
        <>
          <path d="M12 21v-7M12 14L5 6M12 14l7-8" {...stroke} />
          <path d="M5 10V6h4M19 10V6h-4" {...stroke} />
        </>
      )}
      {state === "error" && (
        <>
          <path d="M12 3l10 18H2L12 3z" {...stroke} />
          <path d="M12 10v5M12 18v.3" {...stroke} strokeWidth={2.2} />
        </>
      )}
    </svg>
  );
}

function useSecondsUntil(at: number | null | undefined): number | null {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    if (!at) return;
    const timer = setInterval(() => setNow(Date.now()), 1000);
    return () => clearInterval(timer);
  }, [at]);
  return at ? Math.max(0, Math.ceil((at - now) / 1000)) : null;
}

/** One sentence, after the status word, that says what happens next. */
export function syncSentence(p: Pick<SyncStatusProps, "syncState" | "error" | "online" | "what" | "notSentYet">): string {
  const what = p.what ?? "your entries";
  switch (p.syncState) {
    case "saved-on-device":
      if (p.notSentYet) return `Kept here as you type; ${what} go to the server when you record them.`;
      if (p.online === false) return `No network: ${what} are sent when the connection returns.`;
      if (p.error) return `${p.error.message} Trying again.`;
      return `Sending ${what} shortly.`;
    case "saving":
      return `Sending ${what} to the server.`;
    case "saved":
      return `The server has ${what}.`;
    case "conflict":
      return "Someone saved a different version first. Nothing was overwritten: choose which to keep.";
    case "error":
      return `${p.error?.message ?? "The server refused the change."} ${what.charAt(0).toUpperCase() + what.slice(1)} stay on this device.`;
  }
}

export function SyncStatus(props: SyncStatusProps) {
  const { syncState, nextAttemptAt, retry, deviceError, className = "" } = props;
  const seconds = useSecondsUntil(syncState === "saved-on-device" && props.online !== false ? nextAttemptAt : null);
  return (
    <div className={`flex flex-wrap items-center gap-x-3 gap-y-1 rounded-card border-2 px-3 py-2 ${TONE[syncState]} ${className}`}>
      <div role="status" aria-live="polite" className="flex min-w-0 flex-1 items-center gap-2">
        <SyncIcon state={syncState} />
        <p className="min-w-0">
          <strong className="font-semibold">{SYNC_LABELS[syncState]}</strong>
          <span className="sr-only">. </span>
          <span className="ml-2 text-sm">{syncSentence(props)}</span>
        </p>
      </div>
      {seconds !== null && props.error && <span className="num text-sm text-ink-soft">Next try in {seconds} s</span>}
      {deviceError && <p className="w-full text-sm font-semibold text-fault">{deviceError}</p>}
      {syncState === "error" && retry && (
        <button type="button" onClick={retry} className="inline-flex min-h-touch items-center rounded-card border-2 border-fault bg-paper-raised px-4 font-semibold text-fault">
          Try again
        </button>
      )}
    </div>
  );
}

/** The header's short line: how many entries wait on this device for the server, if any. */
export function PendingChanges() {
  const { count, online, storage } = usePendingChanges();
  if (count === 0 && storage !== "memory") return null;
  return (
    <p role="status" aria-live="polite" className="flex min-h-touch items-center gap-2 rounded-card bg-caution-soft px-3 text-sm font-semibold text-ink">
      <SyncIcon state={count === 0 ? "error" : "saved-on-device"} size={18} />
      {count === 0 ? (
        "Not kept on this device"
      ) : (
        <>
          {count} on this device
          <span className="sr-only">{online ? ", being sent" : ", waiting for the network"}</span>
        </>
      )}
    </p>
  );
}
