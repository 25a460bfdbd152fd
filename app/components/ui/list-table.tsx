/** A column of a list table; numeric columns are right-aligned, as their cells are. */
export interface ListColumn {
  label: string;
  numeric?: boolean;
}

/**
 * The framed table of the list pages (cases, programmes, reports, audit trail, members): the header
 * row comes from `columns`, the body rows from the caller, which keeps its own cell content.
 */
export function ListTable({ columns, children }: { columns: ListColumn[]; children: React.ReactNode }) {
  return (
    <div className="overflow-x-auto rounded border border-line bg-surface">
      <table className="w-full text-left text-sm">
        <thead className="border-b border-line bg-canvas text-xs uppercase tracking-wide text-ink-muted">
          <tr>
            {columns.map((c) => (
              <th key={c.label} className={c.numeric ? "px-3 py-2 text-right" : "px-3 py-2"}>
                {c.label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>{children}</tbody>
      </table>
    </div>
  );
}
