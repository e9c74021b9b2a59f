"use client";

/**
 * Submit a system's terminal readings (its open terminal set) from the Terminals screen, with the
 * submission checks the server found listed, readings still on this device counted, and the network
 * required.
 */
import { useSyncExternalStore } from "react";
import { reviewApi } from "@/lib/api-client/review";
import { useDeviceTerminalReadings } from "@/lib/api-client/terminals";
import { SubmitPanel } from "./submit-panel";

const subscribe = (l: () => void) => {
  window.addEventListener("online", l);
  window.addEventListener("offline", l);
  return () => {
    window.removeEventListener("online", l);
    window.removeEventListener("offline", l);
  };
};

export interface TerminalSetSubmitProps {
  systemTag: string;
  set: { id: string; status: "draft" | "submitted" | "approved" | "returned"; revision: number };
  terminalIds: string[];
  problems: Record<string, string>;
  lastReview: { decision: "approved" | "returned"; comment: string; reviewerName: string | null; at: string } | null;
}

export function TerminalSetSubmit({ projectId, systemTag, set, terminalIds, problems, lastReview }: TerminalSetSubmitProps & { projectId: string }) {
  const online = useSyncExternalStore(subscribe, () => navigator.onLine, () => true);
  const device = useDeviceTerminalReadings();
  const mine = new Set(terminalIds);
  const pending = device.some((r) => mine.has(r.terminalId) && r.state !== "saved");
  return (
    <SubmitPanel
      what={`the terminal readings of ${systemTag} (set ${set.revision})`}
      status={set.status}
      problems={problems}
      pendingOnDevice={pending}
      online={online}
      lastReview={lastReview}
      onSubmit={() => reviewApi.submitTerminalSet(projectId, set.id)}
    />
  );
}
