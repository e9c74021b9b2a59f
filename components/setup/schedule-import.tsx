"use client";

import { useMutation } from "@tanstack/react-query";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { ApiError } from "@/lib/api-client";
import { designApi } from "@/lib/api-client/design";
import type { PreviewRow, SchedulePreview } from "@/lib/design/schedule-csv";
import { FormMessage } from "./form-fields";

const MAX_BYTES = 1_048_576;
const ACTION_LABEL = { add: "Add", update: "Update", unchanged: "No change" } as const;

/** Choose a schedule file, see every row with its errors, and import it only when it is clean. */
export function ScheduleImport({ projectId }: { projectId: string }) {
  const router = useRouter();
  const [file, setFile] = useState<{ name: string; text: string } | null>(null);
  const [readError, setReadError] = useState<string | null>(null);
  const [onlyErrors, setOnlyErrors] = useState(false);
  const [preview, setPreview] = useState<SchedulePreview | null>(null);
  const [done, setDone] = useState<string | null>(null);

  const check = useMutation({
    mutationFn: (text: string) => designApi.importSchedule(projectId, text, "preview"),
    onSuccess: (res) => setPreview(res.preview),
  });
  const commit = useMutation({
    mutationFn: (text: string) => designApi.importSchedule(projectId, text, "commit"),
    onSuccess: (res) => {
      const a = res.applied!;
      setPreview(res.preview);
      setDone(
        `Imported: ${a.added.sections.length} sections and ${a.added.terminals.length} terminals added, ${a.updated.sections.length} sections and ${a.updated.terminals.length} terminals updated, ${res.preview.counts.unchanged} rows unchanged.`,
      );
      router.refresh();
    },
    onError: (err) => {
      const body = (err as ApiError & { body?: { preview?: SchedulePreview } }).body;
      if (body?.preview) setPreview(body.preview);
    },
  });

  async function choose(event: React.ChangeEvent<HTMLInputElement>) {
    const chosen = event.target.files?.[0];
    setPreview(null);
    setDone(null);
    setReadError(null);
    check.reset();
    commit.reset();
    if (!chosen) return setFile(null);
    if (chosen.size > MAX_BYTES) {
      setFile(null);
      return setReadError(`${chosen.name} is ${(chosen.size / 1_048_576).toFixed(1)} MiB; the limit is 1 MiB. Split the schedule by system.`);
    }
    const text = await chosen.text();
    setFile({ name: chosen.name, text });
    check.mutate(text);
  }

  const rows = preview ? (onlyErrors ? preview.rows.filter((r) => r.errors.length > 0) : preview.rows) : [];
  const changes = preview ? preview.counts.add + preview.counts.update : 0;
  const error = readError ?? (check.error ? check.error.message : null) ?? (commit.error ? commit.error.message : null);

  return (
    <div className="space-y-4">
      <div>
        <label htmlFor="schedule-file" className="mb-1 block font-semibold">
          Design schedule (CSV)
        </label>
        <input
          id="schedule-file"
          type="file"
          accept=".csv,text/csv"
          onChange={choose}
          aria-describedby="schedule-file-hint"
          className="block min-h-touch w-full max-w-xl rounded-card border-2 border-line-strong bg-paper-raised p-2 file:mr-3 file:min-h-[2.25rem] file:rounded-card file:border-0 file:bg-accent file:px-4 file:font-semibold file:text-white"
        />
        <p id="schedule-file-hint" className="mt-1 text-sm text-ink-muted">
          Choosing a file only checks it: nothing is saved until you import it, and a file with any error is not imported at all.
        </p>
      </div>
      <FormMessage message={error} tone="fault" />
      <FormMessage message={done} tone="ok" />
      {check.isPending && <p aria-live="polite">Checking {file?.name}…</p>}

      {preview && (
        <section aria-labelledby="preview-title" className="space-y-3">
          <h2 id="preview-title">
            {file?.name}: {preview.counts.rows} rows
          </h2>
          {preview.fileErrors.length > 0 && (
            <ul className="list-disc space-y-1 rounded-card border-2 border-fault bg-fault-soft p-3 pl-8 font-semibold text-fault">
              {preview.fileErrors.map((e) => (
                <li key={e}>{e}</li>
              ))}
            </ul>
          )}
          {preview.rows.length > 0 && (
            <p className="num">
              <Outcome ok={preview.ok} /> {preview.counts.add} to add · {preview.counts.update} to update · {preview.counts.unchanged} unchanged ·{" "}
              <strong>{preview.counts.withErrors} with errors</strong>
              {Object.keys(preview.units).length > 0 && (
                <span className="text-ink-soft">
                  {" "}
                  · units read from the headers: {Object.values(preview.units).join(", ")}
                </span>
              )}
            </p>
          )}
          <div className="flex flex-wrap items-center gap-3">
            <Button onClick={() => file && commit.mutate(file.text)} disabled={!preview.ok || changes === 0 || commit.isPending || done !== null}>
              {commit.isPending ? "Importing…" : `Import ${changes} row${changes === 1 ? "" : "s"}`}
            </Button>
            {!preview.ok && <span className="font-semibold text-fault">Fix the rows marked below in the file, then choose it again.</span>}
            {preview.ok && changes === 0 && <span className="text-ink-soft">The project already matches this file.</span>}
            {done && (
              <Link href={`/projects/${projectId}/setup`} className="font-semibold text-accent-strong underline">
                Back to set-up
              </Link>
            )}
          </div>
          {preview.counts.withErrors > 0 && (
            <label className="flex min-h-touch cursor-pointer items-center gap-2">
              <input type="checkbox" checked={onlyErrors} onChange={(e) => setOnlyErrors(e.target.checked)} className="h-5 w-5 accent-accent" />
              Show only the rows with errors
            </label>
          )}
          {rows.length > 0 && <PreviewTable rows={rows} />}
        </section>
      )}
    </div>
  );
}

function Outcome({ ok }: { ok: boolean }) {
  return (
    <span className={`inline-flex items-center gap-1 font-semibold ${ok ? "text-ok" : "text-fault"}`}>
      <svg viewBox="0 0 16 16" width="16" height="16" aria-hidden="true">
        {ok ? (
          <path d="M3 8.5l3 3 7-7" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" />
        ) : (
          <path d="M4 4l8 8M12 4l-8 8" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
        )}
      </svg>
      {ok ? "Ready to import:" : "Not ready:"}
    </span>
  );
}

function PreviewTable({ rows }: { rows: PreviewRow[] }) {
  return (
    <div className="overflow-x-auto rounded-card border border-line bg-paper-raised">
      <table className="w-full min-w-[44rem] text-left">
        <caption className="sr-only">Every row of the file with what would happen to it</caption>
        <thead className="border-b-2 border-line text-sm text-ink-muted">
          <tr>
            <th className="px-2 py-2">Line</th>
            <th className="px-2 py-2">Record</th>
            <th className="px-2 py-2">System</th>
            <th className="px-2 py-2">Tag</th>
            <th className="px-2 py-2">Parent</th>
            <th className="px-2 py-2">Size</th>
            <th className="px-2 py-2 text-right">Design airflow</th>
            <th className="px-2 py-2">Result</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.line} className={`border-b border-line align-top ${r.errors.length > 0 ? "bg-fault-soft" : ""}`}>
              <td className="px-2 py-1">{r.line}</td>
              <td className="px-2 py-1">{r.record ?? "?"}</td>
              <td className="px-2 py-1">{r.system}</td>
              <td className="px-2 py-1 font-semibold">{r.tag}</td>
              <td className="px-2 py-1">{r.parent || "—"}</td>
              <td className="px-2 py-1">{r.size}</td>
              <td className="px-2 py-1 text-right">{r.airflow}</td>
              <td className="px-2 py-1">
                {r.errors.length > 0 ? (
                  <ul className="space-y-0.5 text-sm font-semibold text-fault">
                    {r.errors.map((e) => (
                      <li key={`${e.column}:${e.message}`} className="flex items-start gap-1">
                        <svg viewBox="0 0 16 16" width="14" height="14" aria-hidden="true" className="mt-1 shrink-0">
                          <path d="M4 4l8 8M12 4l-8 8" fill="none" stroke="currentColor" strokeWidth="2.2" strokeLinecap="round" />
                        </svg>
                        <span>
                          <code>{e.column}</code>: {e.message}
                        </span>
                      </li>
                    ))}
                  </ul>
                ) : (
                  <span>{r.action ? ACTION_LABEL[r.action] : ""}</span>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
