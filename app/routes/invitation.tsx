import * as v from "valibot";
import { data, Form, Link, redirect } from "react-router";
import type { Route } from "./+types/invitation";
import { createSessionCookie, invalidateSession, sessionIdFrom } from "~/auth.server";
import { AuthCard, Field, FormAlert, SubmitButton } from "~/components/forms";
import { parseForm } from "~/lib/forms";
import { PASSWORD_MIN, PasswordSchema, PersonNameSchema } from "~/lib/password-policy";
import { acceptInvitation, EmailTakenError, findOpenInvitation } from "~/models/accounts.server";

export async function loader({ params }: Route.LoaderArgs) {
  const invitation = await findOpenInvitation(params.token);
  return { invitation: invitation && { email: invitation.email, role: invitation.role, shopName: invitation.shopName } };
}

const AcceptSchema = v.pipe(
  v.object({ name: PersonNameSchema, password: PasswordSchema, confirm: v.string() }),
  v.forward(v.check((i) => i.password === i.confirm, "The two passwords differ."), ["confirm"]),
);

export async function action({ request, params }: Route.ActionArgs) {
  const form = await request.formData();
  const name = String(form.get("name") ?? "");
  const parsed = parseForm(AcceptSchema, form);
  if (!parsed.ok) return data({ errors: parsed.errors, name, spent: false }, { status: 400 });
  try {
    const userId = await acceptInvitation(params.token, parsed.data);
    if (!userId) return data({ errors: {} as Record<string, string>, name, spent: true }, { status: 410 });
    const previous = sessionIdFrom(request);
    if (previous) await invalidateSession(previous);
    return redirect("/", { headers: { "Set-Cookie": await createSessionCookie(userId, request) } });
  } catch (error) {
    if (error instanceof EmailTakenError) {
      return data({ errors: { form: "This e-mail address already has a Stopwise account. Sign in with it instead." }, name, spent: false }, { status: 400 });
    }
    throw error;
  }
}

export default function Invitation({ loaderData, actionData }: Route.ComponentProps) {
  const { invitation } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  if (!invitation || actionData?.spent) {
    return (
      <AuthCard title="This invitation no longer works">
        <FormAlert tone="warn">Invitations work once and for seven days. Ask the shop's owner to invite you again.</FormAlert>
        <Link to="/sign-in" className="font-medium text-edge underline">
          Go to sign in
        </Link>
      </AuthCard>
    );
  }
  return (
    <AuthCard title={`Join ${invitation.shopName}`}>
      <p className="text-sm text-muted">
        You are invited as <strong className="text-ink">{invitation.role}</strong> with the address <strong className="text-ink">{invitation.email}</strong>.
      </p>
      {errors.form && <FormAlert>{errors.form}</FormAlert>}
      <Form method="post" className="space-y-4" noValidate>
        <Field label="Your name" name="name" required autoComplete="name" defaultValue={actionData?.name} error={errors.name} autoFocus />
        <Field label="Password" name="password" type="password" required autoComplete="new-password" error={errors.password} hint={`At least ${PASSWORD_MIN} characters.`} />
        <Field label="Password again" name="confirm" type="password" required autoComplete="new-password" error={errors.confirm} />
        <SubmitButton className="w-full" pendingText="Joining…">
          Join the shop
        </SubmitButton>
      </Form>
    </AuthCard>
  );
}
