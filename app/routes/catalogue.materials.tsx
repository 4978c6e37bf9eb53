import * as v from "valibot";
import { data, Link, useActionData } from "react-router";
import type { Route } from "./+types/catalogue.materials";
import { hasPermission, requirePermission } from "~/auth.server";
import { FormAlert } from "~/components/forms";
import { MaterialCard, MaterialForm } from "~/components/material-forms";
import { PageHeader } from "~/components/page-header";
import { materialSchema, panelSchema } from "~/lib/catalogue";
import { parseForm } from "~/lib/forms";
import { createMaterial, createPanel, getMaterial, getPanel, listMaterials, MaterialInUseError, removeMaterial, removePanel, updateMaterial, updatePanel } from "~/models/catalogue.server";
import { getShop } from "~/models/shops.server";

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "catalogue:read");
  const [shop, materials] = await Promise.all([getShop(user.shopId), listMaterials(user.shopId)]);
  return { unit: shop.displayUnit, currency: shop.currency, materials, canWrite: hasPermission(user.role, "catalogue:write") };
}

const Uuid = v.pipe(v.string("Missing id."), v.uuid("Not a valid id."));
const IntentSchema = v.object({
  intent: v.picklist(["add-material", "edit-material", "remove-material", "add-panel", "edit-panel", "remove-panel"], "Unknown action."),
});

export type MaterialsResult = { intent: string; target: string; errors: Record<string, string>; values: Record<string, string>; notice: string | null; stamp: string };

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "catalogue:write");
  const form = await args.request.formData();
  const values = Object.fromEntries([...form.keys()].map((k) => [k, String(form.get(k) ?? "")]));
  const intentParsed = parseForm(IntentSchema, form);
  const intent = intentParsed.ok ? intentParsed.data.intent : null;
  const target = values.panelId || values.materialId || "new";
  const result = (status: number, errors: Record<string, string>, notice: string | null = null) =>
    data<MaterialsResult>({ intent: intent ?? "", target, errors, values, notice, stamp: crypto.randomUUID() }, { status });
  const notFound = (what: string) => data(`No such ${what} in this shop.`, { status: 404 });
  if (!intent) return result(400, intentParsed.ok ? {} : intentParsed.errors);

  const shop = await getShop(user.shopId);
  const unit = shop.displayUnit;
  // Ids come first, so another shop's id answers 404 before anything about the fields is said.
  const needsMaterial = intent === "edit-material" || intent === "remove-material" || intent === "add-panel";
  const needsPanel = intent === "edit-panel" || intent === "remove-panel";
  const materialId = needsMaterial ? v.safeParse(Uuid, values.materialId) : null;
  const panelId = needsPanel ? v.safeParse(Uuid, values.panelId) : null;
  if (materialId && !materialId.success) return result(400, { form: materialId.issues[0].message });
  if (panelId && !panelId.success) return result(400, { form: panelId.issues[0].message });
  const material = materialId?.success ? await getMaterial(user.shopId, materialId.output) : null;
  const panel = panelId?.success ? await getPanel(user.shopId, panelId.output) : null;
  if (needsMaterial && !material) throw notFound("material");
  if (needsPanel && !panel) throw notFound("stock panel");

  switch (intent) {
    case "add-material":
    case "edit-material": {
      const parsed = parseForm(materialSchema(unit, material?.thicknessUm), form);
      if (!parsed.ok) return result(400, parsed.errors);
      const { thickness, ...rest } = parsed.data;
      if (material) await updateMaterial(user.shopId, material.id, { ...rest, thicknessUm: thickness });
      else await createMaterial(user.shopId, { ...rest, thicknessUm: thickness });
      return result(200, {}, material ? `${rest.name} saved.` : `${rest.name} added. Add the stock panels it comes in below.`);
    }
    case "remove-material": {
      try {
        await removeMaterial(user.shopId, material!.id);
      } catch (error) {
        if (error instanceof MaterialInUseError) return result(409, { form: error.message });
        throw error;
      }
      return result(200, {}, `${material!.name} and its stock panels removed.`);
    }
    case "add-panel":
    case "edit-panel": {
      const parsed = parseForm(panelSchema(unit, shop.currency, panel ?? undefined), form);
      if (!parsed.ok) return result(400, parsed.errors);
      const { length, width, cost, ...rest } = parsed.data;
      const input = { ...rest, lengthUm: length, widthUm: width, costMinor: cost };
      if (panel) await updatePanel(user.shopId, panel.id, input);
      else await createPanel(user.shopId, material!.id, input);
      return result(200, {}, panel ? "Stock panel saved." : "Stock panel added.");
    }
    case "remove-panel": {
      await removePanel(user.shopId, panel!.id);
      return result(200, {}, "Stock panel removed.");
    }
  }
}

export default function Materials({ loaderData }: Route.ComponentProps) {
  const { materials, unit, currency, canWrite } = loaderData;
  const actionData = useActionData<typeof action>() as MaterialsResult | undefined;
  const formError = actionData?.errors.form;
  return (
    <div className="space-y-8">
      <PageHeader eyebrow="Owner" title="Materials">
        The sheet goods the shop cuts, and the stock panels each comes in. Plans draw on these panels and their counts.
      </PageHeader>
      <p>
        <Link to="/catalogue" className="font-medium text-edge underline-offset-2 hover:underline">
          ← Products
        </Link>
      </p>
      {actionData?.notice && <FormAlert tone="ok">{actionData.notice}</FormAlert>}
      {formError && <FormAlert>{formError}</FormAlert>}

      {materials.length === 0 && <p className="text-muted">No materials yet.</p>}
      <ul className="space-y-4">
        {materials.map((m) => (
          <li key={m.id}>
            <MaterialCard material={m} unit={unit} currency={currency} canWrite={canWrite} actionData={actionData} />
          </li>
        ))}
      </ul>

      {canWrite && (
        <section className="max-w-2xl space-y-3 rounded-lg border border-line bg-card p-5" aria-labelledby="add-material">
          <h2 id="add-material" className="text-xl font-semibold">
            Add a material
          </h2>
          <MaterialForm key={actionData?.stamp} unit={unit} actionData={actionData} submitLabel="Add material" />
        </section>
      )}
    </div>
  );
}
