import * as v from "valibot";
import { data, Form, Link, redirect } from "react-router";
import type { Route } from "./+types/sign-up";
import { createSessionCookie, currentUser } from "~/auth.server";
import { AuthCard, Field, FormAlert, SubmitButton } from "~/components/forms";
import { parseForm } from "~/lib/forms";
import { EmailSchema, PASSWORD_MIN, PasswordSchema, PersonNameSchema } from "~/lib/password-policy";
import { createShopWithOwner, EmailTakenError } from "~/models/accounts.server";

export function loader(args: Route.LoaderArgs) {
  if (currentUser(args)) throw redirect("/");
  return null;
}

const SignUpSchema = v.pipe(
  v.object({
    shopName: v.pipe(v.string("Enter the shop's name."), v.trim(), v.nonEmpty("Enter the shop's name."), v.maxLength(120, "Use at most 120 characters.")),
    name: PersonNameSchema,
    email: EmailSchema,
    password: PasswordSchema,
    confirm: v.string(),
  }),
  v.forward(
    v.check((input) => input.password === input.confirm, "The two passwords differ."),
    ["confirm"],
  ),
);

export async function action({ request }: Route.ActionArgs) {
  const form = await request.formData();
  const values = { shopName: String(form.get("shopName") ?? ""), name: String(form.get("name") ?? ""), email: String(form.get("email") ?? "") };
  const parsed = parseForm(SignUpSchema, form);
  if (!parsed.ok) return data({ errors: parsed.errors, values }, { status: 400 });
  try {
    const { userId } = await createShopWithOwner(parsed.data);
    return redirect("/", { headers: { "Set-Cookie": await createSessionCookie(userId, request) } });
  } catch (error) {
    if (error instanceof EmailTakenError) {
      return data({ errors: { email: "An account with this e-mail already exists. Sign in, or reset its password." }, values }, { status: 400 });
    }
    throw error;
  }
}

export default function SignUp({ actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  const values = actionData?.values;
  return (
    <AuthCard
      title="Create your shop"
      footer={
        <>
          Already using Stopwise? <Link to="/sign-in" className="font-medium text-edge underline">Sign in</Link>
        </>
      }
    >
      {Object.keys(errors).length > 0 && <FormAlert>Some fields need another look.</FormAlert>}
      <Form method="post" className="space-y-4" noValidate>
        <Field label="Shop name" name="shopName" required defaultValue={values?.shopName} error={errors.shopName} autoComplete="organization" />
        <Field label="Your name" name="name" required defaultValue={values?.name} error={errors.name} autoComplete="name" />
        <Field label="E-mail" name="email" type="email" required defaultValue={values?.email} error={errors.email} autoComplete="email" />
        <Field
          label="Password"
          name="password"
          type="password"
          required
          autoComplete="new-password"
          error={errors.password}
          hint={`At least ${PASSWORD_MIN} characters. A few unrelated words work well.`}
        />
        <Field label="Password again" name="confirm" type="password" required autoComplete="new-password" error={errors.confirm} />
        <SubmitButton className="w-full" pendingText="Creating…">
          Create shop
        </SubmitButton>
      </Form>
    </AuthCard>
  );
}
