import { useVirtualizer } from "@tanstack/react-virtual";
import { useRef, useState, type ClipboardEvent, type KeyboardEvent } from "react";
import { get, useFieldArray, type ArrayPath, type FieldArray, type FieldValues, type Path, type PathValue, type UseFormReturn } from "react-hook-form";
import { useDrawnInSteps } from "~/components/ui/use-after-interactive";
import { measureWhenLaidOut } from "~/components/ui/virtual-rows";
import { downloadText, parsePastedCells, toCsv } from "~/utils/csv";

export interface GridColumn {
  key: string;
  label: string;
  /** "number" (default, right-aligned), "text", or "checkbox". */
  type?: "number" | "text" | "checkbox";
}

interface Props<T extends FieldValues, O> {
  /** The form the grid belongs to, and the list field of it the grid edits. */
  form: UseFormReturn<T, unknown, O>;
  name: ArrayPath<T>;
  caption: string;
  columns: GridColumn[];
  serverErrors?: Record<string, string[] | undefined>;
  /** The cells of a new row, as typed text. */
  emptyRow: Record<string, string>;
  disabled?: boolean;
  csvName: string;
  /**
   * Lets a long grid show only the rows in view (above GRID_WINDOW_ROWS rows), and names the form
   * field that posts its row count: a post sent before the page's scripts ran carries only the rows
   * the server rendered, and the action refuses it instead of saving the list short.
   */
  countField?: string;
}

/** Above this many rows a grid with a count field shows the rows in view only; the page's scripts post the others from the form's state. */
export const GRID_WINDOW_ROWS = 40;
/** A row's height before it is measured (an input and its cell padding), and the window's height (h-[32rem]: more than 40 rows always fill it). */
const ROW_PX = 33;
const WINDOW_PX = 512;
/** Rows a long grid adds in one commit while it first fills its window (some 200 elements each time). */
export const GRID_ROWS_PER_STEP = 8;

/**
 * An editable table of numbers bound to a react-hook-form field array: arrow keys and Enter move
 * between cells, a block pasted from a spreadsheet fills the grid from the focused cell (rows are
 * added as needed), and the rows can be exported as CSV. A long one (countField) renders the rows in
 * view only: the form's state holds every row, and useZodForm posts the ones scrolled away.
 */
export function EditableGrid<T extends FieldValues, O>(props: Props<T, O>) {
  const { form } = props;
  const { fields, append, remove, insert } = useFieldArray({ control: form.control, name: props.name });
  // Cell fields are named "rows.2.chord", as react-hook-form and the form post name them.
  const cell = (row: number, key: string) => `${props.name}.${row}.${key}` as Path<T>;
  // A new row holds text, as the inputs do; the form's schema reads the numbers from it.
  const emptyRow = props.emptyRow as FieldArray<T, ArrayPath<T>>;
  const cellId = (row: number, col: number) => `${props.name}-${row}-${col}`;
  // The server spoke about the values it was sent: a cell changed since then loses its message.
  const [changed, setChanged] = useState<{ for: unknown; cells: ReadonlySet<string> }>({ for: props.serverErrors, cells: new Set() });
  const changedCells = changed.for === props.serverErrors ? changed.cells : new Set<string>();
  const serverMessages = (name: string) => (changedCells.has(name) ? [] : (props.serverErrors?.[name] ?? []));
  const markChanged = (names: string[]) => {
    const spoken = names.filter((n) => props.serverErrors?.[n]?.length && !changedCells.has(n));
    if (spoken.length) setChanged({ for: props.serverErrors, cells: new Set([...changedCells, ...spoken]) });
  };

  const registered = (name: Path<T>) => {
    const field = form.register(name);
    return {
      ...field,
      onChange: (e: { target: unknown; type?: unknown }) => {
        markChanged([name]);
        return field.onChange(e);
      },
    };
  };

  const scroller = useRef<HTMLDivElement>(null);
  const windowed = props.countField !== undefined && fields.length > GRID_WINDOW_ROWS;
  // A long grid's rows (some 400 inputs on the demo envelope) are drawn once the page answers input:
  // the server and the hydrating page draw the window (its height and header) without rows, so no
  // input a person could type into before then. A post sent before that carries no rows, and is refused.
  // They then come a few at a time, each step at the browser's next idle moment: one commit of every
  // row in view (some 1 100 elements, their fields registered, the page laid out again) kept a click
  // that came meanwhile waiting for all of it.
  // Until the first step the virtualiser (which reads the window's size) has nothing to do: the form
  // above renders twice as it hydrates (react-hook-form marks itself ready in a layout effect), and the grid with it.
  const [inView, setInView] = useState<number | null>(null);
  const drawn = useDrawnInSteps(windowed ? inView : 0, GRID_ROWS_PER_STEP);
  const virtualizer = useVirtualizer({ count: fields.length, getScrollElement: () => scroller.current, estimateSize: () => ROW_PX, measureElement: measureWhenLaidOut, overscan: 8, initialRect: { width: 0, height: WINDOW_PX }, enabled: windowed && drawn > 0 });
  const items = windowed ? (drawn > 0 ? virtualizer.getVirtualItems() : []) : null;
  if (windowed && drawn > 0 && drawn !== Infinity && inView !== items!.length) setInView(items!.length);

  const focusCell = (row: number, col: number, frames = 3) => {
    const el = document.getElementById(cellId(row, col)) as HTMLInputElement | null;
    if (el) {
      el.focus();
      el.select();
    } else if (windowed && frames > 0 && row >= 0 && row < fields.length) {
      // A row out of the window is brought into it first, then focused once rendered.
      virtualizer.scrollToIndex(row);
      requestAnimationFrame(() => focusCell(row, col, frames - 1));
    }
  };

  const onKeyDown = (row: number, col: number) => (e: KeyboardEvent<HTMLInputElement>) => {
    if (e.key === "ArrowDown" || e.key === "Enter") {
      e.preventDefault();
      if (row + 1 >= fields.length && e.key === "Enter") append(emptyRow);
      setTimeout(() => focusCell(row + 1, col));
    } else if (e.key === "ArrowUp") {
      e.preventDefault();
      focusCell(row - 1, col);
    } else if (e.key === "ArrowRight" && (e.currentTarget.selectionStart ?? 0) >= e.currentTarget.value.length) {
      focusCell(row, col + 1);
    } else if (e.key === "ArrowLeft" && (e.currentTarget.selectionStart ?? 0) === 0) {
      focusCell(row, col - 1);
    }
  };

  const onPaste = (row: number, col: number) => (e: ClipboardEvent<HTMLInputElement>) => {
    const cells = parsePastedCells(e.clipboardData.getData("text"));
    if (cells.length <= 1 && (cells[0]?.length ?? 0) <= 1) return;
    e.preventDefault();
    const first = cells[0]!;
    // A header line pasted with the numbers is skipped.
    const rows = first.some((c) => c !== "" && Number.isNaN(Number(c.replace(",", ".")))) ? cells.slice(1) : cells;
    const missing = row + rows.length - fields.length;
    for (let i = 0; i < missing; i++) append(emptyRow);
    // Once the form was sent, pasted cells are checked again at once, as typed ones are.
    const pasted: Path<T>[] = [];
    rows.forEach((values, i) =>
      values.forEach((v, j) => {
        const column = props.columns[col + j];
        if (column) pasted.push(cell(row + i, column.key));
        if (column) form.setValue(cell(row + i, column.key), v as PathValue<T, Path<T>>, { shouldDirty: true });
      }),
    );
    markChanged(pasted);
    if (form.formState.isSubmitted) void form.trigger(pasted);
  };

  /** One editable cell: its input (or checkbox) and the messages about it. */
  const renderCell = (row: number, col: GridColumn, j: number) => {
    const name = cell(row, col.key);
    const label = `${col.label}, row ${row + 1}`;
    if (col.type === "checkbox") return <input id={cellId(row, j)} type="checkbox" aria-label={label} className="mx-auto block" {...registered(name)} />;
    const messages = serverMessages(name);
    const clientError = (get(form.formState.errors, name) as { message?: string } | undefined)?.message;
    const all = [...new Set([clientError, ...messages].filter(Boolean) as string[])];
    return (
      <div>
        <input
          id={cellId(row, j)}
          aria-label={label}
          aria-invalid={all.length > 0}
          title={all.join(" ")}
          inputMode={col.type === "text" ? "text" : "decimal"}
          className={`w-full min-w-16 rounded border border-line px-1.5 py-0.5 tabular ${col.type === "text" ? "text-left" : "text-right"} aria-[invalid=true]:border-danger aria-[invalid=true]:bg-danger-soft`}
          {...registered(name)}
          onKeyDown={onKeyDown(row, j)}
          onPaste={onPaste(row, j)}
        />
        {all.map((m) => (
          <p key={m} className="mt-0.5 max-w-48 text-xs font-semibold text-danger">
            {m}
          </p>
        ))}
      </div>
    );
  };

  // The rows drawn: every row of a short grid; of a long one, those in view (as many as drawn so far).
  const shown = items ? items.slice(0, drawn).map((i) => ({ field: fields[i.index]!, index: i.index })) : fields.map((field, index) => ({ field, index }));
  const last = items?.[Math.min(drawn, items.length) - 1];
  const padTop = items?.[0]?.start ?? 0;
  const padBottom = last ? virtualizer.getTotalSize() - last.end : 0;

  return (
    <div>
      {props.countField ? <input type="hidden" name={props.countField} value={fields.length} /> : null}
      <div ref={scroller} className={`${windowed ? "h-[32rem] overflow-auto" : "overflow-x-auto"} rounded border border-line bg-surface`} data-testid={windowed ? `${props.name}-window` : undefined} aria-busy={windowed && drawn !== Infinity ? true : undefined}>
        <table className="w-full text-sm" aria-rowcount={windowed ? fields.length + 1 : undefined}>
          <caption className="sr-only">{props.caption}</caption>
          <thead className={`${windowed ? "sticky top-0 z-10 " : ""}border-b border-line bg-canvas text-xs text-ink-muted`}>
            <tr>
              <th scope="col" className="px-2 py-1.5 text-left font-semibold">
                #
              </th>
              {props.columns.map((col) => (
                <th key={col.key} scope="col" className="px-2 py-1.5 text-right font-semibold">
                  {col.label}
                </th>
              ))}
              <th scope="col" className="px-2 py-1.5 text-right font-semibold">
                <span className="sr-only">Row actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {padTop > 0 ? <tr aria-hidden="true" style={{ height: padTop }} /> : null}
            {shown.map(({ field, index }) => (
              <tr key={field.id} data-index={index} aria-rowindex={windowed ? index + 2 : undefined} ref={windowed ? virtualizer.measureElement : undefined} className="border-b border-line align-top last:border-0">
                <td className="px-2 py-1">
                  <span className="text-ink-faint">{index + 1}</span>
                </td>
                {props.columns.map((col, j) => (
                  <td key={col.key} className="px-2 py-1">
                    {renderCell(index, col, j)}
                  </td>
                ))}
                <td className="px-2 py-1">
                  {props.disabled ? null : (
                    <span className="flex gap-1 whitespace-nowrap">
                      <button type="button" className="rounded px-1 text-xs text-accent hover:bg-accent-soft" aria-label={`Insert a row after row ${index + 1}`} onClick={() => insert(index + 1, emptyRow)}>
                        + row
                      </button>
                      <button type="button" className="rounded px-1 text-xs text-danger hover:bg-danger-soft" aria-label={`Delete row ${index + 1}`} onClick={() => remove(index)}>
                        delete
                      </button>
                    </span>
                  )}
                </td>
              </tr>
            ))}
            {padBottom > 0 ? <tr aria-hidden="true" style={{ height: padBottom }} /> : null}
          </tbody>
        </table>
      </div>
      <div className="mt-2 flex flex-wrap items-center gap-2 text-xs">
        {props.disabled ? null : (
          <button type="button" className="rounded border border-line-strong bg-surface px-2 py-1 font-semibold hover:bg-canvas" onClick={() => append(emptyRow)}>
            Add row
          </button>
        )}
        <button
          type="button"
          className="rounded border border-line-strong bg-surface px-2 py-1 font-semibold hover:bg-canvas"
          onClick={() => {
            const rows = (form.getValues(props.name as Path<T>) ?? []) as Record<string, unknown>[];
            downloadText(props.csvName, toCsv(props.columns.map((c) => c.label), rows.map((row) => props.columns.map((c) => String(row[c.key] ?? "")))));
          }}
        >
          Export CSV
        </button>
        {props.disabled ? null : <span className="text-ink-muted">Paste a block of cells from a spreadsheet into any cell to fill the table from there.</span>}
      </div>
    </div>
  );
}
