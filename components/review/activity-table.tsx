"use client";

/**
 * The project's audit trail as a table, newest first: when, who (name and e-mail as recorded), what,
 * and the values before and after where they changed; filtered by kind, older entries on request.
 */
import { useState } from "react";
import { useInfiniteQuery } from "@tanstack/react-query";
import { Button } from "@/components/ui/button";
import { reviewApi, reviewKeys, type AuditEvent } from "@/lib/api-client/review";
import { KIND_LABELS } from "@/lib/review/audit-kinds";
import { AUDIT_KINDS } from "@/lib/validation/review";

const PAGE = 100;

/** Numbers to four significant figures: the record keeps full precision, the table is for reading. */
const shown = (x: unknown): string => (typeof x === "number" ? String(Number(x.toPrecision(4))) : typeof x === "object" && x !== null ? JSON.stringify(x) : String(x));

function values(v: unknown): string {
  if (v === null || v === undefined) return "";
  if (typeof v !== "object") return shown(v);
  return Object.entries(v as Record<string, unknown>)
    .map(([k, x]) => `${k}: ${shown(x)}`)
    .join("; ")
    .slice(0, 400);
}

export function ActivityTable({ projectId, initial }: { projectId: string; initial: { events: AuditEvent[]; nextBefore: number | null } }) {
  const [kind, setKind] = useState("");
  const query = useInfiniteQuery({
    queryKey: reviewKeys.audit(projectId, kind),
    queryFn: ({ pageParam }) => reviewApi.audit(projectId, { kind: kind || undefined, before: pageParam, limit: PAGE }),
    initialPageParam: null as number | null,
    getNextPageParam: (last) => last.nextBefore,
    ...(kind === "" ? { initialData: { pages: [{ ...initial, limit: PAGE }], pageParams: [null] } } : {}),
  });
  const events = query.data?.pages.flatMap((p) => p.events) ?? [];
  return (
    <div className="grid gap-4">
      <div className="flex flex-wrap items-end gap-4">
        <div>
          <label htmlFor="activity-kind" className="mb-1 block font-semibold">
            Kind of event
          </label>
          <select id="activity-kind" value={kind} onChange={(e) => setKind(e.target.value)} className="min-h-touch rounded-card border-2 border-line-strong bg-paper-raised px-3">
            <option value="">Everything</option>
            {AUDIT_KINDS.map((k) => (
              <option key={k} value={k}>
                {KIND_LABELS[k]}
              </option>
            ))}
          </select>
        </div>
        <p className="ml-auto text-sm text-ink-soft" role="status">
          {query.isFetching ? "Loading…" : `${events.length} events shown, newest first`}
        </p>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full text-left">
          <caption className="sr-only">Project activity, newest first</caption>
          <thead className="border-b-2 border-line text-sm text-ink-muted">
            <tr>
              <th scope="col" className="py-2 pr-3">
                When (UTC)
              </th>
              <th scope="col" className="py-2 pr-3">
                Who
              </th>
              <th scope="col" className="py-2 pr-3">
                What
              </th>
              <th scope="col" className="py-2 pr-3">
                Before → after
              </th>
            </tr>
          </thead>
          <tbody>
            {events.map((e) => (
              <tr key={e.id} className="border-b border-line align-top">
                <td className="num whitespace-nowrap py-2 pr-3 text-sm">{new Date(e.at).toISOString().slice(0, 19).replace("T", " ")}</td>
                <td className="py-2 pr-3 text-sm">
                  <span className="font-semibold">{e.who.name ?? "—"}</span>
                  <span className="block text-ink-soft">{e.who.email ?? "—"}</span>
                </td>
                <td className="py-2 pr-3">
                  {e.summary}
                  <span className="block text-sm text-ink-soft">
                    {KIND_LABELS[e.kind]} · {e.action}
                  </span>
                </td>
                <td className="py-2 pr-3 text-sm">
                  {e.before !== null || e.after !== null ? (
                    <>
                      {e.before !== null && <span className="block">before: {values(e.before)}</span>}
                      {e.after !== null && <span className="block">after: {values(e.after)}</span>}
                    </>
                  ) : (
                    <span className="text-ink-soft">—</span>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        {events.length === 0 && !query.isFetching && <p className="p-4 text-ink-soft">No events of this kind yet.</p>}
      </div>
      {query.hasNextPage && (
        <Button type="button" variant="secondary" onClick={() => void query.fetchNextPage()} disabled={query.isFetchingNextPage}>
          Show older events
        </Button>
      )}
      {query.error && (
        <p role="alert" className="font-semibold text-fault">
          The activity could not be loaded: {query.error.message}
        </p>
      )}
    </div>
  );
}
