// Loader and action of the product editor, shared by /catalogue/products/new and /catalogue/products/:id.
import * as v from "valibot";
import { formatDay } from "~/lib/dates";
import { data, redirect, type RouterContextProvider } from "react-router";
import { hasPermission, requirePermission } from "~/auth.server";
import { parsePartsJson, productSchema, validatePartRows, type PartContext, type PartRow, type ProductResult, type ProductValues, type RowErrors } from "~/lib/catalogue";
import { parseForm } from "~/lib/forms";
import { lengthInputValue } from "~/lib/length-fields";
import { moneyInputValue } from "~/lib/money";
import { deleteProduct, getProduct, MaterialGoneError, materialOptions, ProductInUseError, productNameTaken, productUse, saveProduct, setProductRetired } from "./catalogue.server";
import { getShop } from "./shops.server";

type Args = { request: Request; context: Readonly<RouterContextProvider>; params: { productId?: string } };

async function findProduct(shopId: string, productId: string | undefined) {
  if (productId === undefined) return null;
  // Anything that is not a uuid, like another shop's id, is simply not found here.
  const product = v.is(v.pipe(v.string(), v.uuid()), productId) ? await getProduct(shopId, productId) : null;
  if (!product) throw data("No such product in this shop.", { status: 404 });
  return product;
}

async function editorContext(shopId: string) {
  const [shop, materials] = await Promise.all([getShop(shopId), materialOptions(shopId)]);
  return { shop, materials };
}

function partContext(ctx: Awaited<ReturnType<typeof editorContext>>, product: Awaited<ReturnType<typeof findProduct>>): PartContext {
  return {
    unit: ctx.shop.displayUnit,
    materialIds: ctx.materials.map((m) => m.id),
    laserBed: { lengthUm: ctx.shop.laserBedLengthUm, widthUm: ctx.shop.laserBedWidthUm },
    previous: Object.fromEntries((product?.parts ?? []).map((p) => [p.id, { lengthUm: p.lengthUm, widthUm: p.widthUm }])),
  };
}

export async function productEditorLoader(args: Args) {
  const user = requirePermission(args, args.params.productId === undefined ? "catalogue:write" : "catalogue:read");
  const product = await findProduct(user.shopId, args.params.productId);
  const [ctx, use] = await Promise.all([editorContext(user.shopId), product ? productUse(user.shopId, product.id) : null]);
  const unit = ctx.shop.displayUnit;
  const values: ProductValues | null = product && {
    name: product.name,
    price: moneyInputValue(product.priceMinor, ctx.shop.currency),
    leadTime: product.leadTimeDays === null ? "" : String(product.leadTimeDays),
    parts: product.parts.map((p) => ({
      key: p.id,
      id: p.id,
      name: p.name,
      length: lengthInputValue(p.lengthUm, unit),
      width: lengthInputValue(p.widthUm, unit),
      materialId: p.materialId,
      quantity: p.quantity,
      grainLocked: p.grainLocked,
      process: p.process,
    })),
  };
  return {
    productId: product?.id ?? null,
    values,
    currency: ctx.shop.currency,
    materials: ctx.materials,
    parts: partContext(ctx, product),
    retiredOn: product?.retiredAt ? formatDay(product.retiredAt.toISOString(), ctx.shop.timeZone) : null,
    use,
    canWrite: hasPermission(user.role, "catalogue:write"),
  };
}

/** Retire, bring back or delete: the product's life, apart from its contents. */
async function lifeAction(shopId: string, product: NonNullable<Awaited<ReturnType<typeof findProduct>>>, intent: "retire" | "restore" | "delete-product") {
  const stamp = crypto.randomUUID();
  if (intent === "delete-product") {
    try {
      if (!(await deleteProduct(shopId, product.id))) throw data("No such product in this shop.", { status: 404 });
    } catch (error) {
      if (!(error instanceof ProductInUseError)) throw error;
      return data<ProductResult>({ ok: false, notice: null, errors: { form: `${product.name} was not deleted. ${error.message}` }, rowErrors: {}, values: null, stamp }, { status: 409 });
    }
    return redirect(`/catalogue?deleted=${encodeURIComponent(product.name)}`);
  }
  if (!(await setProductRetired(shopId, product.id, intent === "retire"))) throw data("No such product in this shop.", { status: 404 });
  const notice = intent === "retire" ? `${product.name} is retired: new orders no longer offer it.` : `${product.name} is offered on new orders again.`;
  return { ok: true, notice, errors: {}, rowErrors: {}, values: null, stamp } satisfies ProductResult;
}

const LIFE_INTENTS = ["retire", "restore", "delete-product"] as const;

export async function productEditorAction(args: Args) {
  const user = requirePermission(args, "catalogue:write");
  const product = await findProduct(user.shopId, args.params.productId);
  const form = await args.request.formData();
  const intent = LIFE_INTENTS.find((i) => i === form.get("intent"));
  if (intent) {
    if (!product) return data<ProductResult>({ ok: false, notice: null, errors: { form: "There is no product to retire or delete yet: save it first." }, rowErrors: {}, values: null, stamp: crypto.randomUUID() }, { status: 400 });
    return lifeAction(user.shopId, product, intent);
  }
  const ctx = await editorContext(user.shopId);
  const rawParts = parsePartsJson(form.get("parts"));
  const values: ProductValues = {
    name: String(form.get("name") ?? ""),
    price: String(form.get("price") ?? ""),
    leadTime: String(form.get("leadTime") ?? ""),
    parts: Array.isArray(rawParts) ? (rawParts as PartRow[]) : [],
  };
  const reject = (status: number, errors: Record<string, string>, rowErrors: RowErrors = {}) =>
    data<ProductResult>({ ok: false, notice: null, errors, rowErrors, values, stamp: crypto.randomUUID() }, { status });

  const fields = parseForm(productSchema(ctx.shop.currency), { name: values.name, price: values.price, leadTime: values.leadTime });
  const parts = validatePartRows(rawParts, partContext(ctx, product));
  const errors: Record<string, string> = fields.ok ? {} : { ...fields.errors };
  if (fields.ok && (await productNameTaken(user.shopId, fields.data.name, product?.id ?? null))) errors.name = "Another product already has this name.";
  if (!parts.ok && parts.formError) errors.parts = parts.formError;
  if (!parts.ok && Object.keys(parts.rowErrors).length) errors.parts ??= "Some parts need correcting: see the cells marked in red.";
  if (!fields.ok || !parts.ok || Object.keys(errors).length) return reject(400, { form: "Nothing was saved: correct what is marked.", ...errors }, parts.ok ? {} : parts.rowErrors);

  let savedId: string | null;
  try {
    savedId = await saveProduct(
      user.shopId,
      product?.id ?? null,
      { name: fields.data.name, priceMinor: fields.data.price, leadTimeDays: fields.data.leadTime },
      parts.parts,
    );
  } catch (error) {
    if (error instanceof MaterialGoneError) return reject(409, { form: error.message });
    throw error;
  }
  if (!savedId) throw data("No such product in this shop.", { status: 404 });
  if (!product) return redirect(`/catalogue/products/${savedId}?created=1`);
  return { ok: true, notice: `${fields.data.name} saved.`, errors: {}, rowErrors: {}, values: null, stamp: crypto.randomUUID() } satisfies ProductResult;
}
