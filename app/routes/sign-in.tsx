import * as v from "valibot";
import { data, Form, Link, redirect, useSearchParams } from "react-router";
import type { Route } from "./+types/sign-in";
import { createSessionCookie, currentUser, invalidateSession, safeRedirect, sessionIdFrom } from "~/auth.server";
import { AuthCard, Field, FormAlert, SubmitButton } from "~/components/forms";
import { parseForm } from "~/lib/forms";
import { EmailSchema } from "~/lib/password-policy";
import { checkCredentials } from "~/models/accounts.server";
import { blockedWait, clearFailedSignIns, clientAddress, recordFailedSignIn, signInBlockedFor } from "~/rate-limit.server";

// Passes the action's Retry-After on to the document response.
export function headers({ actionHeaders }: Route.HeadersArgs) {
  return actionHeaders;
}

export function loader(args: Route.LoaderArgs) {
  if (currentUser(args)) throw redirect(safeRedirect(new URL(args.request.url).searchParams.get("redirectTo")));
  return null;
}

const SignInSchema = v.object({
  email: EmailSchema,
  password: v.pipe(v.string("Enter your password."), v.nonEmpty("Enter your password."), v.maxLength(128, "Passwords are at most 128 characters.")),
  redirectTo: v.optional(v.string()),
});

const WRONG = "That e-mail and password do not match an account. Check both, or reset your password.";

export async function action({ request }: Route.ActionArgs) {
  const form = await request.formData();
  const email = String(form.get("email") ?? "");
  const parsed = parseForm(SignInSchema, form);
  if (!parsed.ok) return data({ errors: parsed.errors, email, message: null }, { status: 400 });

  const { password, redirectTo } = parsed.data;
  const address = clientAddress(request);
  const waitMs = await signInBlockedFor(parsed.data.email, address);
  if (waitMs > 0) {
    const { wait, headers } = blockedWait(waitMs);
    const message = `Too many sign-in attempts. Wait ${wait} and try again, or reset your password.`;
    return data({ errors: {}, email, message }, { status: 429, headers });
  }

  const userId = await checkCredentials(parsed.data.email, password);
  if (!userId) {
    await recordFailedSignIn(parsed.data.email, address);
    return data({ errors: {}, email, message: WRONG }, { status: 400 });
  }
  await clearFailedSignIns(parsed.data.email);

  // A fresh session on every sign-in; any session the browser carried is ended (no fixation, ASVS V3.2.1).
  const previous = sessionIdFrom(request);
  if (previous) await invalidateSession(previous);
  return redirect(safeRedirect(redirectTo), { headers: { "Set-Cookie": await createSessionCookie(userId, request) } });
}

export default function SignIn({ actionData }: Route.ComponentProps) {
  const [params] = useSearchParams();
  const errors: Record<string, string> = actionData?.errors ?? {};
  return (
    <AuthCard
      title="Sign in"
      footer={
        <>
          New shop? <Link to="/sign-up" className="font-medium text-edge underline">Create one</Link>
        </>
      }
    >
      {actionData?.message && <FormAlert>{actionData.message}</FormAlert>}
      <Form method="post" className="space-y-4" noValidate>
        <input type="hidden" name="redirectTo" value={params.get("redirectTo") ?? "/"} />
        <Field label="E-mail" name="email" type="email" autoComplete="username" required defaultValue={actionData?.email} error={errors.email} autoFocus />
        <Field label="Password" name="password" type="password" autoComplete="current-password" required error={errors.password} />
        <SubmitButton className="w-full" pendingText="Signing in…">
          Sign in
        </SubmitButton>
      </Form>
      <p className="text-sm">
        <Link to="/forgot-password" className="text-edge underline">
          Forgot your password?
        </Link>
      </p>
    </AuthCard>
  );
}
