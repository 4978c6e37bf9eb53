import * as v from "valibot";
import { data, Form, Link, redirect, useSearchParams } from "react-router";
import type { Route } from "./+types/batches";
import { requirePermission } from "~/auth.server";
import { BatchBadge } from "~/components/batch-badge";
import { Field, FormAlert, SubmitButton } from "~/components/forms";
import { PageHeader } from "~/components/page-header";
import { useRouterClicks } from "~/components/router-clicks";
import { addDays, formatDate, isIsoDate, todayIso } from "~/lib/dates";
import { parseForm } from "~/lib/forms";
import { batchCode, batchesToList } from "~/lib/batches";
import { can } from "~/lib/permissions";
import { countOf } from "~/lib/plural";
import { createBatches, listBatches, listHeldLines, proposalPreviews, releaseHold } from "~/models/batches.server";
import { getShop } from "~/models/shops.server";
import { timed } from "~/timing.server";

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "batches:read");
  const url = new URL(args.request.url);
  const dueByParam = url.searchParams.get("dueBy") ?? "";
  const dueBy = isIsoDate(dueByParam) ? dueByParam : addDays(todayIso(new Date(), (await getShop(user.shopId)).timeZone), 21);
  const canWrite = can(user.role, "batches:write");
  const [all, proposals, held] = await timed("queries", () =>
    Promise.all([listBatches(user.shopId), canWrite ? proposalPreviews(user.shopId, dueBy) : [], canWrite ? listHeldLines(user.shopId) : []]),
  );
  const { shown, olderFinished } = url.searchParams.get("finished") === "all" ? { shown: all, olderFinished: 0 } : batchesToList(all);
  return { batches: shown, olderFinished, proposals, held, dueBy, canWrite };
}

const ActionSchema = v.variant("intent", [
  v.object({ intent: v.literal("create"), dueBy: v.pipe(v.string("Enter a date."), v.check(isIsoDate, "Enter the due-by date as a date, like 2026-12-20.")) }),
  v.object({ intent: v.literal("unhold"), lineId: v.pipe(v.string(), v.uuid()), materialId: v.pipe(v.string(), v.uuid()) }),
], "Unknown action.");

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "batches:write");
  const form = await args.request.formData();
  const parsed = parseForm(ActionSchema, form);
  if (!parsed.ok) {
    // A held line's ids come in hidden fields: a bad one is told above the page, as no field shows it.
    const { dueBy, intent, ...hidden } = parsed.errors;
    const form = intent ?? (Object.keys(hidden).length > 0 ? "The held line in this form was not recognised. Reload the page and try again." : undefined);
    return data({ errors: { ...(dueBy ? { dueBy } : {}), ...(form ? { form } : {}) } }, { status: 400 });
  }
  if (parsed.data.intent === "unhold") {
    if (!(await releaseHold(user.shopId, parsed.data.lineId, parsed.data.materialId))) throw data("No such held line in this shop.", { status: 404 });
    return redirect(`/batches?dueBy=${form.get("dueBy") ?? ""}`);
  }
  const ids = await createBatches(user.shopId, parsed.data.dueBy);
  if (ids.length === 0) return data({ errors: { dueBy: "Nothing confirmed is due by then that is not in a batch already." } }, { status: 400 });
  return redirect(ids.length === 1 ? `/batches/${ids[0]}` : "/batches");
}

export default function Batches({ loaderData, actionData }: Route.ComponentProps) {
  const { batches, olderFinished, proposals, held, dueBy, canWrite } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  const [params] = useSearchParams();
  const routerClicks = useRouterClicks();
  const lineCount = proposals.reduce((n, p) => n + p.lineCount, 0);
  const recutCount = proposals.reduce((n, p) => n + p.recutCount, 0);
  const gathered = [lineCount > 0 && countOf(lineCount, "order line"), recutCount > 0 && `${countOf(recutCount, "spoiled part")} to cut again`].filter(Boolean).join(" and ");
  return (
    <div className="space-y-8">
      <PageHeader eyebrow="Planner" title="Batches">
        What is due, grouped per material and thickness, laid out on panels and sent to the saw.
      </PageHeader>

      {errors.form && <FormAlert>{errors.form}</FormAlert>}
      {canWrite && (
        <section className="space-y-4 rounded-lg border border-line bg-card p-5" aria-labelledby="propose-heading">
          <h2 id="propose-heading" className="text-xl font-semibold">Gather what is due</h2>
          <Form method="get" className="flex flex-wrap items-end gap-3">
            <Field label="Due by" name="dueBy" type="date" defaultValue={dueBy} className="w-48" />
            <button type="submit" className="min-h-11 rounded-md border border-line bg-white px-4 font-medium hover:border-edge">
              Show what is due
            </button>
          </Form>
          {errors.dueBy && <FormAlert>{errors.dueBy}</FormAlert>}
          {proposals.length === 0 ? (
            <p className="text-muted">Every confirmed line due by {formatDate(dueBy)} is already in a batch or held back.</p>
          ) : (
            <>
              <p className="text-muted">
                {gathered} due by {formatDate(dueBy)} would make {countOf(proposals.length, "batch", "batches")}, one per material:
              </p>
              <ul className="grid gap-3 md:grid-cols-2">
                {proposals.map((p) => (
                  <li key={p.materialId} className="rounded-md border border-line bg-white p-4" data-proposal={p.materialName}>
                    <p className="font-semibold">{p.materialName}</p>
                    <p className="text-sm">
                      {p.lineCount} line{p.lineCount === 1 ? "" : "s"}, {p.itemCount} item{p.itemCount === 1 ? "" : "s"}
                      {p.recutCount > 0 ? ` · ${p.recutCount} to cut again` : ""}
                    </p>
                    <ul className="mt-2 space-y-1 text-sm text-muted">
                      {p.lines.map((l) => (
                        <li key={l.lineId}>
                          #{l.orderNumber} {l.customerName}: {l.quantity} × {l.productName} · due {formatDate(l.dueDate)}
                        </li>
                      ))}
                      {p.recuts.map((r) => (
                        <li key={r.id}>
                          To cut again: {r.partName}
                          {r.origin?.text ? ` (${r.origin.text})` : ""} · {r.reason}
                        </li>
                      ))}
                      {p.notListed > 0 && <li className="font-medium">and {p.notListed} more, listed on the batch once it is created</li>}
                    </ul>
                  </li>
                ))}
              </ul>
              <Form method="post">
                <input type="hidden" name="intent" value="create" />
                <input type="hidden" name="dueBy" value={dueBy} />
                <SubmitButton pendingText="Creating…">Create {proposals.length === 1 ? "this batch" : `these ${proposals.length} batches`}</SubmitButton>
              </Form>
            </>
          )}
        </section>
      )}

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">All batches</h2>
        {batches.length === 0 ? (
          <p className="text-muted">No batches yet.</p>
        ) : (
          // Plain anchors, sent through the router by one click handler: a shop in season has hundreds.
          <ul className="divide-y divide-line rounded-lg border border-line bg-card" onClick={routerClicks}>
            {batches.map((b) => (
              <li key={b.id} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
                <a href={`/batches/${b.id}`} className="font-semibold text-edge hover:underline">
                  {batchCode(b.number)}
                </a>
                <span className="min-w-40 grow">{b.materialName}</span>
                <span className="text-sm text-muted">
                  {b.lines} line{b.lines === 1 ? "" : "s"} · {b.plans} plan{b.plans === 1 ? "" : "s"} · due by {formatDate(b.dueBy)}
                </span>
                <BatchBadge status={b.status} />
              </li>
            ))}
          </ul>
        )}
        {olderFinished > 0 && (
          <p className="text-sm text-muted">
            {olderFinished} older cut batch{olderFinished === 1 ? "" : "es"} not listed.{" "}
            <Link to={`/batches?dueBy=${dueBy}&finished=all`} className="text-edge underline">
              List every batch
            </Link>
          </p>
        )}
      </section>

      {held.length > 0 && (
        <section className="space-y-3">
          <h2 className="text-xl font-semibold">Held back</h2>
          <ul className="divide-y divide-line rounded-lg border border-line bg-card">
            {held.map((h) => (
              <li key={`${h.lineId}-${h.materialId}`} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
                <span>
                  #{h.orderNumber}: {h.quantity} × {h.productName} <span className="text-muted">({h.materialName})</span>
                </span>
                <Form method="post">
                  <input type="hidden" name="intent" value="unhold" />
                  <input type="hidden" name="lineId" value={h.lineId} />
                  <input type="hidden" name="materialId" value={h.materialId} />
                  <input type="hidden" name="dueBy" value={params.get("dueBy") ?? ""} />
                  <button type="submit" className="min-h-11 rounded-md border border-line bg-white px-4 text-sm font-medium hover:border-edge">
                    Release the hold
                  </button>
                </Form>
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}
