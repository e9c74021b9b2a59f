"use client";

import { createSortedRowModel, rowSortingFeature, sortFn_alphanumeric, sortFn_basic, tableFeatures, type ReactTable, type RowData, type TableState } from "@tanstack/react-table";

/** The table features of Airtally's sortable lists: sorting by a column, text and number order. */
export const SORTING_FEATURES = tableFeatures({
  rowSortingFeature,
  sortedRowModel: createSortedRowModel(),
  sortFns: { alphanumeric: sortFn_alphanumeric, basic: sortFn_basic },
});

/**
 * A sortable table's header row: each sortable column's title is a button (44 px tall) that cycles
 * its order, with the order shown by an arrow and announced through aria-sort.
 */
export function SortableHead<TData extends RowData>({
  table,
  cellClass = () => "",
  buttonClass = "",
}: {
  table: ReactTable<typeof SORTING_FEATURES, TData, TableState<typeof SORTING_FEATURES>>;
  /** Extra classes of a column's header cell (to hide it on narrow screens, say). */
  cellClass?: (columnId: string) => string;
  buttonClass?: string;
}) {
  return (
    <thead className="border-b-2 border-line text-sm text-ink-muted">
      {table.getHeaderGroups().map((group) => (
        <tr key={group.id}>
          {group.headers.map((header) => {
            const sorted = header.column.getIsSorted();
            return (
              <th key={header.id} scope="col" className={`py-2 pr-3 ${cellClass(header.column.id)}`} aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : undefined}>
                {header.column.getCanSort() ? (
                  <button type="button" onClick={header.column.getToggleSortingHandler()} className={`inline-flex min-h-touch items-center gap-1 font-semibold ${buttonClass}`}>
                    <table.FlexRender header={header} />
                    <span aria-hidden="true">{sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}</span>
                  </button>
                ) : (
                  <table.FlexRender header={header} />
                )}
              </th>
            );
          })}
        </tr>
      ))}
    </thead>
  );
}
