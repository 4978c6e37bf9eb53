import * as v from "valibot";
import { data, Form, Link } from "react-router";
import type { Route } from "./+types/forgot-password";
import { AuthCard, Field, FormAlert, SubmitButton } from "~/components/forms";
import { passwordResetEmail } from "~/lib/emails";
import { parseForm } from "~/lib/forms";
import { EmailSchema } from "~/lib/password-policy";
import { publicOrigin, sendMail } from "~/mail.server";
import { createPasswordReset } from "~/models/accounts.server";

const ForgotSchema = v.object({ email: EmailSchema });

export async function action({ request }: Route.ActionArgs) {
  const form = await request.formData();
  const parsed = parseForm(ForgotSchema, form);
  if (!parsed.ok) return data({ errors: parsed.errors, sent: false }, { status: 400 });
  const reset = await createPasswordReset(parsed.data.email);
  if (reset) {
    const link = `${publicOrigin(request)}/reset-password/${reset.token}`;
    await sendMail({ to: reset.email, ...passwordResetEmail({ name: reset.name, link }) });
  }
  // The same answer whether or not the account exists.
  return { errors: {} as Record<string, string>, sent: true };
}

export default function ForgotPassword({ actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  return (
    <AuthCard title="Reset your password" footer={<Link to="/sign-in" className="text-edge underline">Back to sign in</Link>}>
      {actionData?.sent ? (
        <FormAlert tone="ok">If an account uses that address, a link to choose a new password is on its way. It works for one hour.</FormAlert>
      ) : (
        <Form method="post" className="space-y-4" noValidate>
          <p className="text-sm text-muted">Enter the e-mail address you sign in with. We will send a link to choose a new password.</p>
          <Field label="E-mail" name="email" type="email" required autoComplete="email" error={errors.email} autoFocus />
          <SubmitButton className="w-full" pendingText="Sending…">
            Send the link
          </SubmitButton>
        </Form>
      )}
    </AuthCard>
  );
}
