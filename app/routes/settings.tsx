import { data, Form, useActionData } from "react-router";
import type { Route } from "./+types/settings";
import { hasPermission, requirePermission } from "~/auth.server";
import { Field, FormAlert, SelectField, SubmitButton } from "~/components/forms";
import { PageHeader } from "~/components/page-header";
import { parseForm } from "~/lib/forms";
import { DEPOSIT_RULE_LABELS, DEPOSIT_RULES, depositFormValues, depositRuleSchema, describeRule, type DepositRule } from "~/lib/deposits";
import { CURRENCIES, isCurrency } from "~/lib/money";
import { DISPLAY_UNITS, formatArea, formatSetting, formUnit, SETTINGS_GROUPS, settingsFormValues, settingsSchema, type SettingsValues } from "~/lib/shop-settings";
import { formatErrorRate } from "~/lib/sled";
import { timeZoneChoices } from "~/lib/dates";
import { getShop } from "~/models/shops.server";
import { updateShopSettings } from "~/models/settings.server";
import { paymentsConfigured } from "~/payments.server";

type Settings = SettingsValues & DepositRule;

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "settings:read");
  const shop = await getShop(user.shopId);
  const settings: Settings = shop;
  // The server's list of zones, so the page does not depend on the browser's.
  return { settings, canWrite: hasPermission(user.role, "settings:write"), paymentsReady: paymentsConfigured(), timeZones: timeZoneChoices() };
}

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "settings:write");
  const shop: SettingsValues = await getShop(user.shopId);
  const form = await args.request.formData();
  const parsed = parseForm(settingsSchema(formUnit(form, shop.displayUnit), shop), form);
  // A fixed deposit is read in the currency chosen on the same form.
  const chosenCurrency = String(form.get("currency") ?? "");
  const deposit = parseForm(depositRuleSchema(isCurrency(chosenCurrency) ? chosenCurrency : shop.currency), form);
  const values = Object.fromEntries([...form.keys()].map((k) => [k, String(form.get(k) ?? "")]));
  if (!parsed.ok || !deposit.ok) {
    const errors = { ...(parsed.ok ? {} : parsed.errors), ...(deposit.ok ? {} : deposit.errors) };
    return data({ ok: false as const, errors, values }, { status: 400 });
  }
  await updateShopSettings(user.shopId, { ...parsed.data, ...deposit.data });
  return { ok: true as const, errors: {}, values: null };
}

export default function Settings({ loaderData }: Route.ComponentProps) {
  const { settings, canWrite, paymentsReady, timeZones } = loaderData;
  const actionData = useActionData<typeof action>();
  return (
    <div className="space-y-8">
      <PageHeader eyebrow="Owner" title="Shop settings">
        {canWrite
          ? "Units, money and the limits of the saw and laser that every plan allows for. Type lengths in the shop's unit, or name one (600 mm, 23 5/8\")."
          : "Units, money and the limits of the saw and laser that every plan allows for. Only the owner can change them."}
      </PageHeader>
      {canWrite ? <SettingsForm settings={settings} actionData={actionData} paymentsReady={paymentsReady} timeZones={timeZones} /> : <SettingsReadOnly settings={settings} />}
    </div>
  );
}

type SettingsResult = { ok: boolean; errors: Record<string, string>; values: Record<string, string> | null };

function SettingsForm({ settings, actionData, paymentsReady, timeZones }: { settings: Settings; actionData: SettingsResult | undefined; paymentsReady: boolean; timeZones: string[] }) {
  const errors = actionData?.errors ?? {};
  // A rejected form comes back exactly as typed; otherwise the stored values, formatted.
  const values = actionData?.values ?? { ...settingsFormValues(settings), ...depositFormValues(settings, settings.currency) };
  const unitWord = settings.displayUnit === "mm" ? "millimetres" : "inches";
  return (
    <Form method="post" noValidate className="space-y-6" key={JSON.stringify(values)}>
      {actionData?.ok && <FormAlert tone="ok">Settings saved.</FormAlert>}
      {!actionData?.ok && Object.keys(errors).length > 0 && <FormAlert>Nothing was saved: correct the fields marked below.</FormAlert>}

      <section className="grid gap-4 rounded-lg border border-line bg-card p-5 md:grid-cols-2">
        <h2 className="text-lg font-semibold md:col-span-2">Units and money</h2>
        <SelectField label="Lengths are shown in" name="displayUnit" defaultValue={values.displayUnit} error={errors.displayUnit}>
          {DISPLAY_UNITS.map((u) => (
            <option key={u.value} value={u.value}>
              {u.label}
            </option>
          ))}
        </SelectField>
        <SelectField label="Currency" name="currency" defaultValue={values.currency} error={errors.currency}>
          {Object.keys(CURRENCIES).map((c) => (
            <option key={c} value={c}>
              {c}
            </option>
          ))}
        </SelectField>
        <SelectField label="Time zone" name="timeZone" defaultValue={values.timeZone} error={errors.timeZone}>
          {timeZones.map((z) => (
            <option key={z} value={z}>
              {z.replaceAll("_", " ")}
            </option>
          ))}
        </SelectField>
        <p className="self-end text-sm text-muted">Which day is today for due dates, the calendar and the ledger's months, and the times shown.</p>
        <p className="text-sm text-muted md:col-span-2">A bare number below is read in the unit chosen here ({unitWord} now).</p>
      </section>

      {SETTINGS_GROUPS.map((group) => (
        <section key={group.title} className="grid gap-4 rounded-lg border border-line bg-card p-5 md:grid-cols-2">
          <div className="md:col-span-2">
            <h2 className="text-lg font-semibold">{group.title}</h2>
            <p className="text-sm text-muted">{group.about}</p>
          </div>
          {group.lengths.map((f) => (
            <Field key={f.key} label={f.label} name={f.key} defaultValue={values[f.key]} error={errors[f.key]} hint={f.hint || undefined} inputMode="decimal" autoComplete="off" />
          ))}
          {group.sledTolerance && (
            <Field
              label="Squareness tolerance"
              name="sledToleranceUmPerM"
              defaultValue={values.sledToleranceUmPerM}
              error={errors.sledToleranceUmPerM}
              hint={settings.displayUnit === "mm" ? "Error allowed per metre of cut, in mm/m (or in/ft)." : "Error allowed per foot of cut, in in/ft (or mm/m)."}
              inputMode="decimal"
              autoComplete="off"
            />
          )}
          {group.area && (
            <Field
              label="Area at least"
              name="minOffcutAreaMm2"
              defaultValue={values.minOffcutAreaMm2}
              error={errors.minOffcutAreaMm2}
              hint={settings.displayUnit === "mm" ? "In mm² (or cm², m²)." : "In in² (or mm², cm²)."}
              inputMode="decimal"
              autoComplete="off"
            />
          )}
        </section>
      ))}
      <section className="grid gap-4 rounded-lg border border-line bg-card p-5 md:grid-cols-2" aria-labelledby="deposit-heading">
        <div className="md:col-span-2">
          <h2 id="deposit-heading" className="text-lg font-semibold">
            Deposits
          </h2>
          <p className="text-sm text-muted">
            Asked when an order is confirmed: the confirmation e-mail carries a payment link, and the order shows what was paid and the balance due.
          </p>
        </div>
        <SelectField label="Deposit on confirmation" name="depositRule" defaultValue={values.depositRule} error={errors.depositRule} className="md:col-span-2">
          {DEPOSIT_RULES.map((r) => (
            <option key={r} value={r}>
              {DEPOSIT_RULE_LABELS[r]}
            </option>
          ))}
        </SelectField>
        <Field label="Percentage of the order total" name="depositPercent" defaultValue={values.depositPercent} error={errors.depositPercent} hint="A whole number from 1 to 100, rounded to the nearest minor unit." inputMode="numeric" autoComplete="off" />
        <Field label="Fixed amount" name="depositFixedMinor" defaultValue={values.depositFixedMinor} error={errors.depositFixedMinor} hint="In the shop's currency; never more than the order total." inputMode="decimal" autoComplete="off" />
        {!paymentsReady && (
          <p className="text-sm font-medium text-warn md:col-span-2">Payments are not set up on this server (STRIPE_SECRET_KEY and STRIPE_WEBHOOK_SECRET), so no payment link can be sent yet.</p>
        )}
      </section>
      <SubmitButton pendingText="Saving…">Save settings</SubmitButton>
    </Form>
  );
}

function SettingsReadOnly({ settings }: { settings: Settings }) {
  const unit = DISPLAY_UNITS.find((u) => u.value === settings.displayUnit)?.label ?? settings.displayUnit;
  return (
    <div className="space-y-6" data-testid="settings-read-only">
      <FormAlert tone="warn">Read only: these are set by the shop's owner.</FormAlert>
      <ReadOnlyGroup title="Units and money" rows={[["Lengths are shown in", unit], ["Currency", settings.currency], ["Time zone", settings.timeZone.replaceAll("_", " ")], ["Deposit on confirmation", describeRule(settings, settings.currency)]]} />
      {SETTINGS_GROUPS.map((group) => (
        <ReadOnlyGroup
          key={group.title}
          title={group.title}
          rows={[
            ...group.lengths.map((f): [string, string] => [f.label, formatSetting(settings, f.key)]),
            ...(group.area ? [["Area at least", formatArea(settings.minOffcutAreaMm2, settings.displayUnit)] as [string, string]] : []),
            ...(group.sledTolerance ? [["Squareness tolerance", formatErrorRate(settings.sledToleranceUmPerM, settings.displayUnit)] as [string, string]] : []),
          ]}
        />
      ))}
    </div>
  );
}

function ReadOnlyGroup({ title, rows }: { title: string; rows: [string, string][] }) {
  return (
    <section className="rounded-lg border border-line bg-card p-5">
      <h2 className="mb-3 text-lg font-semibold">{title}</h2>
      <dl className="grid gap-x-6 gap-y-3 sm:grid-cols-2">
        {rows.map(([label, value]) => (
          <div key={label}>
            <dt className="text-sm text-muted">{label}</dt>
            <dd className="font-medium tabular-nums">{value}</dd>
          </div>
        ))}
      </dl>
    </section>
  );
}
