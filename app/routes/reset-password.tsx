import * as v from "valibot";
import { data, Form, Link, redirect } from "react-router";
import type { Route } from "./+types/reset-password";
import { createSessionCookie, invalidateUserSessions } from "~/auth.server";
import { AuthCard, Field, FormAlert, SubmitButton } from "~/components/forms";
import { parseForm } from "~/lib/forms";
import { PASSWORD_MIN, PasswordSchema } from "~/lib/password-policy";
import { isOpenPasswordReset, resetPassword } from "~/models/accounts.server";

export async function loader({ params }: Route.LoaderArgs) {
  return { valid: await isOpenPasswordReset(params.token) };
}

const ResetSchema = v.pipe(
  v.object({ password: PasswordSchema, confirm: v.string() }),
  v.forward(v.check((i) => i.password === i.confirm, "The two passwords differ."), ["confirm"]),
);

export async function action({ request, params }: Route.ActionArgs) {
  const parsed = parseForm(ResetSchema, await request.formData());
  if (!parsed.ok) return data({ errors: parsed.errors, spent: false }, { status: 400 });
  const userId = await resetPassword(params.token, parsed.data.password);
  if (!userId) return data({ errors: {} as Record<string, string>, spent: true }, { status: 410 });
  // Every other session of the account ends with the old password (ASVS 4.0.3 V3.3.3 / 5.0 V7.4.3).
  await invalidateUserSessions(userId);
  return redirect("/", { headers: { "Set-Cookie": await createSessionCookie(userId, request) } });
}

export default function ResetPassword({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  if (!loaderData.valid || actionData?.spent) {
    return (
      <AuthCard title="This link no longer works">
        <FormAlert tone="warn">Reset links work once and for one hour. Ask for a new one.</FormAlert>
        <Link to="/forgot-password" className="font-medium text-edge underline">
          Send me a new link
        </Link>
      </AuthCard>
    );
  }
  return (
    <AuthCard title="Choose a new password">
      <Form method="post" className="space-y-4" noValidate>
        <Field label="New password" name="password" type="password" required autoComplete="new-password" error={errors.password} hint={`At least ${PASSWORD_MIN} characters.`} autoFocus />
        <Field label="New password again" name="confirm" type="password" required autoComplete="new-password" error={errors.confirm} />
        <SubmitButton className="w-full" pendingText="Saving…">
          Save and sign in
        </SubmitButton>
      </Form>
    </AuthCard>
  );
}
