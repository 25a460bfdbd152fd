import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
} from "@tanstack/react-table";
import { useState, type KeyboardEvent } from "react";
import { roundForDisplay } from "~/domain/units";
import { downloadText, toCsv } from "~/utils/csv";

export interface DataColumn<T> {
  id: string;
  header: string;
  value: (row: T) => string | number | null;
  /** Shown in the cell; the raw value is what sorts, filters and exports. */
  format?: (row: T) => React.ReactNode;
  numeric?: boolean;
}

/**
 * A read-only results table: click a header to sort, type to filter, arrow keys move between
 * rows, and the filtered, sorted rows export as CSV with the same headers (units included).
 */
export function DataTable<T>({ rows, columns, caption, csvName, initialSort }: { rows: T[]; columns: DataColumn<T>[]; caption: string; csvName: string; initialSort?: SortingState }) {
  const [sorting, setSorting] = useState<SortingState>(initialSort ?? []);
  const [filter, setFilter] = useState("");
  // A number is shown and exported without its round-off (1.37e-15 is 0, 0.30000000000000004 is 0.3).
  const valueOf = (c: DataColumn<T>, row: T) => {
    const v = c.value(row);
    return typeof v === "number" ? roundForDisplay(v, 12) : v;
  };
  const defs: ColumnDef<T>[] = columns.map((c) => ({
    id: c.id,
    header: c.header,
    accessorFn: (row) => valueOf(c, row),
    cell: (ctx) => (c.format ? c.format(ctx.row.original) : String(valueOf(c, ctx.row.original) ?? "—")),
    sortingFn: c.numeric ? "basic" : "alphanumeric",
  }));
  const table = useReactTable({
    data: rows,
    columns: defs,
    state: { sorting, globalFilter: filter },
    onSortingChange: setSorting,
    onGlobalFilterChange: setFilter,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    globalFilterFn: (row, _id, value: string) => columns.some((c) => String(c.value(row.original) ?? "").toLowerCase().includes(value.toLowerCase())),
  });
  const visible = table.getRowModel().rows;
  const onRowKey = (i: number) => (e: KeyboardEvent<HTMLTableRowElement>) => {
    const target = e.key === "ArrowDown" ? i + 1 : e.key === "ArrowUp" ? i - 1 : null;
    if (target === null) return;
    e.preventDefault();
    (document.querySelector(`[data-table="${csvName}"] tbody tr:nth-child(${target + 1})`) as HTMLElement | null)?.focus();
  };
  return (
    <div data-table={csvName}>
      <div className="mb-2 flex flex-wrap items-center gap-2 text-sm">
        <input value={filter} onChange={(e) => setFilter(e.target.value)} placeholder="Filter rows" aria-label={`Filter ${caption}`} className="rounded border border-line-strong px-2 py-1" />
        <span className="text-xs text-ink-muted">
          {visible.length} of {rows.length} rows
        </span>
        <button
          type="button"
          className="ml-auto rounded border border-line-strong bg-surface px-2 py-1 text-xs font-semibold hover:bg-canvas"
          onClick={() => downloadText(csvName, toCsv(columns.map((c) => c.header), visible.map((r) => columns.map((c) => valueOf(c, r.original)))))}
        >
          Export CSV
        </button>
      </div>
      <div className="max-h-[32rem] overflow-auto rounded border border-line bg-surface">
        <table className="w-full text-sm">
          <caption className="sr-only">{caption}</caption>
          <thead className="sticky top-0 border-b border-line bg-canvas text-xs text-ink-muted">
            {table.getHeaderGroups().map((g) => (
              <tr key={g.id}>
                {g.headers.map((h) => {
                  const col = columns.find((c) => c.id === h.column.id)!;
                  const dir = h.column.getIsSorted();
                  return (
                    <th key={h.id} scope="col" aria-sort={dir === "asc" ? "ascending" : dir === "desc" ? "descending" : "none"} className={`whitespace-nowrap px-2 py-1.5 font-semibold ${col.numeric ? "text-right" : "text-left"}`}>
                      <button type="button" onClick={h.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 hover:text-ink">
                        {flexRender(h.column.columnDef.header, h.getContext())}
                        <span aria-hidden="true">{dir === "asc" ? "▲" : dir === "desc" ? "▼" : "↕"}</span>
                      </button>
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {visible.map((r, i) => (
              <tr key={r.id} tabIndex={0} onKeyDown={onRowKey(i)} className="border-b border-line last:border-0 hover:bg-canvas focus:bg-accent-soft focus:outline-none">
                {r.getVisibleCells().map((cell) => {
                  const col = columns.find((c) => c.id === cell.column.id)!;
                  return (
                    <td key={cell.id} className={`whitespace-nowrap px-2 py-1 ${col.numeric ? "text-right tabular" : ""}`}>
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
