// The pieces of the materials page: a card per material with its stock panels, and the forms that
// add and change them. Each form shows the errors and typed values of a rejected submit only when
// that submit was its own (same intent, same target).
import { Form } from "react-router";
import { Field, SelectField, SubmitButton } from "./forms";
import { GRAIN_LABELS, GRAINS, MATERIAL_KIND_LABELS, MATERIAL_KINDS, type MaterialKind } from "~/lib/catalogue";
import { lengthInputValue } from "~/lib/length-fields";
import { formatMoney, moneyInputValue } from "~/lib/money";
import { formatLength, formatSize, type DisplayUnit } from "~/lib/units";

type Result = { intent: string; target: string; errors: Record<string, string>; values: Record<string, string>; stamp: string } | undefined;
type Panel = { id: string; lengthUm: number; widthUm: number; costMinor: number; onHand: number; grain: "length" | "none" };
type Material = { id: string; name: string; kind: MaterialKind; thicknessUm: number; note: string; panels: Panel[] };

/** The rejected submit of this form, if the last one was. */
function own(result: Result, intent: string, target: string) {
  return result && result.intent === intent && result.target === target && Object.keys(result.errors).length > 0 ? result : undefined;
}

export function MaterialCard({ material, unit, currency, canWrite, actionData }: { material: Material; unit: DisplayUnit; currency: string; canWrite: boolean; actionData: Result }) {
  const editing = own(actionData, "edit-material", material.id);
  const addingPanel = own(actionData, "add-panel", material.id);
  // table roles only when read-only: editable rows open and close, which table rows cannot
  const table = canWrite ? { row: undefined, header: undefined, cell: undefined } : ({ row: "row", header: "columnheader", cell: "cell" } as const);
  return (
    <article className="space-y-4 rounded-lg border border-line bg-card p-5" aria-labelledby={`material-${material.id}`} data-material={material.name}>
      <header className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h2 id={`material-${material.id}`} className="text-xl font-semibold">
            {material.name}
          </h2>
          <p className="text-sm text-muted">
            {MATERIAL_KIND_LABELS[material.kind]} · {formatLength(material.thicknessUm, unit)} thick{material.note ? ` · ${material.note}` : ""}
          </p>
        </div>
        {canWrite && (
          <Form method="post" onSubmit={(e) => !confirm(`Remove ${material.name} and its stock panels?`) && e.preventDefault()}>
            <input type="hidden" name="intent" value="remove-material" />
            <input type="hidden" name="materialId" value={material.id} />
            <button type="submit" className="min-h-11 rounded-md border border-bad/40 px-4 text-sm font-medium text-bad hover:bg-bad-soft">
              Remove material
            </button>
          </Form>
        )}
      </header>

      {material.panels.length === 0 ? (
        <p className="text-sm text-muted">No stock panels yet.</p>
      ) : (
        // editable, a list of rows that open, each saying what its figures are to a screen reader
        <div className="text-sm" role={canWrite ? "list" : "table"} aria-label={`Stock panels of ${material.name}`}>
          <div role={table.row} aria-hidden={canWrite || undefined} className="grid grid-cols-[1.4fr_1fr_1fr_0.8fr_4.5rem] gap-2 border-b border-line pb-2 text-xs font-semibold uppercase tracking-wider text-muted">
            <span role={table.header}>Panel</span>
            <span role={table.header}>Grain</span>
            <span role={table.header} className="text-right">Cost each</span>
            <span role={table.header} className="text-right">On hand</span>
            <span role={table.header} className="sr-only">Change</span>
          </div>
          {material.panels.map((p) => {
            const cells = (
              <>
                <span role={table.cell} className="font-medium tabular-nums">{formatSize(p.lengthUm, p.widthUm, unit)}</span>
                <span role={table.cell}>{GRAIN_LABELS[p.grain]}</span>
                <span role={table.cell} className="text-right tabular-nums">
                  {canWrite && <span className="sr-only">cost each </span>}
                  {formatMoney(p.costMinor, currency)}
                </span>
                <span role={table.cell} className="text-right tabular-nums">
                  {canWrite && <span className="sr-only">on hand </span>}
                  {p.onHand}
                </span>
              </>
            );
            const row = "grid grid-cols-[1.4fr_1fr_1fr_0.8fr_4.5rem] items-center gap-2 py-2";
            if (!canWrite) {
              return (
                <div key={p.id} role="row" className={`${row} border-b border-line`}>
                  {cells}
                </div>
              );
            }
            return (
              <div key={p.id} role="listitem" className="border-b border-line">
                <details open={Boolean(own(actionData, "edit-panel", p.id))}>
                  <summary className={`${row} cursor-pointer list-none [&::-webkit-details-marker]:hidden`}>
                    {cells}
                    <span className="text-right font-medium text-edge">Change</span>
                  </summary>
                  <div className="space-y-3 pb-4 pt-1">
                    <PanelForm key={actionData?.stamp} materialId={material.id} panel={p} unit={unit} currency={currency} actionData={actionData} />
                    <Form method="post">
                      <input type="hidden" name="intent" value="remove-panel" />
                      <input type="hidden" name="panelId" value={p.id} />
                      <button type="submit" className="min-h-11 rounded-md border border-bad/40 px-4 text-sm font-medium text-bad hover:bg-bad-soft">
                        Remove this panel
                      </button>
                    </Form>
                  </div>
                </details>
              </div>
            );
          })}
        </div>
      )}

      {canWrite && (
        <div className="flex flex-col gap-3 lg:flex-row lg:items-start">
          <details open={Boolean(addingPanel)} className="flex-1 rounded-md border border-line p-3">
            <summary className="cursor-pointer font-medium">Add a stock panel</summary>
            <div className="mt-3">
              <PanelForm key={actionData?.stamp} materialId={material.id} unit={unit} currency={currency} actionData={actionData} />
            </div>
          </details>
          <details open={Boolean(editing)} className="flex-1 rounded-md border border-line p-3">
            <summary className="cursor-pointer font-medium">Change this material</summary>
            <div className="mt-3">
              <MaterialForm key={actionData?.stamp} material={material} unit={unit} actionData={actionData} submitLabel="Save material" />
            </div>
          </details>
        </div>
      )}
    </article>
  );
}

export function MaterialForm({ material, unit, actionData, submitLabel }: { material?: Material; unit: DisplayUnit; actionData: Result; submitLabel: string }) {
  const intent = material ? "edit-material" : "add-material";
  const prefix = material ? `material-${material.id}` : "material-new";
  const mine = own(actionData, intent, material?.id ?? "new");
  const errors = mine?.errors ?? {};
  const values = mine?.values ?? {
    name: material?.name ?? "",
    kind: material?.kind ?? "plywood",
    thickness: material ? lengthInputValue(material.thicknessUm, unit) : "",
    note: material?.note ?? "",
  };
  return (
    <Form method="post" noValidate className="grid gap-3 sm:grid-cols-2">
      <input type="hidden" name="intent" value={intent} />
      {material && <input type="hidden" name="materialId" value={material.id} />}
      <Field id={`${prefix}-name`} label="Name" name="name" defaultValue={values.name} error={errors.name} placeholder="Birch plywood 6 mm" className="sm:col-span-2" />
      <SelectField id={`${prefix}-kind`} label="Kind" name="kind" defaultValue={values.kind} error={errors.kind}>
        {MATERIAL_KINDS.map((k) => (
          <option key={k} value={k}>
            {MATERIAL_KIND_LABELS[k]}
          </option>
        ))}
      </SelectField>
      <Field id={`${prefix}-thickness`} label={`Thickness (${unit})`} name="thickness" defaultValue={values.thickness} error={errors.thickness} inputMode="decimal" autoComplete="off" />
      <Field id={`${prefix}-note`} label="Colour or species" name="note" defaultValue={values.note} error={errors.note} placeholder="B/BB face" className="sm:col-span-2" />
      <div className="sm:col-span-2">
        <SubmitButton>{submitLabel}</SubmitButton>
      </div>
    </Form>
  );
}

function PanelForm({ materialId, panel, unit, currency, actionData }: { materialId: string; panel?: Panel; unit: DisplayUnit; currency: string; actionData: Result }) {
  const intent = panel ? "edit-panel" : "add-panel";
  const prefix = panel ? `panel-${panel.id}` : `panel-new-${materialId}`;
  const mine = own(actionData, intent, panel?.id ?? materialId);
  const errors = mine?.errors ?? {};
  const values = mine?.values ?? {
    length: panel ? lengthInputValue(panel.lengthUm, unit) : "",
    width: panel ? lengthInputValue(panel.widthUm, unit) : "",
    cost: panel ? moneyInputValue(panel.costMinor, currency) : "",
    onHand: panel ? String(panel.onHand) : "0",
    grain: panel?.grain ?? "length",
  };
  return (
    <Form method="post" noValidate className="grid gap-3 sm:grid-cols-2">
      <input type="hidden" name="intent" value={intent} />
      {panel ? <input type="hidden" name="panelId" value={panel.id} /> : <input type="hidden" name="materialId" value={materialId} />}
      <Field id={`${prefix}-length`} label={`Length (${unit})`} name="length" defaultValue={values.length} error={errors.length} inputMode="decimal" autoComplete="off" />
      <Field id={`${prefix}-width`} label={`Width (${unit})`} name="width" defaultValue={values.width} error={errors.width} inputMode="decimal" autoComplete="off" />
      <Field id={`${prefix}-cost`} label={`Cost each (${currency})`} name="cost" defaultValue={values.cost} error={errors.cost} inputMode="decimal" autoComplete="off" />
      <Field id={`${prefix}-onHand`} label="On hand" name="onHand" defaultValue={values.onHand} error={errors.onHand} inputMode="numeric" autoComplete="off" />
      <SelectField id={`${prefix}-grain`} label="Grain" name="grain" defaultValue={values.grain} error={errors.grain} className="sm:col-span-2">
        {GRAINS.map((g) => (
          <option key={g} value={g}>
            {GRAIN_LABELS[g]}
          </option>
        ))}
      </SelectField>
      <div className="sm:col-span-2">
        <SubmitButton>{panel ? "Save panel" : "Add panel"}</SubmitButton>
      </div>
    </Form>
  );
}
