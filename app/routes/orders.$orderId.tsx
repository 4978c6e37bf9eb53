import * as v from "valibot";
import { data, Form, Link, redirect } from "react-router";
import type { Route } from "./+types/orders.$orderId";
import { hasPermission, requirePermission } from "~/auth.server";
import { DepositPanel } from "~/components/deposit-panel";
import { CustomerPicker } from "~/components/customer-picker";
import { Field, FormAlert, SubmitButton } from "~/components/forms";
import { OrderLineFields } from "~/components/order-line-fields";
import { PageHeader } from "~/components/page-header";
import { StatusBadge } from "~/components/status-badge";
import { formatDate, formatMoment } from "~/lib/dates";
import type { ProgressItem } from "~/lib/line-progress";
import { parseForm } from "~/lib/forms";
import { formatMoney } from "~/lib/money";
import { checkLines, rawLinesFrom } from "~/lib/order-lines";
import { IsoDate, OrderHeaderSchema } from "~/lib/order-schema";
import { linesEditable, nextStatuses, ORDER_STATUSES, STATUS_LABELS } from "~/lib/order-status";
import { can } from "~/lib/permissions";
import { balanceOf, unchargeableDeposit } from "~/lib/deposits";
import { depositLink, sendConfirmation, sendDepositRequest, sendReadyNotice } from "~/models/confirmation.server";
import { DepositError, openDeposit, orderDeposit, orderMoves, proposedDeposit, proposedDepositRefusal, refundDeposit } from "~/models/deposits.server";
import { publicOrigin } from "~/mail.server";
import { paymentErrorMessage, paymentsConfigured } from "~/payments.server";
import { chooseCustomer, searchCustomers } from "~/models/customers.server";
import { readOrderForm, withStoredArtwork } from "~/models/order-input.server";
import { addLines, getOrder, moveOrder, OrderStateError, productChoices, removeLine, repeatOrder, updateHeader, updateLineTexts } from "~/models/orders.server";
import { orderMaterialCost } from "~/models/ledger.server";
import { orderHistory } from "~/models/order-history.server";
import { orderProgress } from "~/models/order-progress.server";
import { getShop } from "~/models/shops.server";
import { deleteStoredFiles } from "~/storage.server";
import { timed } from "~/timing.server";

const Uuid = v.pipe(v.string(), v.uuid());

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "orders:read");
  const order = v.is(Uuid, args.params.orderId) ? await timed("order", () => getOrder(user.shopId, args.params.orderId)) : null;
  if (!order) throw data("No such order in this shop.", { status: 404 });
  const canWrite = can(user.role, "orders:write");
  const seesDeposits = can(user.role, "deposits:read");
  const shopRead = getShop(user.shopId);
  const [shop, products, customers, materialCost, deposit, moves, proposed, history, progress] = await timed("queries", () =>
    Promise.all([
      shopRead,
      canWrite ? productChoices(user.shopId) : [],
      canWrite ? searchCustomers(user.shopId, "") : [],
      can(user.role, "ledger:read") ? orderMaterialCost(user.shopId, order.id) : null,
      seesDeposits ? orderDeposit(user.shopId, order.id) : null,
      seesDeposits ? orderMoves(user.shopId, order.id) : [],
      canWrite && paymentsConfigured() ? proposedDeposit(user.shopId, order.id) : null,
      orderHistory(user.shopId, order.id, { deposits: seesDeposits }),
      shopRead.then((s) => orderProgress(user.shopId, order, s.timeZone)),
    ]),
  );
  const depositView = seesDeposits
    ? {
        deposit: deposit && {
          status: deposit.status,
          amountMinor: deposit.amountMinor,
          requestedAt: deposit.requestedAt.toISOString(),
          paidAt: deposit.paidAt?.toISOString() ?? null,
          refundedAt: deposit.refundedAt?.toISOString() ?? null,
          link: canWrite ? depositLink(publicOrigin(args.request), deposit.linkToken) : null,
        },
        ...balanceOf(order.totalMinor, moves),
        proposedMinor: proposed,
        canRefund: hasPermission(user.role, "deposits:refund"),
      }
    : null;
  // The customer picker gets the first few by name; typing asks /api/customers for the rest.
  return { order, currency: shop.currency, canWrite, products, customers, materialCost, deposits: depositView, history, progress, timeZone: shop.timeZone };
}

const ActionSchema = v.variant("intent", [
  v.object({ intent: v.literal("move"), to: v.picklist(ORDER_STATUSES, "Unknown status."), deposit: v.optional(v.picklist(["yes", "no"])) }),
  v.object({ intent: v.literal("request-deposit") }),
  v.object({ intent: v.literal("refund-deposit") }),
  v.object({ intent: v.literal("resend") }),
  v.object({ intent: v.literal("ready-notice") }),
  v.object({ intent: v.literal("add-lines") }),
  v.object({ intent: v.literal("remove-line"), lineId: Uuid }),
  v.object({ intent: v.literal("header") }),
  v.object({ intent: v.literal("line-texts"), lineId: Uuid, texts: v.optional(v.string(), "") }),
  v.object({ intent: v.literal("repeat"), repeatEventDate: IsoDate("new event's date"), repeatTexts: v.optional(v.picklist(["yes"])) }),
], "Unknown action.");

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "orders:write");
  const orderId = args.params.orderId;
  if (!v.is(Uuid, orderId)) throw data("No such order in this shop.", { status: 404 });
  const { fields, entries } = await readOrderForm(args.request);
  const parsed = parseForm(ActionSchema, fields, ["to", "deposit", "lineId", "repeatTexts"]);
  if (!parsed.ok) return data({ errors: parsed.errors, values: fields, intent: fields.intent }, { status: 400 });
  const input = parsed.data;
  const fail = (message: string, status = 409) => data({ errors: { form: message } as Record<string, string>, values: fields, intent: input.intent }, { status });
  const notFound = () => data("No such order in this shop.", { status: 404 });

  try {
    switch (input.intent) {
      case "move": {
        if (input.to === "confirmed" && input.deposit === "yes" && paymentsConfigured()) {
          // Refused before the order moves, so a deposit the payment service would not take leaves it unconfirmed.
          const unchargeable = await proposedDepositRefusal(user.shopId, orderId);
          if (unchargeable) return fail(`${unchargeable} The order was not confirmed: untick the deposit to confirm it without one.`);
        }
        const before = await moveOrder(user.shopId, orderId, input.to, { by: user.id });
        if (before === null) throw notFound();
        if (input.to === "confirmed") {
          // The deposit is asked before the e-mail goes, so its link is in it.
          if (input.deposit === "yes" && paymentsConfigured()) await openDeposit(user.shopId, orderId);
          await sendConfirmation(user.shopId, orderId, publicOrigin(args.request), { by: user.id });
        }
        break;
      }
      case "resend": {
        const order = await getOrder(user.shopId, orderId);
        if (!order) throw notFound();
        if (order.status === "draft" || order.status === "cancelled") return fail("Only a confirmed order has a confirmation to send.");
        if (order.confirmationSentAt) return fail("The confirmation was already sent.");
        await sendConfirmation(user.shopId, orderId, publicOrigin(args.request), { by: user.id });
        break;
      }
      case "ready-notice": {
        const order = await getOrder(user.shopId, orderId);
        if (!order) throw notFound();
        if (order.status !== "ready") return fail("Only an order marked ready can be announced as ready.");
        const outcome = await sendReadyNotice(user.shopId, order, { by: user.id });
        if (!outcome.sent) return fail(outcome.error);
        return data({ errors: {} as Record<string, string>, values: fields, intent: input.intent, notice: `${order.customerEmail} was told the order is ready.` });
      }
      case "request-deposit": {
        if (!(await getOrder(user.shopId, orderId))) throw notFound();
        if (!paymentsConfigured()) return fail("Payments are not set up on this server.");
        const { again } = await openDeposit(user.shopId, orderId);
        try {
          await sendDepositRequest(user.shopId, orderId, publicOrigin(args.request));
        } catch (e) {
          return fail(`The deposit is asked, but the e-mail could not be sent: ${e instanceof Error ? e.message : String(e)} Copy the link below to the customer instead.`);
        }
        if (again) return data({ errors: {} as Record<string, string>, values: fields, intent: input.intent, notice: "The payment link was e-mailed to the customer again." });
        break;
      }
      case "refund-deposit": {
        requirePermission(args, "deposits:refund");
        if (!(await getOrder(user.shopId, orderId))) throw notFound();
        try {
          await refundDeposit(user.shopId, orderId, user.id);
        } catch (e) {
          if (e instanceof DepositError) throw e;
          return fail(`The payment service did not take the refund: ${paymentErrorMessage(e)}`, 502);
        }
        break;
      }
      case "add-lines": {
        const products = await productChoices(user.shopId);
        const lines = checkLines(rawLinesFrom(entries), new Set(products.map((p) => p.id)));
        if (!lines.ok) return data({ errors: lines.errors, values: fields, intent: input.intent }, { status: 400 });
        if (lines.lines.length === 0) return data({ errors: { "line-0-product": "Choose a product." } as Record<string, string>, values: fields, intent: input.intent }, { status: 400 });
        const found = await withStoredArtwork(lines.lines, (newLines) => addLines(user.shopId, orderId, newLines, { by: user.id }));
        if (!found) throw notFound();
        break;
      }
      case "remove-line": {
        const keys = await removeLine(user.shopId, orderId, input.lineId, { by: user.id });
        if (keys === null) throw notFound();
        await deleteStoredFiles(keys);
        break;
      }
      case "line-texts": {
        const saved = await updateLineTexts(user.shopId, orderId, input.lineId, input.texts, { by: user.id });
        if (saved === null) throw notFound();
        const field = `texts-${input.lineId}`;
        if (!saved.ok) return data({ errors: { [field]: saved.error } as Record<string, string>, values: fields, intent: field }, { status: 400 });
        break;
      }
      case "repeat": {
        const made = await repeatOrder(user.shopId, orderId, { eventDate: input.repeatEventDate, texts: input.repeatTexts === "yes" }, { by: user.id });
        if (!made) throw notFound();
        return redirect(`/orders/${made.id}`);
      }
      case "header": {
        const customer = await chooseCustomer(user.shopId, fields.customerId, fields.customer);
        const header = parseForm(OrderHeaderSchema, { ...fields, customerId: customer.ok ? customer.id : "" });
        if (!header.ok || !customer.ok) {
          const errors: Record<string, string> = { ...(header.ok ? {} : header.errors), ...(customer.ok ? {} : { customerId: customer.message }) };
          return data({ errors, values: fields, intent: input.intent, suggestions: customer.ok ? [] : customer.suggestions }, { status: 400 });
        }
        const current = await getOrder(user.shopId, orderId);
        if (!current) throw notFound();
        const found = await updateHeader(user.shopId, orderId, { ...header.data, dueDate: header.data.dueDate || current.dueDate }, { by: user.id });
        if (!found) throw notFound();
        break;
      }
    }
  } catch (error) {
    if (error instanceof OrderStateError || error instanceof DepositError) return fail(error.message);
    throw error;
  }
  return redirect(`/orders/${orderId}`);
}

const MOVE_LABELS: Partial<Record<string, string>> = {
  confirmed: "Confirm and e-mail the customer",
  in_production: "Start production",
  ready: "Mark ready",
  delivered: "Mark delivered",
  cancelled: "Cancel order",
};

export default function OrderPage({ loaderData, actionData }: Route.ComponentProps) {
  const { order, currency, canWrite, products, customers, materialCost, deposits, history, progress, timeZone } = loaderData;
  const depositRefusal = deposits?.proposedMinor ? unchargeableDeposit(deposits.proposedMinor, currency) : null;
  const errors: Record<string, string> = actionData?.errors ?? {};
  // The customers a refused header form matched: its picker suggests them.
  const refusedCustomer = actionData && "suggestions" in actionData ? (actionData.suggestions as typeof customers) : undefined;
  const editable = canWrite && linesEditable(order.status);
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-start justify-between gap-4">
        <PageHeader eyebrow={`Order · ${order.customerName}`} title={`Order #${order.number}`}>
          Event {formatDate(order.eventDate)} · due {formatDate(order.dueDate)}
        </PageHeader>
        <div className="sm:text-right">
          <StatusBadge status={order.status} />
          <p className="mt-2 text-2xl font-semibold tabular-nums">{formatMoney(order.totalMinor, currency)}</p>
          {materialCost && (
            <p className="text-sm text-muted" data-testid="material-cost">
              Material {formatMoney(materialCost.costMinor, currency)} · margin {formatMoney(order.totalMinor - materialCost.costMinor, currency)}
            </p>
          )}
        </div>
      </div>

      {errors.form && <FormAlert>{errors.form}</FormAlert>}
      {actionData && "notice" in actionData && typeof actionData.notice === "string" && <FormAlert tone="ok">{actionData.notice}</FormAlert>}

      {order.status !== "draft" && order.confirmedAt && (
        <div className="rounded-lg border border-line bg-card p-4" data-testid="confirmation">
          {order.confirmationSentAt ? (
            <p className="text-ok">
              Confirmation e-mailed to {order.customerEmail} on {formatMoment(new Date(order.confirmationSentAt).toISOString(), timeZone)}.
            </p>
          ) : (
            <div className="flex flex-wrap items-center justify-between gap-3">
              <p className="font-medium text-bad">{order.confirmationError ?? "The confirmation e-mail has not gone out yet."}</p>
              {canWrite && (
                <Form method="post" encType="multipart/form-data">
                  <input type="hidden" name="intent" value="resend" />
                  <SubmitButton pendingText="Sending…">Send the confirmation again</SubmitButton>
                </Form>
              )}
            </div>
          )}
        </div>
      )}

      {order.status === "ready" && (
        <div className="flex flex-wrap items-center justify-between gap-3 rounded-lg border border-line bg-card p-4" data-testid="ready-notice">
          <p className={order.readyNoticeSentAt ? "text-ok" : "text-muted"}>
            {order.readyNoticeSentAt
              ? `The customer was told it is ready: e-mailed to ${order.customerEmail} on ${formatMoment(new Date(order.readyNoticeSentAt).toISOString(), timeZone)}.`
              : order.customerEmail
                ? "The customer has not been told it is ready."
                : "The customer has no e-mail address to tell them it is ready."}
          </p>
          {canWrite && order.customerEmail && (
            <Form method="post" encType="multipart/form-data">
              <input type="hidden" name="intent" value="ready-notice" />
              {order.readyNoticeSentAt ? (
                // sent already: a quiet button, like the deposit's "E-mail the link again"
                <button type="submit" className="min-h-11 rounded-md border border-line bg-white px-4 font-medium hover:border-edge">
                  E-mail it again
                </button>
              ) : (
                <SubmitButton pendingText="Sending…">E-mail the customer it is ready</SubmitButton>
              )}
            </Form>
          )}
        </div>
      )}

      {deposits && <DepositPanel view={deposits} order={order} currency={currency} canWrite={canWrite} timeZone={timeZone} />}

      {canWrite && nextStatuses(order.status).length > 0 && (
        <div className="space-y-2">
          {nextStatuses(order.status).includes("confirmed") && deposits?.proposedMinor && depositRefusal ? (
            <p className="text-sm text-muted">{depositRefusal} The order confirms without one; take it another way.</p>
          ) : nextStatuses(order.status).includes("confirmed") && deposits?.proposedMinor ? (
            // Sent with the confirm button's form (the form attribute), shown above the row of buttons.
            <label className="flex min-h-11 items-center gap-2 text-sm">
              <input type="checkbox" name="deposit" value="yes" form="move-confirmed" defaultChecked className="size-5 accent-edge" />
              <span>
                Ask a deposit of <strong className="tabular-nums">{formatMoney(deposits.proposedMinor, currency)}</strong> with a payment link in the e-mail
              </span>
            </label>
          ) : null}
          <div className="flex flex-wrap gap-2">
            {nextStatuses(order.status).map((to) => (
              <Form key={to} id={`move-${to}`} method="post" encType="multipart/form-data">
                <input type="hidden" name="intent" value="move" />
                <input type="hidden" name="to" value={to} />
                <button type="submit" className={to === "cancelled" ? "min-h-11 rounded-md border border-bad/40 px-4 font-medium text-bad hover:bg-bad-soft" : "min-h-11 rounded-md bg-edge px-4 font-semibold text-white hover:bg-edge-dark"}>
                  {MOVE_LABELS[to] ?? STATUS_LABELS[to]}
                </button>
              </Form>
            ))}
          </div>
        </div>
      )}

      <section className="space-y-3">
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h2 className="text-xl font-semibold">Lines</h2>
          {order.lines.length > 0 && order.status !== "draft" && order.status !== "cancelled" && (
            <a href={`/orders/${order.id}/checklist`} className="text-sm font-medium text-edge underline" target="_blank" rel="noreferrer">
              Handover checklist (PDF)
            </a>
          )}
        </div>
        {order.lines.length === 0 && <p className="text-muted">No lines yet.</p>}
        <ul className="space-y-3">
          {order.lines.map((line) => (
            <li key={line.id} className="space-y-2 rounded-lg border border-line bg-card p-4" data-line-id={line.id}>
              <div className="flex flex-wrap items-baseline justify-between gap-2">
                <p className="font-semibold">
                  {line.quantity} × {line.productName}
                </p>
                <p className="tabular-nums text-muted">
                  {formatMoney(line.unitPriceMinor, currency)} each · <span className="font-semibold text-ink">{formatMoney(line.quantity * line.unitPriceMinor, currency)}</span>
                </p>
              </div>
              <LineProgress items={progress[line.id] ?? []} />
              {line.personalisation.length > 0 && (
                <details>
                  <summary className="cursor-pointer text-sm font-medium">
                    {line.personalisation.length} personalisation text{line.personalisation.length === 1 ? "" : "s"}: {line.personalisation.slice(0, 3).join(", ")}
                    {line.personalisation.length > 3 ? ", …" : ""}
                  </summary>
                  <ol className="mt-2 grid list-decimal gap-x-8 pl-6 text-sm sm:grid-cols-2 lg:grid-cols-3">
                    {line.personalisation.map((text, i) => (
                      <li key={i}>{text}</li>
                    ))}
                  </ol>
                </details>
              )}
              {editable && <LineTextsForm line={line} error={errors[`texts-${line.id}`]} typed={actionData?.intent === `texts-${line.id}` ? actionData.values.texts : undefined} />}
              {line.notes && <p className="text-sm text-muted">{line.notes}</p>}
              {line.files.length > 0 && (
                <ul className="flex flex-wrap gap-2 text-sm">
                  {line.files.map((f) => (
                    <li key={f.id}>
                      <a href={`/orders/${order.id}/files/${f.id}`} className="inline-flex items-center gap-1 rounded-md border border-line bg-white px-3 py-1.5 hover:border-edge" download>
                        {f.fileName} <span className="text-muted">({Math.max(1, Math.round(f.sizeBytes / 1024))} KB)</span>
                      </a>
                    </li>
                  ))}
                </ul>
              )}
              {editable && (
                <Form method="post" encType="multipart/form-data">
                  <input type="hidden" name="intent" value="remove-line" />
                  <input type="hidden" name="lineId" value={line.id} />
                  <button type="submit" className="text-sm font-medium text-bad underline">
                    Remove line
                  </button>
                </Form>
              )}
            </li>
          ))}
        </ul>
      </section>

      {editable && (
        <section className="space-y-3">
          <h2 className="text-xl font-semibold">Add a line</h2>
          <Form method="post" encType="multipart/form-data" className="space-y-3" noValidate>
            <input type="hidden" name="intent" value="add-lines" />
            <OrderLineFields index={0} products={products} currency={currency} errors={actionData?.intent === "add-lines" ? errors : {}} values={actionData?.intent === "add-lines" ? actionData.values : undefined} />
            <SubmitButton pendingText="Adding…">Add line</SubmitButton>
          </Form>
        </section>
      )}

      {canWrite && order.status !== "delivered" && order.status !== "cancelled" && (
        <details className="rounded-lg border border-line bg-card p-4" open={actionData?.intent === "header"}>
          <summary className="cursor-pointer font-semibold">Change customer, dates or notes</summary>
          <Form method="post" encType="multipart/form-data" className="mt-4 grid gap-4 md:grid-cols-3" noValidate>
            <input type="hidden" name="intent" value="header" />
            <CustomerPicker
              key={actionData?.intent === "header" ? JSON.stringify(actionData.values.customer) : order.customerId}
              chosen={{ id: order.customerId, name: order.customerName, email: order.customerEmail }}
              text={actionData?.intent === "header" ? actionData.values.customer : undefined}
              suggestions={refusedCustomer?.length ? refusedCustomer : customers}
              error={actionData?.intent === "header" ? errors.customerId : undefined}
              className="md:col-span-3"
            />
            <Field label="Event date" name="eventDate" type="date" defaultValue={order.eventDate} error={errors.eventDate} />
            <Field label="Due date" name="dueDate" type="date" defaultValue={order.dueDate} error={errors.dueDate} />
            <Field label="Notes" name="notes" defaultValue={order.notes} error={errors.notes} />
            <SubmitButton className="md:col-span-3 md:w-fit">Save changes</SubmitButton>
          </Form>
        </details>
      )}

      {canWrite && (
        <details className="rounded-lg border border-line bg-card p-4" open={actionData?.intent === "repeat"}>
          <summary className="cursor-pointer font-semibold">Order again…</summary>
          <Form method="post" encType="multipart/form-data" className="mt-4 grid gap-4 md:grid-cols-3 md:items-end" noValidate>
            <input type="hidden" name="intent" value="repeat" />
            <p className="text-sm text-muted md:col-span-3">
              A new draft for {order.customerName} with these lines at today's prices, due by the products' lead times. Artwork files stay with this order.
            </p>
            <Field label="The new event's date" name="repeatEventDate" type="date" error={actionData?.intent === "repeat" ? errors.repeatEventDate : undefined} defaultValue={actionData?.intent === "repeat" ? String(actionData.values.repeatEventDate ?? "") : ""} />
            <label className="flex min-h-11 items-center gap-2 text-sm">
              <input type="checkbox" name="repeatTexts" value="yes" defaultChecked className="size-5 accent-edge" />
              <span>Copy the personalisation texts</span>
            </label>
            <SubmitButton pendingText="Making the draft…" className="md:w-fit">Make the new draft</SubmitButton>
          </Form>
        </details>
      )}

      <OrderHistory entries={history} timeZone={timeZone} />

      <p>
        <Link to="/orders" className="text-edge underline">
          ← All orders
        </Link>
      </p>
    </div>
  );
}

const PROGRESS_DOTS = { wait: "bg-line", work: "bg-warn", done: "bg-ok" } as const;

/** Where the line's parts are: a batch per material, and parts spoiled and waiting to be cut again. */
function LineProgress({ items }: { items: ProgressItem[] }) {
  if (items.length === 0) return null;
  return (
    <ul className="space-y-1 text-sm" aria-label="Where it is in the shop">
      {items.map((item, i) => (
        <li key={i} className="flex items-baseline gap-2">
          <span aria-hidden className={`inline-block size-2.5 shrink-0 rounded-full ${PROGRESS_DOTS[item.tone]}`} />
          {item.batch ? (
            <Link to={`/batches/${item.batch.id}`} className="underline decoration-line underline-offset-2 hover:decoration-edge">
              {item.text}
            </Link>
          ) : (
            <span>{item.text}</span>
          )}
        </li>
      ))}
    </ul>
  );
}

/** What was done to the order, newest first: who did it and when, on the shop's clock. */
function OrderHistory({ entries, timeZone }: { entries: { id: string; at: string; actor: string | null; text: string }[]; timeZone: string }) {
  if (entries.length === 0) return null;
  return (
    <details className="rounded-lg border border-line bg-card p-4" data-testid="order-history">
      <summary className="cursor-pointer font-semibold">History ({entries.length})</summary>
      <ol className="mt-3 space-y-2">
        {entries
          .slice()
          .reverse()
          .map((e) => (
            <li key={e.id} className="grid gap-x-4 text-sm sm:grid-cols-[11rem_1fr]">
              <time dateTime={e.at} className="tabular-nums text-muted">
                {formatMoment(e.at, timeZone)}
              </time>
              <span>
                {e.text}
                {e.actor && <span className="text-muted"> · {e.actor}</span>}
              </span>
            </li>
          ))}
      </ol>
    </details>
  );
}

/** A misspelt name is put right here; the texts stay one per item, in order. */
function LineTextsForm({ line, error, typed }: { line: { id: string; quantity: number; personalisation: string[] }; error?: string; typed?: unknown }) {
  const id = `texts-${line.id}`;
  return (
    <details open={Boolean(error)}>
      <summary className="cursor-pointer text-sm font-medium text-edge">{line.personalisation.length ? "Correct the texts" : "Add texts"}</summary>
      <Form method="post" encType="multipart/form-data" className="mt-2 space-y-2" noValidate>
        <input type="hidden" name="intent" value="line-texts" />
        <input type="hidden" name="lineId" value={line.id} />
        <label htmlFor={id} className="block text-sm font-medium">
          One text per item, {line.quantity} in all, in order
        </label>
        <textarea
          id={id}
          name="texts"
          rows={Math.min(10, Math.max(3, line.quantity))}
          defaultValue={typeof typed === "string" ? typed : line.personalisation.join("\n")}
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${id}-error` : undefined}
          className={`block w-full rounded-md border bg-white px-3 py-2 text-base ${error ? "border-bad" : "border-line"}`}
        />
        {error && (
          <p id={`${id}-error`} className="text-sm text-bad">
            {error}
          </p>
        )}
        <SubmitButton pendingText="Saving…">Save texts</SubmitButton>
      </Form>
    </details>
  );
}
