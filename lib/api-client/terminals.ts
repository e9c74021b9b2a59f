"use client";

/**
 * Terminal readings over the API: the project's list (kept on the device for use without network),
 * and readings recorded offline-first: each one is on the device before it is sent, with an id
 * chosen here so a retry after a lost answer never stores it twice.
 */
import { useQuery } from "@tanstack/react-query";
import { useSyncExternalStore } from "react";
import type { TerminalReadingJson } from "@/lib/server/terminal-reading-json";
import { useSyncQueue } from "@/lib/offline/offline-context";
import { withDeviceCopy } from "@/lib/offline/read-cache";
import type { SyncQueue } from "@/lib/offline/sync-queue";
import type { DraftRecord, SyncRequest } from "@/lib/offline/types";
import type { TerminalReadingCreateInput } from "@/lib/validation/terminal-readings";
import type { Conditions, Jsonified } from "./field";
import { ApiError, call } from "./index";

export type TerminalReading = Jsonified<TerminalReadingJson>;

export interface TerminalSetSummary {
  id: string;
  systemId: string;
  status: "draft" | "submitted" | "approved" | "returned";
  version: number;
  revision: number;
  updatedAt: string;
}

export interface ProjectReadings {
  systemId: string | null;
  sets: TerminalSetSummary[];
  readings: TerminalReading[];
  conditions: Conditions[];
  truncated: boolean;
}

export const terminalKeys = {
  project: (projectId: string) => ["terminal-readings", projectId] as const,
};

export function terminalReadingsUrl(projectId: string, terminalId: string): string {
  return `/api/v1/projects/${encodeURIComponent(projectId)}/terminals/${encodeURIComponent(terminalId)}/readings`;
}

export function projectReadingsUrl(projectId: string): string {
  return `/api/v1/projects/${encodeURIComponent(projectId)}/terminal-readings`;
}

const offlineFailure = (error: unknown) => error instanceof ApiError && error.status === 0;

/** Every reading of the project, kept on the device; `data.fromDevice` says when it is the kept copy. */
export function useProjectTerminalReadings(projectId: string, initial: ProjectReadings) {
  const queue = useSyncQueue();
  return useQuery({
    queryKey: terminalKeys.project(projectId),
    queryFn: () => withDeviceCopy(queue, `terminal-readings:${projectId}`, () => call<ProjectReadings>(projectReadingsUrl(projectId)), offlineFailure),
    enabled: queue !== null,
    initialData: { data: initial, fromDevice: false, fetchedAt: 0 },
    initialDataUpdatedAt: 0,
  });
}

/** A reading as kept on the device until the server has it. */
export type TerminalReadingBody = TerminalReadingCreateInput & { id: string; takenAt: string };

export const terminalReadingKeyPrefix = "terminal-reading:";
export const terminalReadingKey = (terminalId: string, id: string) => `${terminalReadingKeyPrefix}${terminalId}:${id}`;

export function terminalReadingRequest(projectId: string, terminalId: string, body: TerminalReadingBody): SyncRequest {
  return { method: "POST", url: terminalReadingsUrl(projectId, terminalId), body: body as Record<string, unknown>, resourceField: "reading" };
}

/**
 * Queues a reading for sending (now when online, else when the network returns). It is on the device
 * before this resolves; the returned key follows its sync state in the queue.
 */
export async function recordTerminalReadingOffline(queue: SyncQueue, projectId: string, terminalId: string, body: TerminalReadingBody): Promise<string> {
  const key = terminalReadingKey(terminalId, body.id);
  await queue.load(key, { value: body, version: null });
  await queue.edit(key, { value: body, request: terminalReadingRequest(projectId, terminalId, body), queue: false });
  await queue.sync(key);
  return key;
}

export type DeviceTerminalReading = DraftRecord<TerminalReadingBody, TerminalReading> & { terminalId: string };

/** Readings recorded on this device (any terminal), with their sync state, oldest first. */
export function useDeviceTerminalReadings(): DeviceTerminalReading[] {
  const queue = useSyncQueue();
  useSyncExternalStore(
    (l) => (queue ? queue.subscribeAll(l) : () => {}),
    () => queue?.changeCount ?? 0,
    () => 0,
  );
  return ((queue?.recordsWithPrefix(terminalReadingKeyPrefix) ?? []) as DraftRecord<TerminalReadingBody, TerminalReading>[]).map((r) => ({
    ...r,
    terminalId: r.key.slice(terminalReadingKeyPrefix.length).split(":")[0]!,
  }));
}
