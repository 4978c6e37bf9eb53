import * as v from "valibot";
import { data, Form, redirect } from "react-router";
import type { Route } from "./+types/rack";
import { requirePermission } from "~/auth.server";
import { Field, FormAlert, SelectField, SubmitButton } from "~/components/forms";
import { PageHeader } from "~/components/page-header";
import { parseForm } from "~/lib/forms";
import { batchCode } from "~/lib/batches";
import { can } from "~/lib/permissions";
import { formatSize, parseLength } from "~/lib/units";
import { addOffcut, rackOverview, updateOffcut } from "~/models/rack.server";
import { getShop } from "~/models/shops.server";

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "rack:read");
  const [materials, shop] = await Promise.all([rackOverview(user.shopId), getShop(user.shopId)]);
  return { materials, unit: shop.displayUnit, canWrite: can(user.role, "rack:write") };
}

const Uuid = v.pipe(v.string(), v.uuid("Choose from the list."));
const ActionSchema = v.variant("intent", [
  v.object({ intent: v.literal("add"), materialId: Uuid, length: v.string(), width: v.string(), location: v.pipe(v.optional(v.string(), ""), v.trim(), v.maxLength(80, "Location: at most 80 characters.")), grain: v.picklist(["length", "none"], "Choose the grain.") }),
  v.object({ intent: v.literal("move"), offcutId: Uuid, location: v.pipe(v.string(), v.trim(), v.maxLength(80, "Location: at most 80 characters.")) }),
  v.object({ intent: v.literal("discard"), offcutId: Uuid }),
], "Unknown action.");

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "rack:write");
  const form = await args.request.formData();
  const parsed = parseForm(ActionSchema, form);
  if (!parsed.ok) return data({ errors: parsed.errors }, { status: 400 });
  const input = parsed.data;
  if (input.intent === "add") {
    const unit = (await getShop(user.shopId)).displayUnit;
    const length = parseLength(input.length, unit);
    const width = parseLength(input.width, unit);
    const errors: Record<string, string> = {};
    if (!length.ok) errors.length = `Length ${length.error}.`;
    if (!width.ok) errors.width = `Width ${width.error}.`;
    if (length.ok && length.um > 5_000_000) errors.length = "Length: an offcut longer than 5 m is not a real offcut.";
    if (width.ok && width.um > 5_000_000) errors.width = "Width: an offcut wider than 5 m is not a real offcut.";
    if (!length.ok || !width.ok || Object.keys(errors).length) return data({ errors }, { status: 400 });
    if (!(await addOffcut(user.shopId, { materialId: input.materialId, lengthUm: length.um, widthUm: width.um, location: input.location, grain: input.grain }))) throw data("No such material in this shop.", { status: 404 });
  } else {
    const found = await updateOffcut(user.shopId, input.offcutId, input.intent === "move" ? { location: input.location } : { status: "discarded" });
    if (!found) throw data("No such offcut on this shop's rack.", { status: 404 });
  }
  return redirect("/rack");
}

const STATUS = { racked: "on the rack", reserved: "reserved by a released batch", expected: "to come from a released batch" } as const;

export default function Rack({ loaderData, actionData }: Route.ComponentProps) {
  const { materials, unit, canWrite } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  return (
    <div className="space-y-8">
      <PageHeader eyebrow="Planner" title="Offcut rack">
        Reusable offcuts by material, where they sit and which batch made them, and the full sheets in stock. Plans use racked offcuts first.
      </PageHeader>
      {Object.keys(errors).length > 0 && <FormAlert>Some fields need another look.</FormAlert>}
      {materials.map((m) => (
        <section key={m.id} className="space-y-3" data-material={m.name}>
          <h2 className="text-xl font-semibold">{m.name}</h2>
          <p className="text-sm text-muted">
            Sheets in stock: {m.panels.length === 0 ? "none listed" : m.panels.map((p) => `${p.onHand} × ${formatSize(p.lengthUm, p.widthUm, unit)}`).join(" · ")}
          </p>
          {m.offcuts.length === 0 ? (
            <p className="text-muted">No offcuts.</p>
          ) : (
            <ul className="divide-y divide-line rounded-lg border border-line bg-card">
              {m.offcuts.map((o) => (
                <li key={o.id} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
                  <span>
                    <span className="font-semibold tabular-nums">{formatSize(o.lengthUm, o.widthUm, unit)}</span>
                    <span className="text-sm text-muted">
                      {" "}
                      · {STATUS[o.status as keyof typeof STATUS]}
                      {o.location ? ` · ${o.location}` : ""}
                      {o.sourceBatch ? ` · from ${batchCode(o.sourceBatch)}` : ""}
                      {o.grain === "length" ? " · grain along the length" : ""}
                    </span>
                  </span>
                  {canWrite && o.status === "racked" && (
                    <span className="flex flex-wrap items-end gap-2">
                      <Form method="post" className="flex items-end gap-2">
                        <input type="hidden" name="intent" value="move" />
                        <input type="hidden" name="offcutId" value={o.id} />
                        <label className="sr-only" htmlFor={`loc-${o.id}`}>
                          Location
                        </label>
                        <input id={`loc-${o.id}`} name="location" defaultValue={o.location} placeholder="Rack, slot" className="min-h-11 w-36 rounded-md border border-line bg-white px-3" />
                        <button type="submit" className="min-h-11 rounded-md border border-line bg-white px-3 text-sm font-medium hover:border-edge">
                          Save place
                        </button>
                      </Form>
                      <Form method="post">
                        <input type="hidden" name="intent" value="discard" />
                        <input type="hidden" name="offcutId" value={o.id} />
                        <button type="submit" className="min-h-11 rounded-md border border-bad/40 px-3 text-sm font-medium text-bad hover:bg-bad-soft">
                          Mark as scrapped
                        </button>
                      </Form>
                    </span>
                  )}
                </li>
              ))}
            </ul>
          )}
        </section>
      ))}
      {canWrite && materials.length > 0 && (
        <section className="space-y-3 rounded-lg border border-line bg-card p-5">
          <h2 className="text-xl font-semibold">Rack an offcut</h2>
          <Form method="post" className="grid gap-4 md:grid-cols-5" noValidate>
            <input type="hidden" name="intent" value="add" />
            <SelectField label="Material" name="materialId" error={errors.materialId} className="md:col-span-2">
              {materials.map((m) => (
                <option key={m.id} value={m.id}>
                  {m.name}
                </option>
              ))}
            </SelectField>
            <Field label={`Length (${unit})`} name="length" error={errors.length} />
            <Field label={`Width (${unit})`} name="width" error={errors.width} />
            <SelectField label="Grain" name="grain" defaultValue="length" error={errors.grain}>
              <option value="length">along the length</option>
              <option value="none">none</option>
            </SelectField>
            <Field label="Where it sits" name="location" placeholder="Rack A, slot 4" error={errors.location} className="md:col-span-2" />
            <SubmitButton className="md:w-fit md:self-end">Rack it</SubmitButton>
          </Form>
        </section>
      )}
    </div>
  );
}
