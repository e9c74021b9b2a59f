"use client";

/**
 * The commissioning agent's review queue: every section's current traverse and every system's current
 * terminal set that is submitted, returned or approved, sortable, filtered by system and status, with
 * counts per status. Each row opens its numbers, the plane's verdict, warnings, operating conditions,
 * the technician's notes and the decision; a system can be decided as a whole.
 */
import Link from "next/link";
import { Fragment, useMemo, useState } from "react";
import { useQuery, useQueryClient } from "@tanstack/react-query";
import { createColumnHelper, useTable, type SortingState } from "@tanstack/react-table";
import { SortableHead, SORTING_FEATURES as features } from "@/components/ui/sortable-head";
import { StatusBadge, Verdict } from "@/components/ui/status";
import { reviewApi, reviewKeys, type QueueItem, type QueueJson } from "@/lib/api-client/review";
import { summarizeConditions } from "@/lib/airflow/conditions";
import { formatQuantity, type UnitSystem } from "@/lib/units";
import { DecisionForm } from "./decision-form";

const helper = createColumnHelper<typeof features, QueueItem>();
const STATUS_ORDER = { submitted: 0, returned: 1, approved: 2, draft: 3 } as const;
const PLANE = { good: "Good plane", marginal: "Marginal plane", poor: "Poor plane" } as const;
type StatusFilter = "" | "submitted" | "returned" | "approved";
/** Columns left out on portrait tablets: the plane's verdict is in each row's details. */
const NARROW_HIDDEN = new Set(["plane"]);

const pct = (v: number | null) => (v === null ? "—" : `${v.toFixed(0)} %`);
const when = (iso: string | null) => (iso ? new Date(iso).toISOString().slice(0, 16).replace("T", " ") + " UTC" : "—");

export function ReviewQueue({ projectId, initial, units, canDecide }: { projectId: string; initial: QueueJson; units: UnitSystem; canDecide: boolean }) {
  const client = useQueryClient();
  const { data } = useQuery({ queryKey: reviewKeys.queue(projectId), queryFn: () => reviewApi.queue(projectId), initialData: initial });
  const [system, setSystem] = useState("");
  const [status, setStatus] = useState<StatusFilter>("");
  const [open, setOpen] = useState<string | null>(null);
  const [sorting, setSorting] = useState<SortingState>([{ id: "status", desc: false }]);
  const [announce, setAnnounce] = useState("");
  const refresh = () => Promise.all([client.invalidateQueries({ queryKey: reviewKeys.queue(projectId) }), client.invalidateQueries({ queryKey: reviewKeys.samples(projectId) })]);

  const rows = useMemo(() => data.items.filter((i) => (system === "" || i.systemId === system) && (status === "" || i.status === status)), [data.items, system, status]);
  const flow = (v: number | null) => (v === null ? "—" : formatQuantity(units, "flow", v));

  const columns = useMemo(
    () =>
      helper.columns([
        helper.accessor((i) => `${i.systemTag} ${i.tag}`, {
          id: "item",
          header: "Item",
          sortFn: "alphanumeric",
          cell: ({ row }) => (
            <div>
              <span className="font-semibold">{row.original.type === "traverse" ? `${row.original.systemTag} / ${row.original.tag}` : `${row.original.systemTag} ${row.original.tag.toLowerCase()}`}</span>
              <span className="block text-sm text-ink-soft">
                {row.original.type === "traverse" ? `Traverse, revision ${row.original.revision}` : "Outlets and terminal units"}
                {row.original.location ? ` · ${row.original.location}` : ""}
              </span>
            </div>
          ),
        }),
        helper.accessor((i) => STATUS_ORDER[i.status], { id: "status", header: "Status", sortFn: "basic", cell: ({ row }) => <StatusBadge status={row.original.status} /> }),
        helper.accessor((i) => i.standardFlowM3S ?? -1, {
          id: "flow",
          header: "Measured (standard) / design",
          sortFn: "basic",
          cell: ({ row }) => (
            <span className="num whitespace-nowrap">
              {flow(row.original.standardFlowM3S)}
              <span className="block text-sm text-ink-soft">design {flow(row.original.designFlowM3S)}</span>
            </span>
          ),
        }),
        helper.accessor((i) => i.pctOfDesign ?? -1, {
          id: "pct",
          header: "% of design",
          sortFn: "basic",
          cell: ({ row }) => (
            <div className="num">
              {pct(row.original.pctOfDesign)}
              {row.original.withinTolerance !== null && (
                <div className="mt-1">
                  <Verdict pass={row.original.withinTolerance} />
                </div>
              )}
            </div>
          ),
        }),
        helper.accessor((i) => i.uncertaintyPct ?? -1, {
          id: "uncertainty",
          header: "Uncertainty",
          sortFn: "basic",
          cell: ({ row }) => <span className="num text-sm">{row.original.uncertaintyShown ?? (row.original.type === "terminal_set" ? `${row.original.terminals?.read ?? 0} of ${row.original.terminals?.of ?? 0} terminals read` : "—")}</span>,
        }),
        helper.accessor((i) => (i.quality ? { good: 0, marginal: 1, poor: 2 }[i.quality.verdict] : 3), {
          id: "plane",
          header: "Plane",
          sortFn: "basic",
          cell: ({ row }) => <span className="text-sm">{row.original.quality ? PLANE[row.original.quality.verdict] : "—"}</span>,
        }),
        helper.accessor((i) => i.submittedAt ?? "", {
          id: "submitted",
          header: "Submitted",
          sortFn: "alphanumeric",
          cell: ({ row }) => (
            <span className="num text-sm">
              {when(row.original.submittedAt)}
              <span className="block text-ink-soft">by {row.original.takenByName ?? "—"}</span>
            </span>
          ),
        }),
        helper.display({
          id: "open",
          header: () => <span className="sr-only">Details</span>,
          cell: ({ row }) => (
            <button
              type="button"
              aria-expanded={open === row.original.id}
              aria-controls={`detail-${row.original.id}`}
              onClick={() => setOpen(open === row.original.id ? null : row.original.id)}
              className="inline-flex min-h-touch items-center rounded-card px-3 font-semibold text-accent-strong underline-offset-4 hover:underline"
            >
              {open === row.original.id ? "Close" : row.original.status === "submitted" && canDecide ? "Review" : "Details"}
              <span className="sr-only"> {row.original.label}</span>
            </button>
          ),
        }),
      ]),
    // eslint-disable-next-line react-hooks/exhaustive-deps -- formatting depends only on units
    [units, open, canDecide],
  );
  const table = useTable({ features, columns, data: rows, state: { sorting }, onSortingChange: setSorting });
  const systemsWithSubmitted = data.systems.filter((s) => data.items.some((i) => i.systemId === s.id && i.status === "submitted"));

  return (
    <div className="grid gap-4">
      <ul className="flex flex-wrap gap-3" aria-label="Counts per status">
        {(["submitted", "returned", "approved"] as const).map((s) => (
          <li key={s}>
            <button
              type="button"
              onClick={() => setStatus(status === s ? "" : s)}
              aria-pressed={status === s}
              className={`inline-flex min-h-touch items-center gap-2 rounded-card border-2 px-3 ${status === s ? "border-accent bg-accent-soft" : "border-line bg-paper-raised"}`}
            >
              <StatusBadge status={s} />
              <span className="num font-semibold">{data.counts[s]}</span>
            </button>
          </li>
        ))}
      </ul>
      <div className="flex flex-wrap items-end gap-4">
        <div>
          <label htmlFor="queue-system" className="mb-1 block font-semibold">
            System
          </label>
          <select id="queue-system" value={system} onChange={(e) => setSystem(e.target.value)} className="min-h-touch rounded-card border-2 border-line-strong bg-paper-raised px-3">
            <option value="">All systems</option>
            {data.systems.map((s) => (
              <option key={s.id} value={s.id}>
                {s.tag} — {s.name}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="queue-status" className="mb-1 block font-semibold">
            Status
          </label>
          <select id="queue-status" value={status} onChange={(e) => setStatus(e.target.value as StatusFilter)} className="min-h-touch rounded-card border-2 border-line-strong bg-paper-raised px-3">
            <option value="">Any status</option>
            <option value="submitted">Awaiting review</option>
            <option value="returned">Returned</option>
            <option value="approved">Approved</option>
          </select>
        </div>
        <p className="ml-auto text-sm text-ink-soft" role="status">
          {rows.length} of {data.items.length} items {announce && `· ${announce}`}
        </p>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full text-left">
          <caption className="sr-only">Review queue, sorted by {sorting[0]?.id ?? "status"}</caption>
          <SortableHead table={table} cellClass={(id) => (NARROW_HIDDEN.has(id) ? "hidden lg:table-cell" : "")} buttonClass="text-left" />
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <Fragment key={row.id}>
                <tr className="border-b border-line align-top">
                  {row.getAllCells().map((cell) => (
                    <td key={cell.id} className={`py-2 pr-3 ${NARROW_HIDDEN.has(cell.column.id) ? "hidden lg:table-cell" : ""} ${cell.column.id === "item" ? "min-w-36" : ""}`}>
                      <table.FlexRender cell={cell} />
                    </td>
                  ))}
                </tr>
                {open === row.original.id && (
                  <tr id={`detail-${row.original.id}`} className="border-b-2 border-line bg-paper-sunk">
                    <td colSpan={row.getAllCells().length} className="p-4">
                      <ItemDetail
                        item={row.original}
                        projectId={projectId}
                        units={units}
                        canDecide={canDecide}
                        onDone={(d) => {
                          setAnnounce(`${row.original.label} ${d === "approve" ? "approved" : "returned"}`);
                          setOpen(null);
                          void refresh();
                        }}
                      />
                    </td>
                  </tr>
                )}
              </Fragment>
            ))}
          </tbody>
        </table>
        {rows.length === 0 && <p className="p-4 text-ink-soft">{data.items.length === 0 ? "Nothing has been submitted yet: technicians submit traverses and terminal readings from Field work." : "No item matches these filters."}</p>}
      </div>
      {canDecide && systemsWithSubmitted.length > 0 && (
        <section aria-labelledby="whole-system" className="grid gap-3 rounded-card border-2 border-line p-4">
          <h3 id="whole-system">Decide for a whole system</h3>
          <p className="text-ink-soft">One action applies to every submitted item of the system (its traverses and its terminal readings), all together or none.</p>
          {systemsWithSubmitted.map((s) => (
            <details key={s.id} className="rounded-card border border-line p-3">
              <summary className="min-h-touch cursor-pointer content-center font-semibold">
                {s.tag}: {submittedCount(data.items, s.id)} submitted {submittedCount(data.items, s.id) === 1 ? "item" : "items"}
              </summary>
              <div className="mt-3">
                <DecisionForm
                  label={`everything submitted in ${s.tag}`}
                  onDecide={(input) => reviewApi.reviewSystem(projectId, s.id, input)}
                  onDone={(d) => {
                    setAnnounce(`everything submitted in ${s.tag} ${d === "approve" ? "approved" : "returned"}`);
                    void refresh();
                  }}
                />
              </div>
            </details>
          ))}
        </section>
      )}
    </div>
  );
}

function submittedCount(items: QueueItem[], systemId: string): number {
  return items.filter((i) => i.systemId === systemId && i.status === "submitted").length;
}

function ItemDetail({ item, projectId, units, canDecide, onDone }: { item: QueueItem; projectId: string; units: UnitSystem; canDecide: boolean; onDone: (d: "approve" | "return") => void }) {
  const reasons = item.quality?.reasons ?? [];
  const href = item.type === "traverse" ? `/projects/${projectId}/traverses/${item.id}` : `/projects/${projectId}/terminals`;
  return (
    <div className="grid gap-4 md:grid-cols-2">
      <div className="grid gap-2">
        <dl className="num grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
          {item.flowM3S !== null && (
            <>
              <dt className="text-ink-muted">Actual flow</dt>
              <dd>{formatQuantity(units, "flow", item.flowM3S)}</dd>
            </>
          )}
          <dt className="text-ink-muted">Standard flow</dt>
          <dd className="font-semibold">{item.standardFlowM3S === null ? "—" : formatQuantity(units, "flow", item.standardFlowM3S)}</dd>
          {item.massFlowKgS !== null && (
            <>
              <dt className="text-ink-muted">Mass flow</dt>
              <dd>{formatQuantity(units, "massFlow", item.massFlowKgS)}</dd>
            </>
          )}
          <dt className="text-ink-muted">Design</dt>
          <dd>{item.designFlowM3S === null ? "—" : formatQuantity(units, "flow", item.designFlowM3S)}</dd>
          {item.uncertaintyShown && (
            <>
              <dt className="text-ink-muted">Uncertainty</dt>
              <dd>{item.uncertaintyShown}</dd>
            </>
          )}
          {item.terminals && (
            <>
              <dt className="text-ink-muted">Terminals</dt>
              <dd>
                {item.terminals.read} of {item.terminals.of} read ({item.terminals.readings} readings); {item.terminals.within} within tolerance, {item.terminals.outside} outside
              </dd>
            </>
          )}
        </dl>
        {item.quality && <p className="font-semibold">{PLANE[item.quality.verdict]}</p>}
        {[...reasons, ...item.warnings].length > 0 && (
          <ul className="list-disc pl-5 text-sm">
            {[...reasons, ...item.warnings].map((r) => (
              <li key={r}>{r}</li>
            ))}
          </ul>
        )}
        <p className="text-sm">
          <span className="font-semibold">Operating conditions: </span>
          {item.conditions ? summarizeConditions({ ...item.conditions }) : item.type === "traverse" ? "none recorded" : "recorded with each reading (Terminals screen)"}
        </p>
        <p className="text-sm">
          <span className="font-semibold">Technician&apos;s notes: </span>
          {item.notes || "none"}
        </p>
        {item.lastReview && (
          <p className="text-sm">
            <span className="font-semibold">Last decision: </span>
            {item.lastReview.decision === "approved" ? "approved" : "returned"} by {item.lastReview.reviewerName ?? "—"} on {when(item.lastReview.at)}
            {item.lastReview.comment ? ` — “${item.lastReview.comment}”` : ""}
            {item.lastReview.witnessed ? " (witnessed)" : ""}
          </p>
        )}
        <Link href={href} className="inline-flex min-h-touch items-center font-semibold text-accent-strong underline underline-offset-4">
          {item.type === "traverse" ? `Open the traverse of ${item.tag}` : `Open the terminals of ${item.systemTag}`}
        </Link>
      </div>
      {canDecide && item.status === "submitted" ? (
        <DecisionForm
          label={item.label}
          onDecide={(input) => (item.type === "traverse" ? reviewApi.reviewTraverse(projectId, item.id, input) : reviewApi.reviewTerminalSet(projectId, item.id, input))}
          onDone={onDone}
        />
      ) : (
        <p className="text-ink-soft">{item.status === "submitted" ? "Awaiting the commissioning agent's decision." : item.status === "returned" ? "Returned: the technician corrects and submits again." : "Approved. A re-traverse or new readings start a new revision."}</p>
      )}
    </div>
  );
}
