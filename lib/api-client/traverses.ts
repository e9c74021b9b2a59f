"use client";

/**
 * Traverses over the API: URLs, the create call, and how the offline queue sends a traverse's
 * readings (one versioned PUT with everything the screen holds). Types come from the server's
 * resource builder, as JSON.
 */
import type { TraverseResource } from "@/lib/server/traverses";
import type { SyncRequest } from "@/lib/offline/types";
import type { Grid, PointRef } from "@/lib/traverse/engine-input";
import type { LayoutJson, TraverseResultJson } from "@/lib/traverse/result-types";
import type { TraverseCreateInput } from "@/lib/validation/traverses";
import type { Jsonified } from "./field";
import { call } from "./index";

export type Traverse = Omit<Jsonified<TraverseResource>, "result" | "layout"> & { result: TraverseResultJson | null; layout: LayoutJson | null };

export const traversesUrl = (projectId: string) => `/api/v1/projects/${encodeURIComponent(projectId)}/traverses`;
export const traverseUrl = (projectId: string, traverseId: string) => `${traversesUrl(projectId)}/${encodeURIComponent(traverseId)}`;
export const readingsUrl = (projectId: string, traverseId: string) => `${traverseUrl(projectId, traverseId)}/readings`;

export const traverseApi = {
  create: (projectId: string, input: TraverseCreateInput) => call<{ traverse: Traverse }>(traversesUrl(projectId), { method: "POST", body: JSON.stringify(input) }),
  get: (projectId: string, traverseId: string) => call<{ traverse: Traverse }>(traverseUrl(projectId, traverseId)),
};

/** The air as the screen keeps it (SI), in the API's shape. */
export interface DraftAir {
  dryBulbC: number;
  relativeHumidityPct: number | null;
  wetBulbC: number | null;
  staticPa: number | null;
  barometricPa: number | null;
}

export interface DraftInstrument {
  readingInstrumentId: string | null;
  probeInstrumentId: string | null;
  airInstrumentId: string | null;
  barometerInstrumentId: string | null;
  overdueReason: string;
  standardDensityKgM3: number | null;
}

/** Everything a technician changes on a traverse, kept on the device per keystroke under `traverse:<id>`. */
export interface TraverseDraft {
  readings: Grid;
  unreadable: PointRef[];
  air: DraftAir | null;
  instrument: DraftInstrument;
  conditionsId: string | null;
}

export const traverseDraftKey = (traverseId: string) => `traverse:${traverseId}`;

/** The draft a server resource stands for (the same shape on both sides, so equal drafts compare equal). */
export function draftOf(t: Pick<Traverse, "readings" | "unreadable" | "air" | "instrument" | "conditionsId">): TraverseDraft {
  const a = t.air;
  return {
    readings: t.readings.map((row) => [...row]),
    unreadable: t.unreadable.map(([k, i]) => [k, i] as PointRef),
    air:
      a.dryBulbC === null
        ? null
        : { dryBulbC: a.dryBulbC, relativeHumidityPct: a.relativeHumidityPct, wetBulbC: a.relativeHumidityPct !== null ? null : a.wetBulbC, staticPa: a.staticPa, barometricPa: a.barometricPa },
    instrument: {
      readingInstrumentId: t.instrument.readingInstrumentId,
      probeInstrumentId: t.instrument.probeInstrumentId,
      airInstrumentId: t.instrument.airInstrumentId,
      barometerInstrumentId: t.instrument.barometerInstrumentId,
      overdueReason: t.instrument.overdueReason,
      standardDensityKgM3: t.instrument.standardDensityKgM3,
    },
    conditionsId: t.conditionsId,
  };
}

/** How the queue sends a draft: the whole grid with the air, instruments and conditions, at the version it builds on. */
export function readingsRequest(projectId: string, traverseId: string, draft: TraverseDraft): SyncRequest {
  return {
    method: "PUT",
    url: readingsUrl(projectId, traverseId),
    body: {
      readings: draft.readings,
      unreadable: draft.unreadable,
      ...(draft.air ? { air: draft.air } : {}),
      instrument: draft.instrument,
      conditionsId: draft.conditionsId,
    },
    versionField: "version",
    resourceField: "traverse",
  };
}
