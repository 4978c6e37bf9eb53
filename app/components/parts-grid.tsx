// The bill-of-parts grid. AG Grid owns the rows while people edit (feeding rows back in as props
// would interrupt the cell being edited); every change is reported up as a fresh copy of all rows.
import { AgGridReact, type CustomCellEditorProps, type CustomCellRendererProps } from "ag-grid-react";
import {
  CellStyleModule,
  CheckboxEditorModule,
  ClientSideRowModelApiModule,
  ClientSideRowModelModule,
  CustomEditorModule,
  NumberEditorModule,
  RenderApiModule,
  RowApiModule,
  SelectEditorModule,
  themeQuartz,
  type CellClassParams,
  type CellKeyDownEvent,
  type CellValueChangedEvent,
  type ColDef,
  type GridApi,
  type GridReadyEvent,
} from "ag-grid-community";
import { useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState, type RefObject } from "react";
import { PROCESS_LABELS, PROCESSES, type PartField, type PartRow, type RowErrors } from "~/lib/catalogue";
import type { DisplayUnit } from "~/lib/units";

// Only what this grid uses: rows in memory, add/remove by transaction, our text editor, number/select/checkbox editors, red cells.
const MODULES = [
  ClientSideRowModelModule,
  ClientSideRowModelApiModule,
  RowApiModule,
  RenderApiModule,
  CustomEditorModule,
  NumberEditorModule,
  SelectEditorModule,
  CheckboxEditorModule,
  CellStyleModule,
];

// The palette of app/app.css.
const THEME = themeQuartz.withParams({
  accentColor: "#b8561d",
  fontFamily: "IBM Plex Sans",
  fontSize: 15,
  backgroundColor: "#fffdf9",
  foregroundColor: "#1f2329",
  borderColor: "#ddd5c6",
  headerBackgroundColor: "#f6f2ea",
  headerTextColor: "#5d6470",
  oddRowBackgroundColor: "#fffdf9",
  rowHoverColor: "#f6e3d4",
});

const BAD_CELL = { "bg-bad-soft!": isBad, "text-bad!": isBad, "shadow-[inset_0_0_0_2px_var(--color-bad)]": isBad };
function isBad(params: CellClassParams<PartRow>) {
  const errors = (params.context as GridContext).errors.current;
  const field = params.colDef.field as PartField | undefined;
  return Boolean(params.data && field && errors[params.data.key]?.[field]);
}

// Stable props: AG Grid re-applies any option whose identity changes, which can cut into an edit.
const DEFAULT_COL: ColDef<PartRow> = { sortable: false, suppressMovable: true };
const rowId = (p: { data: PartRow }) => p.data.key;

type GridContext = { errors: RefObject<RowErrors>; remove: (row: PartRow) => void };

/**
 * Re-applies the red-cell rules to the cells whose verdict changed, and never to the one being
 * edited: a refresh reaching an open editor rebuilt it from the row's value, and what was typed since
 * Tab was lost. The edited cell is redrawn when its edit ends, which changes the errors again.
 */
function refreshChangedCells(api: GridApi<PartRow>, before: RowErrors, after: RowErrors) {
  const editing = api.getEditingCells()[0];
  const keys = new Set([...Object.keys(before), ...Object.keys(after)]);
  for (const key of keys) {
    const node = api.getRowNode(key);
    if (!node) continue;
    const fields = new Set([...Object.keys(before[key] ?? {}), ...Object.keys(after[key] ?? {})]);
    const columns = [...fields].filter((field) => before[key]?.[field as PartField] !== after[key]?.[field as PartField] && !(editing && editing.rowIndex === node.rowIndex && editing.column?.getColId() === field));
    if (columns.length > 0) api.refreshCells({ rowNodes: [node], columns });
  }
}

/**
 * Opens a cell's editor for typing, keeping what is typed before it is there. React mounts the editor
 * a frame or two later, and a fast typist's first letters after "Add part" went nowhere; they are
 * held and handed to the editor when it takes the keyboard.
 */
export function openEditorKeepingKeys(api: GridApi<PartRow>, rowIndex: number, colKey: PartField) {
  let held = "";
  const editorInput = () => {
    const active = document.activeElement;
    return active instanceof HTMLInputElement && active.closest(`.ag-cell-inline-editing[col-id="${colKey}"]`) ? active : null;
  };
  const release = () => {
    document.removeEventListener("keydown", hold, true);
    document.removeEventListener("focusin", onFocus, true);
    clearTimeout(timer);
    const input = editorInput();
    if (input && held) {
      input.value += held;
      input.dispatchEvent(new Event("input", { bubbles: true }));
    }
    held = "";
  };
  function hold(event: KeyboardEvent) {
    if (editorInput()) return release();
    if (event.key.length !== 1 || event.ctrlKey || event.metaKey || event.altKey) return;
    held += event.key;
    event.preventDefault();
    event.stopImmediatePropagation();
  }
  function onFocus() {
    if (editorInput()) release();
  }
  document.addEventListener("keydown", hold, true);
  document.addEventListener("focusin", onFocus, true);
  const timer = setTimeout(release, 2000);
  // After the new row is drawn, so the editor's input (not just the cell) gets the keyboard.
  requestAnimationFrame(() => {
    api.setFocusedCell(rowIndex, colKey);
    api.startEditingCell({ rowIndex, colKey });
  });
}

export function allRows(api: GridApi<PartRow>): PartRow[] {
  const rows: PartRow[] = [];
  api.forEachNode((node) => node.data && rows.push({ ...node.data }));
  return rows;
}

function RemoveCell({ data, context }: CustomCellRendererProps<PartRow>) {
  if (!data) return null;
  return (
    <button
      type="button"
      tabIndex={-1}
      aria-label={`Remove part ${data.name || "(unnamed)"}`}
      title="Remove this part (Delete or Enter on this cell)"
      onClick={() => (context as GridContext).remove(data)}
      className="h-8 w-8 rounded-md text-lg leading-none text-muted hover:bg-bad-soft hover:text-bad"
    >
      ×
    </button>
  );
}

/**
 * The text editor for name and sizes: an input whose text lives in React state. AG Grid now and then
 * gives an open editor a fresh start (Tab redraws the row while React is still mounting the editor);
 * its own editor then went back to the cell's old value and lost the keys typed since Tab, most often
 * on a slow tablet. This one keeps what was typed and tells the grid again.
 */
function TextCellEditor({ value, eventKey, onValueChange }: CustomCellEditorProps<PartRow, string>) {
  const [text, setText] = useState(() => (eventKey?.length === 1 ? eventKey : eventKey === "Backspace" || eventKey === "Delete" ? "" : (value ?? "")));
  const input = useRef<HTMLInputElement>(null);
  // Only on a fresh start (a fresh callback): the grid hears the typed text again. Typing reports itself.
  useEffect(() => onValueChange(text), [onValueChange]);
  useLayoutEffect(() => {
    const el = input.current;
    if (!el) return;
    el.focus();
    el.setSelectionRange(el.value.length, el.value.length);
  }, []);
  return (
    <input
      ref={input}
      value={text}
      onChange={(e) => {
        setText(e.target.value);
        onValueChange(e.target.value);
      }}
      autoComplete="off"
      spellCheck={false}
      className="h-full w-full bg-white px-[11px] outline-none"
    />
  );
}

export function PartsGrid({
  initialRows,
  materials,
  unit,
  errors,
  readOnly,
  apiRef,
  onRowsChange,
  onCellEdited,
  onReady,
}: {
  initialRows: PartRow[];
  materials: { id: string; name: string }[];
  unit: DisplayUnit;
  errors: RowErrors;
  readOnly: boolean;
  apiRef: RefObject<GridApi<PartRow> | null>;
  onRowsChange: (rows: PartRow[]) => void;
  onCellEdited: (key: string, field: PartField) => void;
  onReady: () => void;
}) {
  const errorsRef = useRef(errors);
  const shownErrors = useRef(errors);
  errorsRef.current = errors;
  useEffect(() => {
    if (apiRef.current) refreshChangedCells(apiRef.current, shownErrors.current, errors);
    shownErrors.current = errors;
  }, [errors, apiRef]);

  const rowData = useMemo(() => initialRows.map((r) => ({ ...r })), [initialRows]);
  const context = useMemo<GridContext>(
    () => ({
      errors: errorsRef,
      remove: (row) => {
        const api = apiRef.current;
        if (!api) return;
        const index = api.getRowNode(row.key)?.rowIndex ?? 0;
        api.applyTransaction({ remove: [row] });
        onRowsChange(allRows(api));
        const count = api.getDisplayedRowCount();
        if (count > 0) api.setFocusedCell(Math.min(index, count - 1), "name");
        else document.getElementById("add-part")?.focus();
      },
    }),
    [apiRef, onRowsChange],
  );

  const onCellValueChanged = useCallback(
    (e: CellValueChangedEvent<PartRow>) => {
      // Out of the grid's own key handling: React would otherwise render, and refresh the red cells, in the
      // middle of a Tab that is still moving the editor to the next cell, and the keyboard got lost now and then.
      const key = e.data.key;
      const field = e.colDef.field as PartField;
      setTimeout(() => {
        onCellEdited(key, field);
        onRowsChange(allRows(e.api));
      });
    },
    [onCellEdited, onRowsChange],
  );
  const onCellKeyDown = useCallback(
    (e: CellKeyDownEvent<PartRow>) => {
      const key = (e.event as KeyboardEvent | null)?.key;
      if (e.column.getColId() === "remove" && e.data && (key === "Enter" || key === "Delete" || key === " ")) {
        (e.event as KeyboardEvent).preventDefault();
        context.remove(e.data);
      }
    },
    [context],
  );
  const onGridReady = useCallback(
    (e: GridReadyEvent<PartRow>) => {
      apiRef.current = e.api;
      onReady();
    },
    [apiRef, onReady],
  );

  const columns = useMemo<ColDef<PartRow>[]>(() => {
    const editable = !readOnly;
    const cols: ColDef<PartRow>[] = [
      { field: "name", headerName: "Part", editable, flex: 2, minWidth: 150, cellEditor: TextCellEditor, cellClassRules: BAD_CELL },
      { field: "length", headerName: `Length (${unit})`, editable, flex: 1, minWidth: 120, cellEditor: TextCellEditor, cellClassRules: BAD_CELL },
      { field: "width", headerName: `Width (${unit})`, editable, flex: 1, minWidth: 120, cellEditor: TextCellEditor, cellClassRules: BAD_CELL },
      {
        field: "materialId",
        headerName: "Material",
        editable,
        flex: 2,
        minWidth: 180,
        cellEditor: "agSelectCellEditor",
        cellEditorParams: { values: materials.map((m) => m.id) },
        refData: Object.fromEntries(materials.map((m) => [m.id, m.name])),
        cellClassRules: BAD_CELL,
      },
      {
        field: "quantity",
        headerName: "Qty",
        editable,
        width: 90,
        cellDataType: "number",
        cellEditor: "agNumberCellEditor",
        cellEditorParams: { min: 1, max: 999, precision: 0 },
        cellClassRules: BAD_CELL,
      },
      { field: "grainLocked", headerName: "Grain locked", editable, width: 130, cellDataType: "boolean", cellClassRules: BAD_CELL },
      {
        field: "process",
        headerName: "Process",
        editable,
        width: 130,
        cellEditor: "agSelectCellEditor",
        cellEditorParams: { values: [...PROCESSES] },
        refData: PROCESS_LABELS,
        cellClassRules: BAD_CELL,
      },
    ];
    if (!readOnly) cols.push({ colId: "remove", headerName: "", width: 64, cellRenderer: RemoveCell, sortable: false, resizable: false });
    return cols;
  }, [materials, unit, readOnly]);

  return (
    <AgGridReact<PartRow>
      modules={MODULES}
      theme={THEME}
      rowData={rowData}
      columnDefs={columns}
      defaultColDef={DEFAULT_COL}
      getRowId={rowId}
      context={context}
      domLayout="autoHeight"
      rowHeight={44}
      headerHeight={44}
      singleClickEdit
      stopEditingWhenCellsLoseFocus
      enterNavigatesVerticallyAfterEdit
      suppressNoRowsOverlay
      onGridReady={onGridReady}
      onCellValueChanged={onCellValueChanged}
      onCellKeyDown={onCellKeyDown}
    />
  );
}
