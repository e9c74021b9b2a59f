"use client";

/**
 * The register as a sortable table: kind, serial, calibration due date with its status in words and a
 * shape, range and accuracy in the user's units. Filters by kind and text; retired instruments on request.
 */
import Link from "next/link";
import { useMemo, useState } from "react";
import { createColumnHelper, useTable, type SortingState } from "@tanstack/react-table";
import { SortableHead, SORTING_FEATURES as features } from "@/components/ui/sortable-head";
import type { InstrumentKind } from "@/db/schema";
import { CalibrationStatus } from "./calibration-status";
import type { Instrument } from "@/lib/api-client/field";
import { INSTRUMENT_KINDS, KIND_INFO } from "@/lib/instruments/kinds";
import { formatCalendarDate } from "@/lib/instruments/usability";
import { formatAccuracy, formatRange } from "@/lib/instruments/units";
import type { UnitSystem } from "@/lib/units";

const helper = createColumnHelper<typeof features, Instrument>();

/** Most urgent first when sorted by status: past due, no date, due soon, fine, retired. */
const URGENCY = { overdue: 0, "no-due-date": 1, "due-soon": 2, ok: 3, retired: 4 } as const;

export function InstrumentTable({ instruments, units, canEdit }: { instruments: Instrument[]; units: UnitSystem; canEdit: boolean }) {
  const [kind, setKind] = useState<InstrumentKind | "">("");
  const [text, setText] = useState("");
  const [showRetired, setShowRetired] = useState(false);
  const [sorting, setSorting] = useState<SortingState>([{ id: "status", desc: false }]);

  const data = useMemo(() => {
    const q = text.trim().toLowerCase();
    return instruments.filter(
      (i) =>
        (showRetired || i.retiredAt === null) &&
        (kind === "" || i.kind === kind) &&
        (q === "" || [i.serial, i.make, i.model, i.certificateNumber, KIND_INFO[i.kind].label].some((s) => s.toLowerCase().includes(q))),
    );
  }, [instruments, kind, text, showRetired]);

  const columns = useMemo(
    () =>
      helper.columns([
        helper.accessor((i) => `${KIND_INFO[i.kind].label} ${i.make} ${i.model}`, {
          id: "instrument",
          header: "Instrument",
          sortFn: "alphanumeric",
          cell: ({ row }) => (
            <div>
              <span className="font-semibold">{KIND_INFO[row.original.kind].label}</span>
              <span className="block text-sm text-ink-soft">{[row.original.make, row.original.model].filter(Boolean).join(" ") || "Make and model not recorded"}</span>
            </div>
          ),
        }),
        helper.accessor("serial", { header: "Serial", sortFn: "alphanumeric", cell: ({ getValue }) => <span className="num whitespace-nowrap font-semibold">{getValue()}</span> }),
        helper.accessor((i) => i.calibrationDueOn ?? "", {
          id: "due",
          header: "Calibration due",
          sortFn: "alphanumeric",
          cell: ({ row }) => (
            <span className="num">
              {row.original.calibrationDueOn ? formatCalendarDate(row.original.calibrationDueOn) : "—"}
              {row.original.calibratedOn && <span className="block text-sm text-ink-soft">calibrated {formatCalendarDate(row.original.calibratedOn)}</span>}
            </span>
          ),
        }),
        helper.accessor((i) => URGENCY[i.calibrationStatus.status] * 100_000 + (i.calibrationStatus.daysUntilDue ?? 0), {
          id: "status",
          header: "Status",
          sortFn: "basic",
          cell: ({ row }) => <CalibrationStatus usability={row.original.calibrationStatus} compact />,
        }),
        helper.accessor((i) => formatRange(i, units), { id: "range", header: "Range", enableSorting: false, cell: ({ getValue }) => <span className="num">{getValue()}</span> }),
        helper.accessor((i) => formatAccuracy(i, units), { id: "accuracy", header: "Accuracy", enableSorting: false, cell: ({ getValue }) => <span className="num">{getValue()}</span> }),
        helper.display({
          id: "actions",
          header: () => <span className="sr-only">Actions</span>,
          cell: ({ row }) => (
            <Link href={`/instruments/${row.original.id}`} className="inline-flex min-h-touch items-center rounded-card px-3 font-semibold text-accent-strong underline-offset-4 hover:underline">
              {canEdit ? "Edit" : "Details"}
              <span className="sr-only"> {row.original.serial}</span>
            </Link>
          ),
        }),
      ]),
    [units, canEdit],
  );

  const table = useTable({ features, columns, data, state: { sorting }, onSortingChange: setSorting });
  const hidden = new Set(["range", "accuracy"]);
  const retiredCount = instruments.filter((i) => i.retiredAt !== null).length;

  return (
    <div className="grid gap-4">
      <div className="flex flex-wrap items-end gap-4">
        <div>
          <label htmlFor="instrument-kind" className="mb-1 block font-semibold">
            Kind
          </label>
          <select id="instrument-kind" value={kind} onChange={(e) => setKind(e.target.value as InstrumentKind | "")} className="min-h-touch rounded-card border-2 border-line-strong bg-paper-raised px-3">
            <option value="">All kinds</option>
            {INSTRUMENT_KINDS.map((k) => (
              <option key={k} value={k}>
                {KIND_INFO[k].label}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="instrument-search" className="mb-1 block font-semibold">
            Find
          </label>
          <input id="instrument-search" type="search" value={text} onChange={(e) => setText(e.target.value)} placeholder="Serial, make, model" className="min-h-touch rounded-card border-2 border-line-strong bg-paper-raised px-3" />
        </div>
        <label className="flex min-h-touch cursor-pointer items-center gap-2 font-semibold">
          <input type="checkbox" checked={showRetired} onChange={(e) => setShowRetired(e.target.checked)} className="h-6 w-6" />
          Show retired ({retiredCount})
        </label>
        <p className="ml-auto text-sm text-ink-soft" role="status">
          {data.length} of {instruments.length} instruments
        </p>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full text-left">
          <caption className="sr-only">Instrument register, sorted by {sorting[0]?.id ?? "status"}</caption>
          <SortableHead table={table} cellClass={(id) => (hidden.has(id) ? "hidden xl:table-cell" : "")} />
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className={`border-b border-line align-top ${row.original.retiredAt ? "text-ink-muted" : ""}`}>
                {row.getAllCells().map((cell) => (
                  <td key={cell.id} className={`py-2 pr-3 ${hidden.has(cell.column.id) ? "hidden xl:table-cell" : ""}`}>
                    <table.FlexRender cell={cell} />
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
        {data.length === 0 && <p className="p-4 text-ink-soft">No instrument matches. Clear the filters{canEdit ? ", or add one to the register" : ""}.</p>}
      </div>
    </div>
  );
}
