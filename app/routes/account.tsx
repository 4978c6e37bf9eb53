import * as v from "valibot";
import { data, Form, redirect } from "react-router";
import type { Route } from "./+types/account";
import { createSessionCookie, invalidateUserSessions, requirePermission } from "~/auth.server";
import { Field, FormAlert, SubmitButton } from "~/components/forms";
import { PageHeader } from "~/components/page-header";
import { parseForm } from "~/lib/forms";
import { PASSWORD_MAX, PASSWORD_MIN, PasswordSchema } from "~/lib/password-policy";
import { ROLE_LABELS } from "~/lib/permissions";
import { changePassword } from "~/models/accounts.server";
import { clearFailedSignIns, clientAddress, recordFailedSignIn, signInBlockedFor } from "~/rate-limit.server";

export function headers({ actionHeaders }: Route.HeadersArgs) {
  return actionHeaders;
}

export function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "account:manage");
  const changed = new URL(args.request.url).searchParams.get("password") === "changed";
  return { user: { name: user.name, email: user.email, role: ROLE_LABELS[user.role], shopName: user.shopName }, changed };
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

type Result = { errors: Record<string, string>; message: string | null };

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "account:manage");
  const parsed = parseForm(ChangeSchema, await args.request.formData());
  if (!parsed.ok) return data<Result>({ errors: parsed.errors, message: null }, { status: 400 });

  // Wrong current passwords count as failed sign-ins, so a session left open cannot be used to guess it.
  const address = clientAddress(args.request);
  const waitMs = await signInBlockedFor(user.email, address);
  if (waitMs > 0) {
    const minutes = Math.max(1, Math.ceil(waitMs / 60_000));
    const message = `Too many wrong passwords. Wait ${minutes} minute${minutes === 1 ? "" : "s"} and try again, or sign out and reset your password.`;
    return data<Result>({ errors: {}, message }, { status: 429, headers: { "Retry-After": String(Math.ceil(waitMs / 1000)) } });
  }
  if (!(await changePassword(user.id, parsed.data.current, parsed.data.password))) {
    await recordFailedSignIn(user.email, address);
    return data<Result>({ errors: { current: "That is not your current password." }, message: null }, { status: 400 });
  }
  await clearFailedSignIns(user.email);
  // Every session of the account ends with the old password (ASVS 4.0.3 V3.3.3); this browser gets a new one.
  await invalidateUserSessions(user.id);
  return redirect("/account?password=changed", { headers: { "Set-Cookie": await createSessionCookie(user.id, args.request) } });
}

export default function Account({ loaderData, actionData }: Route.ComponentProps) {
  const { user, changed } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  return (
    <div className="space-y-8">
      <PageHeader eyebrow="You" title="Your account">
        Who you are signed in as, and your password.
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

      <section className="max-w-xl space-y-4 rounded-lg border border-line bg-card p-5" aria-labelledby="password-heading">
        <h2 id="password-heading" className="text-xl font-semibold">
          Change your password
        </h2>
        {changed && <FormAlert tone="ok">Password changed. You are signed out everywhere else; sign in there with the new one.</FormAlert>}
        {actionData?.message && <FormAlert>{actionData.message}</FormAlert>}
        <Form method="post" className="space-y-4" noValidate>
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
