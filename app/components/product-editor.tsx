// The product form: name, price, lead time and the bill of parts in a grid. The grid's rows travel
// to the action as JSON in a hidden input; the browser runs the server's part rules for instant
// red cells and holds back a submit the server would refuse.
import type { GridApi } from "ag-grid-community";
import { useCallback, useMemo, useRef, useState, type FormEvent } from "react";
import { Form, Link, useSearchParams } from "react-router";
import { Field, FormAlert, SubmitButton } from "./forms";
import { PageHeader } from "./page-header";
import { allRows, openEditorKeepingKeys, PartsGrid } from "./parts-grid";
import { PART_FIELD_LABELS, validatePartRows, type PartContext, type PartField, type PartRow, type ProductResult, type ProductValues, type RowErrors } from "~/lib/catalogue";

export type ProductEditorProps = {
  productId: string | null;
  values: ProductValues | null;
  currency: string;
  materials: { id: string; name: string }[];
  parts: PartContext;
  /** The day the product was retired ("2 Dec 2026", where the shop is), or null while it is offered. */
  retiredOn: string | null;
  /** Order lines and orders naming the product; null for a new one. */
  use: { lines: number; orders: number } | null;
  canWrite: boolean;
  result: ProductResult | undefined;
};

let counter = 0;
/** A key for a new row; only unique within this form (crypto.randomUUID needs a secure context). */
function newKey() {
  counter += 1;
  return `new-${Date.now().toString(36)}-${counter}`;
}

export function ProductEditor(props: ProductEditorProps) {
  // A fresh editor after every answer: a rejected form shows what was typed, a saved one what was stored.
  return <Editor key={props.result?.stamp ?? "loaded"} {...props} />;
}

function Editor({ productId, values, currency, materials, parts: ctx, retiredOn, use, canWrite, result }: ProductEditorProps) {
  const [params] = useSearchParams();
  const rejected = result && !result.ok ? result : undefined;
  const shown = rejected?.values ?? values ?? { name: "", price: "", leadTime: "", parts: [] };
  const errors = rejected?.errors ?? {};
  // The grid takes its rows once; after that it owns them (see parts-grid.tsx).
  const [initialRows] = useState<PartRow[]>(shown.parts);
  const [rows, setRows] = useState<PartRow[]>(initialRows);
  const [touched, setTouched] = useState<Set<string>>(() => new Set());
  const [showAll, setShowAll] = useState(Boolean(rejected));
  const apiRef = useRef<GridApi<PartRow> | null>(null);
  // Rows can be added once the grid runs (after hydration); until then the button says so by being off.
  const [gridReady, setGridReady] = useState(false);
  const onGridReady = useCallback(() => setGridReady(true), []);

  const clientCheck = useMemo(() => validatePartRows(rows, ctx), [rows, ctx]);
  const clientErrors = useMemo<RowErrors>(() => (clientCheck.ok ? {} : clientCheck.rowErrors), [clientCheck]);
  const visible = useMemo(() => visibleErrors(rows, clientErrors, rejected?.rowErrors ?? {}, touched, showAll), [rows, clientErrors, rejected, touched, showAll]);

  const onCellEdited = useCallback((key: string, field: PartField) => setTouched((t) => new Set(t).add(`${key}:${field}`)), []);

  function addPart() {
    const api = apiRef.current;
    if (!api) return;
    const last = rows.at(-1);
    const row: PartRow = {
      key: newKey(),
      name: "",
      length: "",
      width: "",
      materialId: last?.materialId ?? materials[0]?.id ?? "",
      quantity: 1,
      grainLocked: last?.grainLocked ?? false,
      process: last?.process ?? "saw",
    };
    api.applyTransaction({ add: [row] });
    setRows(allRows(api));
    const index = api.getRowNode(row.key)?.rowIndex ?? api.getDisplayedRowCount() - 1;
    openEditorKeepingKeys(api, index, "name");
  }

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    const api = apiRef.current;
    if (!api) return; // before the grid runs, the rows as loaded go as they are
    api.stopEditing();
    const latest = allRows(api);
    const hidden = event.currentTarget.elements.namedItem("parts") as HTMLInputElement;
    hidden.value = JSON.stringify(latest);
    setRows(latest);
    // Bad rows are marked at once, but the form still goes: the server then names the name, price and
    // lead time too, instead of those surfacing only after the parts are right.
    if (!validatePartRows(latest, ctx).ok) setShowAll(true);
  }

  const problems = Object.entries(visible).flatMap(([key, fields]) => {
    const index = rows.findIndex((r) => r.key === key);
    return Object.entries(fields).map(([field, message]) => ({ id: `${key}:${field}`, text: `Row ${index + 1}${rows[index]?.name ? ` (${rows[index].name})` : ""}, ${PART_FIELD_LABELS[field as PartField]}: ${message}` }));
  });
  // The server's word on the rows it was sent, until they change; then the browser's, by the same rules.
  const partsMessage =
    rows === initialRows && errors.parts
      ? errors.parts
      : showAll && !clientCheck.ok
        ? (clientCheck.formError ?? "Some parts need correcting: see the cells marked in red.")
        : undefined;
  return (
    <div className="space-y-6">
      <PageHeader eyebrow="Owner" title={productId ? (values?.name ?? "Product") : "New product"}>
        A product is a bill of parts: each part's finished size, material, how many go into one product, and how it is cut.
      </PageHeader>
      <p>
        <Link to="/catalogue" className="font-medium text-edge underline-offset-2 hover:underline">
          ← Catalogue
        </Link>
      </p>
      {result?.ok && result.notice && <FormAlert tone="ok">{result.notice}</FormAlert>}
      {!result && params.get("created") && <FormAlert tone="ok">Product created.</FormAlert>}
      {errors.form && <FormAlert>{errors.form}</FormAlert>}
      {!canWrite && <FormAlert tone="warn">Read only: only the owner changes the catalogue.</FormAlert>}
      {retiredOn && (
        <FormAlert tone="warn">
          Retired on {retiredOn}: new orders do not offer it. The orders that have it keep it.
        </FormAlert>
      )}

      <Form method="post" noValidate onSubmit={onSubmit} className="space-y-6">
        <section className="grid gap-4 rounded-lg border border-line bg-card p-5 md:grid-cols-[2fr_1fr_1fr]">
          <Field label="Name" name="name" defaultValue={shown.name} error={errors.name} readOnly={!canWrite} placeholder="Table number 150 × 210" />
          <Field label={`Price (${currency})`} name="price" defaultValue={shown.price} error={errors.price} readOnly={!canWrite} inputMode="decimal" autoComplete="off" />
          <Field label="Lead time (days)" name="leadTime" defaultValue={shown.leadTime} error={errors.leadTime} readOnly={!canWrite} inputMode="numeric" hint="Optional" autoComplete="off" />
        </section>

        <section className="space-y-3" aria-labelledby="parts-heading">
          <div>
            <h2 id="parts-heading" className="text-xl font-semibold">
              Parts
            </h2>
            {canWrite && (
              <p className="text-sm text-muted">
                Type to edit a cell; Tab moves right, Enter saves and moves down. On the × cell, Delete or Enter removes the part. Sizes in {ctx.unit}, or with
                a unit (600 mm, 23 5/8&quot;).
              </p>
            )}
          </div>
          {materials.length === 0 && (
            <FormAlert tone="warn">
              Parts are cut from the shop's materials, and there are none yet. <Link to="/catalogue/materials" className="underline">Add a material</Link> first.
            </FormAlert>
          )}
          <input type="hidden" name="parts" value={JSON.stringify(rows)} />
          <div data-testid="parts-grid">
            <PartsGrid
              initialRows={initialRows}
              materials={materials}
              unit={ctx.unit}
              errors={visible}
              readOnly={!canWrite}
              apiRef={apiRef}
              onRowsChange={setRows}
              onCellEdited={onCellEdited}
              onReady={onGridReady}
            />
          </div>
          {rows.length === 0 && <p className="text-sm text-muted">No parts yet.{canWrite ? " Add the first with “Add part”." : ""}</p>}
          {canWrite && (
            <button
              id="add-part"
              type="button"
              onClick={addPart}
              disabled={!gridReady || materials.length === 0}
              className="min-h-11 rounded-md border border-edge bg-white px-4 font-semibold text-edge hover:bg-edge-soft disabled:opacity-50"
            >
              Add part
            </button>
          )}
          {partsMessage && (
            <p id="parts-error" className="text-sm font-medium text-bad">
              {partsMessage}
            </p>
          )}
          {problems.length > 0 && (
            <ul className="list-inside list-disc space-y-1 text-sm text-bad" aria-live="polite" data-testid="part-problems">
              {problems.map((p) => (
                <li key={p.id}>{p.text}</li>
              ))}
            </ul>
          )}
        </section>
        {canWrite && <SubmitButton pendingText="Saving…">{productId ? "Save product" : "Create product"}</SubmitButton>}
      </Form>
      {productId && use && <ProductLife retired={Boolean(retiredOn)} use={use} canWrite={canWrite} />}
    </div>
  );
}

/**
 * Red cells: the browser's verdict on cells someone has edited (or on all, once a save was tried),
 * and the server's verdict on cells not edited since it answered.
 */
function visibleErrors(rows: PartRow[], client: RowErrors, server: RowErrors, touched: Set<string>, showAll: boolean): RowErrors {
  const out: RowErrors = {};
  for (const { key } of rows) {
    for (const field of Object.keys(PART_FIELD_LABELS) as PartField[]) {
      const edited = touched.has(`${key}:${field}`);
      const message = edited || showAll ? (client[key]?.[field] ?? (edited ? undefined : server[key]?.[field])) : server[key]?.[field];
      if (message) (out[key] ??= {})[field] = message;
    }
  }
  return out;
}


/** Where the product is used, and the owner's ways to retire, bring back or delete it. */
function ProductLife({ retired, use, canWrite }: { retired: boolean; use: { lines: number; orders: number }; canWrite: boolean }) {
  const used = use.lines > 0;
  return (
    <section className="space-y-3 rounded-lg border border-line bg-card p-5" aria-labelledby="life-heading" data-testid="product-life">
      <h2 id="life-heading" className="text-lg font-semibold">
        {retired ? "Retired" : "Offered on new orders"}
      </h2>
      <p className="text-sm text-muted">
        {used ? `On ${use.lines} order line${use.lines === 1 ? "" : "s"} in ${use.orders} order${use.orders === 1 ? "" : "s"}.` : "Not on any order yet."}
        {!retired && canWrite && " Retiring takes it off the product list of new orders; the orders that have it keep it, and it can be offered again."}
      </p>
      {canWrite && (
        <div className="flex flex-wrap items-start gap-3">
          <Form method="post">
            <input type="hidden" name="intent" value={retired ? "restore" : "retire"} />
            <button type="submit" className="min-h-11 rounded-md border border-edge bg-white px-4 font-semibold text-edge hover:bg-edge-soft">
              {retired ? "Offer it again" : "Retire product"}
            </button>
          </Form>
          {!used && (
            <details className="text-sm">
              <summary className="flex min-h-11 cursor-pointer items-center font-medium text-bad">Delete for good…</summary>
              <Form method="post" className="mt-2 flex flex-wrap items-center gap-3">
                <input type="hidden" name="intent" value="delete-product" />
                <p>It is on no order, so it can go entirely, parts and all. This cannot be undone.</p>
                <button type="submit" className="min-h-11 rounded-md border border-bad/40 bg-white px-4 font-semibold text-bad hover:bg-bad-soft">
                  Delete product
                </button>
              </Form>
            </details>
          )}
        </div>
      )}
    </section>
  );
}
