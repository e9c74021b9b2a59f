"use client";

/**
 * The review cycle over the API: submissions, decisions, the review queue, verification samples and
 * the audit feed. Types come from the server's resource builders, as JSON.
 */
import type { ReviewQueue } from "@/lib/server/review-queue";
import type { SampleResource } from "@/lib/server/verification";
import type { AuditKind, ReviewDecisionInput } from "@/lib/validation/review";
import type { Jsonified } from "./field";
import { call } from "./index";

export type QueueJson = Jsonified<ReviewQueue>;
export type QueueItem = QueueJson["items"][number];
export type Sample = Jsonified<SampleResource>;

const base = (projectId: string) => `/api/v1/projects/${encodeURIComponent(projectId)}`;
const post = <T>(path: string, body: unknown) => call<T>(path, { method: "POST", body: JSON.stringify(body) });

export interface DecisionInput {
  decision: ReviewDecisionInput;
  comment?: string;
  witnessed?: boolean;
}

export interface AuditEvent {
  id: number;
  at: string;
  who: { userId: string | null; name: string | null; email: string | null };
  action: string;
  kind: AuditKind;
  summary: string;
  entityType: string;
  entityId: string | null;
  before: unknown;
  after: unknown;
  detail: Record<string, unknown>;
}

export const reviewKeys = {
  queue: (projectId: string) => ["review-queue", projectId] as const,
  samples: (projectId: string) => ["samples", projectId] as const,
  audit: (projectId: string, kind: string) => ["audit", projectId, kind] as const,
};

export const reviewApi = {
  queue: (projectId: string) => call<QueueJson>(`${base(projectId)}/review-queue`),
  submitTraverse: (projectId: string, traverseId: string, notes?: string) => post<unknown>(`${base(projectId)}/traverses/${encodeURIComponent(traverseId)}/submit`, notes ? { notes } : {}),
  reviewTraverse: (projectId: string, traverseId: string, input: DecisionInput) => post<unknown>(`${base(projectId)}/traverses/${encodeURIComponent(traverseId)}/review`, input),
  submitTerminalSet: (projectId: string, setId: string) => post<unknown>(`${base(projectId)}/terminal-sets/${encodeURIComponent(setId)}/submit`, {}),
  reviewTerminalSet: (projectId: string, setId: string, input: DecisionInput) => post<unknown>(`${base(projectId)}/terminal-sets/${encodeURIComponent(setId)}/review`, input),
  reviewSystem: (projectId: string, systemId: string, input: DecisionInput) => post<unknown>(`${base(projectId)}/systems/${encodeURIComponent(systemId)}/review`, input),
  samples: (projectId: string) => call<{ samples: Sample[] }>(`${base(projectId)}/samples`),
  drawSample: (projectId: string, systemId: string) => post<{ sample: Sample }>(`${base(projectId)}/samples`, { systemId }),
  sampleReading: (projectId: string, sampleId: string, itemId: string, body: unknown) =>
    call<{ sample: Sample; warnings?: string[] }>(`${base(projectId)}/samples/${encodeURIComponent(sampleId)}/items/${encodeURIComponent(itemId)}/reading`, { method: "PUT", body: JSON.stringify(body) }),
  witness: (projectId: string, sampleId: string, itemId: string, witnessed: boolean) =>
    call<{ sample: Sample }>(`${base(projectId)}/samples/${encodeURIComponent(sampleId)}/items/${encodeURIComponent(itemId)}`, { method: "PATCH", body: JSON.stringify({ witnessed }) }),
  audit: (projectId: string, query: { kind?: string; before?: number | null; limit?: number }) => {
    const q = new URLSearchParams();
    if (query.kind) q.set("kind", query.kind);
    if (query.before) q.set("before", String(query.before));
    q.set("limit", String(query.limit ?? 100));
    return call<{ events: AuditEvent[]; nextBefore: number | null; limit: number }>(`${base(projectId)}/audit?${q.toString()}`);
  },
};
