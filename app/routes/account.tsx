import * as v from "valibot";
import { data, Form, redirect } from "react-router";
import type { Route } from "./+types/account";
import { createSessionCookie, invalidateUserSessions, requirePermission } from "~/auth.server";
import { Field, FormAlert, SubmitButton } from "~/components/forms";
import { PageHeader } from "~/components/page-header";
import { parseForm } from "~/lib/forms";
import { PASSWORD_MAX, PASSWORD_MIN, PasswordSchema, PersonNameSchema } from "~/lib/password-policy";
import { ROLE_LABELS } from "~/lib/permissions";
import { changePassword, renameUser } from "~/models/accounts.server";
import { blockedWait, clearFailedSignIns, clientAddress, recordFailedSignIn, signInBlockedFor } from "~/rate-limit.server";

export function headers({ actionHeaders }: Route.HeadersArgs) {
  return actionHeaders;
}

export function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "account:manage");
  const params = new URL(args.request.url).searchParams;
  return { user: { name: user.name, email: user.email, role: ROLE_LABELS[user.role], shopName: user.shopName }, changed: params.get("password") === "changed", renamed: params.get("name") === "saved" };
}

const ChangeSchema = v.pipe(
  v.object({
    current: v.pipe(v.string("Enter your current password."), v.nonEmpty("Enter your current password."), v.maxLength(PASSWORD_MAX, `Passwords are at most ${PASSWORD_MAX} characters.`)),
    password: PasswordSchema,
    confirm: v.string(),
  }),
  v.forward(v.check((i) => i.password !== i.current, "Choose a password other than the one you have now."), ["password"]),
  v.forward(v.check((i) => i.password === i.confirm, "The two new passwords differ."), ["confirm"]),
);

const RenameSchema = v.object({ name: PersonNameSchema });

type Result = { errors: Record<string, string>; message: string | null; intent: "name" | "password" };

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "account:manage");
  const form = await args.request.formData();
  if (form.get("intent") === "name") {
    const named = parseForm(RenameSchema, form);
    if (!named.ok) return data<Result>({ errors: named.errors, message: null, intent: "name" }, { status: 400 });
    await renameUser(user.id, named.data.name);
    return redirect("/account?name=saved");
  }
  if (form.get("intent") !== "password") return data<Result>({ errors: {}, message: "Unknown action.", intent: "password" }, { status: 400 });
  const parsed = parseForm(ChangeSchema, form);
  if (!parsed.ok) return data<Result>({ errors: parsed.errors, message: null, intent: "password" }, { status: 400 });

  // Wrong current passwords count as failed sign-ins, so a session left open cannot be used to guess it.
  const address = clientAddress(args.request);
  const waitMs = await signInBlockedFor(user.email, address);
  if (waitMs > 0) {
    const { wait, headers } = blockedWait(waitMs);
    const message = `Too many wrong passwords. Wait ${wait} and try again, or sign out and reset your password.`;
    return data<Result>({ errors: {}, message, intent: "password" }, { status: 429, headers });
  }
  if (!(await changePassword(user.id, parsed.data.current, parsed.data.password))) {
    await recordFailedSignIn(user.email, address);
    return data<Result>({ errors: { current: "That is not your current password." }, message: null, intent: "password" }, { status: 400 });
  }
  await clearFailedSignIns(user.email);
  // Every session of the account ends with the old password (ASVS 4.0.3 V3.3.3); this browser gets a new one.
  await invalidateUserSessions(user.id);
  return redirect("/account?password=changed", { headers: { "Set-Cookie": await createSessionCookie(user.id, args.request) } });
}

export default function Account({ loaderData, actionData }: Route.ComponentProps) {
  const { user, changed, renamed } = loaderData;
  const errors: Record<string, string> = actionData?.intent === "password" ? actionData.errors : {};
  const nameErrors: Record<string, string> = actionData?.intent === "name" ? actionData.errors : {};
  return (
    <div className="space-y-8">
      <PageHeader eyebrow="You" title="Your account">
        Who you are signed in as, the name the shop sees, and your password.
      </PageHeader>

      <section className="space-y-3 rounded-lg border border-line bg-card p-5">
        <dl className="grid gap-x-8 gap-y-3 sm:grid-cols-2">
          {[
            ["Name", user.name],
            ["E-mail", user.email],
            ["Role", user.role],
            ["Shop", user.shopName],
          ].map(([label, value]) => (
            <div key={label}>
              <dt className="text-sm text-muted">{label}</dt>
              <dd className="font-medium break-words">{value}</dd>
            </div>
          ))}
        </dl>
        <p className="text-sm text-muted">Your role is the shop owner's to change, on the Team page.</p>
      </section>

      <section className="max-w-xl space-y-4 rounded-lg border border-line bg-card p-5" aria-labelledby="name-heading">
        <h2 id="name-heading" className="text-xl font-semibold">
          Your name
        </h2>
        {renamed && <FormAlert tone="ok">Name saved.</FormAlert>}
        <Form method="post" className="space-y-4" noValidate>
          <input type="hidden" name="intent" value="name" />
          <Field label="Name" name="name" required autoComplete="name" defaultValue={user.name} error={nameErrors.name} hint="As the team page and the order histories show it." />
          <SubmitButton pendingText="Saving…">Save name</SubmitButton>
        </Form>
      </section>

      <section className="max-w-xl space-y-4 rounded-lg border border-line bg-card p-5" aria-labelledby="password-heading">
        <h2 id="password-heading" className="text-xl font-semibold">
          Change your password
        </h2>
        {changed && <FormAlert tone="ok">Password changed. You are signed out everywhere else; sign in there with the new one.</FormAlert>}
        {actionData?.message && <FormAlert>{actionData.message}</FormAlert>}
        <Form method="post" className="space-y-4" noValidate>
          <input type="hidden" name="intent" value="password" />
          <Field label="Current password" name="current" type="password" required autoComplete="current-password" error={errors.current} />
          <Field label="New password" name="password" type="password" required autoComplete="new-password" error={errors.password} hint={`At least ${PASSWORD_MIN} characters; a few words together are easy to remember.`} />
          <Field label="New password again" name="confirm" type="password" required autoComplete="new-password" error={errors.confirm} />
          <SubmitButton pendingText="Saving…">Change password</SubmitButton>
        </Form>
        <p className="text-sm text-muted">Changing it signs you out on every other device and browser.</p>
      </section>
    </div>
  );
}
