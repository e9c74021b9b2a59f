"use client";

/** The field screens' line about the network and what waits on this device: words and a shape, announced politely. */
import { usePendingChanges } from "@/lib/offline/offline-context";
import { SyncIcon } from "./sync-status";

export function SyncStatusBanner() {
  const { count, online, storage } = usePendingChanges();
  const state = storage === "memory" ? "error" : count > 0 ? "saved-on-device" : "saved";
  const text =
    storage === "memory"
      ? "This browser cannot keep entries on the device: keep this page open until everything shows Saved."
      : count > 0
        ? `${count} ${count === 1 ? "entry is" : "entries are"} saved on this device${online ? " and being sent." : `. No network: ${count === 1 ? "it is" : "they are"} sent when the connection returns.`}`
        : online
          ? "Online. Everything typed here is kept on this device first, then saved to the server."
          : "No network. Keep working: everything you type is kept on this device and sent when the connection returns.";
  return (
    <p role="status" aria-live="polite" className="flex items-center gap-2 rounded-card border border-line bg-paper-raised px-3 py-2">
      <SyncIcon state={state} />
      <span>{text}</span>
    </p>
  );
}
