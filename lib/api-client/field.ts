"use client";

/**
 * The technician's foundation over the API: the instrument register and each system's operating
 * conditions, with TanStack Query keys and hooks. Lists a technician needs on site are kept on the
 * device (lib/offline/read-cache.ts) and served from there when the network is gone.
 */
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useSyncExternalStore } from "react";
import type { ConditionsJson, InstrumentJson } from "@/lib/server/field-json";
import type { InstrumentKind } from "@/db/schema";
import { useSyncQueue } from "@/lib/offline/offline-context";
import { withDeviceCopy } from "@/lib/offline/read-cache";
import { useOfflineDraft } from "@/lib/offline/use-offline-draft";
import type { SyncQueue } from "@/lib/offline/sync-queue";
import type { DraftRecord, SyncRequest } from "@/lib/offline/types";
import type { ConditionsCreateInput } from "@/lib/validation/conditions";
import type { InstrumentCreateInput, InstrumentPatch } from "@/lib/validation/instruments";
import { ApiError, call } from "./index";

/** A server type as it arrives over JSON: dates become ISO strings. */
export type Jsonified<T> = T extends Date ? string : T extends (infer U)[] ? Jsonified<U>[] : T extends object ? { [K in keyof T]: Jsonified<T[K]> } : T;

export type Instrument = Jsonified<InstrumentJson>;
export type Conditions = Jsonified<ConditionsJson>;

export interface InstrumentFilter {
  kinds?: readonly InstrumentKind[];
  includeRetired?: boolean;
}

export const fieldKeys = {
  instruments: (filter: InstrumentFilter = {}) => ["instruments", "list", { kinds: [...(filter.kinds ?? [])].sort(), includeRetired: !!filter.includeRetired }] as const,
  allInstruments: () => ["instruments"] as const,
  instrument: (id: string) => ["instruments", "one", id] as const,
  conditions: (projectId: string, systemId: string) => ["conditions", projectId, systemId] as const,
};

function instrumentsUrl(filter: InstrumentFilter): string {
  const q = new URLSearchParams();
  if (filter.kinds && filter.kinds.length > 0) q.set("kind", filter.kinds.join(","));
  if (filter.includeRetired) q.set("includeRetired", "true");
  const s = q.toString();
  return `/api/v1/instruments${s ? `?${s}` : ""}`;
}

export function conditionsUrl(projectId: string, systemId: string): string {
  return `/api/v1/projects/${encodeURIComponent(projectId)}/systems/${encodeURIComponent(systemId)}/conditions`;
}

export const fieldApi = {
  listInstruments: (filter: InstrumentFilter = {}) => call<{ instruments: Instrument[] }>(instrumentsUrl(filter)),
  getInstrument: (id: string) => call<{ instrument: Instrument & { usage: { traverses: number; terminalReadings: number; lastUsedAt: string | null } } }>(`/api/v1/instruments/${encodeURIComponent(id)}`),
  createInstrument: (input: InstrumentCreateInput) => call<{ instrument: Instrument }>("/api/v1/instruments", { method: "POST", body: JSON.stringify(input) }),
  updateInstrument: (id: string, patch: InstrumentPatch) => call<{ instrument: Instrument }>(`/api/v1/instruments/${encodeURIComponent(id)}`, { method: "PATCH", body: JSON.stringify(patch) }),
  deleteInstrument: (id: string) => call<void>(`/api/v1/instruments/${encodeURIComponent(id)}`, { method: "DELETE" }),
  listConditions: (projectId: string, systemId: string) => call<{ systemId: string; current: Conditions | null; conditions: Conditions[] }>(conditionsUrl(projectId, systemId)),
};

const offlineFailure = (error: unknown) => error instanceof ApiError && error.status === 0;

/**
 * The register (not retired unless asked), kept on the device for use without network. `data.fromDevice`
 * says when the list is the copy kept on the device.
 */
export function useInstruments(filter: InstrumentFilter = {}) {
  const queue = useSyncQueue();
  return useQuery({
    queryKey: fieldKeys.instruments(filter),
    queryFn: () => withDeviceCopy(queue, `instruments:${JSON.stringify(fieldKeys.instruments(filter)[2])}`, async () => (await fieldApi.listInstruments(filter)).instruments, offlineFailure),
    enabled: queue !== null,
  });
}

export function useInstrument(id: string) {
  return useQuery({ queryKey: fieldKeys.instrument(id), queryFn: async () => (await fieldApi.getInstrument(id)).instrument });
}

export function useCreateInstrument() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: InstrumentCreateInput) => fieldApi.createInstrument(input),
    onSuccess: () => client.invalidateQueries({ queryKey: fieldKeys.allInstruments() }),
  });
}

export function useUpdateInstrument(id: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (patch: InstrumentPatch) => fieldApi.updateInstrument(id, patch),
    onSuccess: () => client.invalidateQueries({ queryKey: fieldKeys.allInstruments() }),
  });
}

export function useDeleteInstrument(id: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: () => fieldApi.deleteInstrument(id),
    onSuccess: () => client.invalidateQueries({ queryKey: fieldKeys.allInstruments() }),
  });
}

/** A system's recorded conditions (newest first), kept on the device for use without network. */
export function useSystemConditions(projectId: string, systemId: string, initial?: Conditions[]) {
  const queue = useSyncQueue();
  return useQuery({
    queryKey: fieldKeys.conditions(projectId, systemId),
    queryFn: () => withDeviceCopy(queue, `conditions:${projectId}:${systemId}`, async () => (await fieldApi.listConditions(projectId, systemId)).conditions, offlineFailure),
    enabled: queue !== null,
    ...(initial ? { initialData: { data: initial, fromDevice: false, fetchedAt: 0 }, initialDataUpdatedAt: 0 } : {}),
  });
}

/**
 * How the offline queue sends a conditions record: a POST with the id chosen on the device, so a
 * retry after a lost answer is recognised by the server instead of stored twice.
 */
export function conditionsRequest(projectId: string, systemId: string, body: ConditionsCreateInput & { id: string }): SyncRequest {
  return { method: "POST", url: conditionsUrl(projectId, systemId), body: body as Record<string, unknown>, resourceField: "conditions" };
}

/** A conditions record as kept on the device until the server has it. */
export type ConditionsBody = ConditionsCreateInput & { id: string; recordedAt: string };

export const conditionsKeyPrefix = (systemId: string) => `conditions:${systemId}:`;

/**
 * Queues a conditions record for sending (now if online, else when the network returns). The record
 * is on the device before this resolves; the returned key follows its sync state in the queue.
 */
export async function recordConditionsOffline(queue: SyncQueue, projectId: string, systemId: string, body: ConditionsBody): Promise<string> {
  const key = `${conditionsKeyPrefix(systemId)}${body.id}`;
  await queue.load(key, { value: body, version: null });
  await queue.edit(key, { value: body, request: conditionsRequest(projectId, systemId, body), queue: false });
  await queue.sync(key);
  return key;
}

/** Conditions recorded on this device for a system, with their sync state (the saved ones until the list shows them). */
export function useDeviceConditions(systemId: string): DraftRecord<ConditionsBody, Conditions>[] {
  const queue = useSyncQueue();
  useSyncExternalStore(
    (l) => (queue ? queue.subscribeAll(l) : () => {}),
    () => queue?.changeCount ?? 0,
    () => 0,
  );
  return (queue?.recordsWithPrefix(conditionsKeyPrefix(systemId)) ?? []) as DraftRecord<ConditionsBody, Conditions>[];
}

/**
 * The instruments a technician carries today on a project, chosen once on the Field work screen and
 * kept on this device only (not sent): the traverse and terminal screens start from them.
 */
export interface FieldKit {
  /** Manometer (with a pitot tube) or anemometer. */
  readingInstrumentId: string | null;
  probeInstrumentId: string | null;
  /** Thermo-hygrometer for dry-bulb and humidity. */
  airInstrumentId: string | null;
  barometerInstrumentId: string | null;
  hoodInstrumentId: string | null;
  /** Why an instrument past its due date is carried, offered as the default reason on submission. */
  overdueReason: string;
}

export const EMPTY_FIELD_KIT: FieldKit = {
  readingInstrumentId: null,
  probeInstrumentId: null,
  airInstrumentId: null,
  barometerInstrumentId: null,
  hoodInstrumentId: null,
  overdueReason: "",
};

export const fieldKitKey = (projectId: string) => `kit:${projectId}`;

/** Today's kit for a project, on this device: `{ value, setValue, ready }` as useOfflineDraft gives them. */
export function useFieldKit(projectId: string) {
  return useOfflineDraft<FieldKit>({ key: fieldKitKey(projectId), initial: EMPTY_FIELD_KIT });
}
