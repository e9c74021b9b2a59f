"use client";

import { ApiError } from "./index";
import type { SchedulePreview } from "@/lib/design/schedule-csv";

/** Set-up calls: projects, air systems, duct sections, terminals and the design schedule file. */
async function send<T>(path: string, init: RequestInit): Promise<T> {
  let res: Response;
  try {
    res = await fetch(path, init);
  } catch {
    throw new ApiError(0, "The server cannot be reached. Check the connection; nothing was changed.");
  }
  const body = (await res.json().catch(() => null)) as (T & { error?: { message?: string; fields?: Record<string, string> } }) | null;
  if (!res.ok) {
    const error = new ApiError(res.status, body?.error?.message ?? `The server answered ${res.status}.`, body?.error?.fields);
    (error as ApiError & { body?: unknown }).body = body;
    throw error;
  }
  return body as T;
}

const json = (method: string, value?: unknown): RequestInit => ({
  method,
  headers: value === undefined ? undefined : { "content-type": "application/json" },
  body: value === undefined ? undefined : JSON.stringify(value),
});

const base = (projectId: string) => `/api/v1/projects/${encodeURIComponent(projectId)}`;

export interface Deleted {
  deleted: { systems: string[]; sections: string[]; terminals: string[] };
}

export const designApi = {
  createProject: (input: Record<string, unknown>) => send<{ project: { id: string } }>("/api/v1/projects", json("POST", input)),
  updateProject: (projectId: string, patch: Record<string, unknown>) => send<{ project: { id: string } }>(base(projectId), json("PATCH", patch)),
  createSystem: (projectId: string, input: Record<string, unknown>) => send<{ system: { id: string } }>(`${base(projectId)}/systems`, json("POST", input)),
  updateSystem: (projectId: string, systemId: string, patch: Record<string, unknown>) =>
    send<{ system: { id: string } }>(`${base(projectId)}/systems/${encodeURIComponent(systemId)}`, json("PATCH", patch)),
  deleteSystem: (projectId: string, systemId: string) => send<Deleted>(`${base(projectId)}/systems/${encodeURIComponent(systemId)}`, json("DELETE")),
  createSection: (projectId: string, input: Record<string, unknown>) => send<{ section: { id: string } }>(`${base(projectId)}/sections`, json("POST", input)),
  updateSection: (projectId: string, sectionId: string, patch: Record<string, unknown>) =>
    send<{ section: { id: string } }>(`${base(projectId)}/sections/${encodeURIComponent(sectionId)}`, json("PATCH", patch)),
  deleteSection: (projectId: string, sectionId: string) => send<Deleted>(`${base(projectId)}/sections/${encodeURIComponent(sectionId)}`, json("DELETE")),
  createTerminal: (projectId: string, input: Record<string, unknown>) => send<{ terminal: { id: string } }>(`${base(projectId)}/terminals`, json("POST", input)),
  updateTerminal: (projectId: string, terminalId: string, patch: Record<string, unknown>) =>
    send<{ terminal: { id: string } }>(`${base(projectId)}/terminals/${encodeURIComponent(terminalId)}`, json("PATCH", patch)),
  deleteTerminal: (projectId: string, terminalId: string) => send<Deleted>(`${base(projectId)}/terminals/${encodeURIComponent(terminalId)}`, json("DELETE")),
  /** Checks (preview) or applies (commit) a schedule file; a commit with errors throws with the preview on `body`. */
  importSchedule: (projectId: string, csv: string, mode: "preview" | "commit") =>
    send<{ preview: SchedulePreview; applied?: { added: { sections: string[]; terminals: string[] }; updated: { sections: string[]; terminals: string[] } } }>(
      `${base(projectId)}/design/import?mode=${mode}`,
      { method: "POST", headers: { "content-type": "text/csv" }, body: csv },
    ),
  exportUrl: (projectId: string, units?: "IP" | "SI") => `${base(projectId)}/design/export.csv${units ? `?units=${units}` : ""}`,
};

export const designKeys = {
  preview: (projectId: string) => ["design", projectId, "schedule-preview"] as const,
};
