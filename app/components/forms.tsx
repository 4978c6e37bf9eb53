import type { InputHTMLAttributes, ReactNode, SelectHTMLAttributes } from "react";
import { useNavigation } from "react-router";
import { Wordmark } from "./wordmark";

type FieldProps = InputHTMLAttributes<HTMLInputElement> & { label: string; name: string; error?: string; hint?: ReactNode };

/** A labelled input with its error beside it, wired for screen readers. */
export function Field({ label, name, error, hint, id, className = "", ...input }: FieldProps) {
  const fieldId = id ?? `field-${name}`;
  const describedBy = [error ? `${fieldId}-error` : null, hint ? `${fieldId}-hint` : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className={`space-y-1 ${className}`}>
      <label htmlFor={fieldId} className="block text-sm font-medium">
        {label}
      </label>
      <input
        id={fieldId}
        name={name}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={`block w-full rounded-md border bg-white px-3 py-2.5 text-base outline-none focus:border-edge focus:ring-2 focus:ring-edge/30 ${
          error ? "border-bad" : "border-line"
        }`}
        {...input}
      />
      {hint && (
        <p id={`${fieldId}-hint`} className="text-sm text-muted">
          {hint}
        </p>
      )}
      {error && (
        <p id={`${fieldId}-error`} className="text-sm font-medium text-bad">
          {error}
        </p>
      )}
    </div>
  );
}

type SelectProps = SelectHTMLAttributes<HTMLSelectElement> & { label: string; name: string; error?: string; children: ReactNode };

export function SelectField({ label, name, error, id, children, className = "", ...select }: SelectProps) {
  const fieldId = id ?? `field-${name}`;
  return (
    <div className={`space-y-1 ${className}`}>
      <label htmlFor={fieldId} className="block text-sm font-medium">
        {label}
      </label>
      <select
        id={fieldId}
        name={name}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${fieldId}-error` : undefined}
        className={`block w-full rounded-md border bg-white px-3 py-2.5 text-base ${error ? "border-bad" : "border-line"}`}
        {...select}
      >
        {children}
      </select>
      {error && (
        <p id={`${fieldId}-error`} className="text-sm font-medium text-bad">
          {error}
        </p>
      )}
    </div>
  );
}

export function FormAlert({ tone = "bad", children }: { tone?: "bad" | "ok" | "warn"; children: ReactNode }) {
  const styles = { bad: "border-bad/40 bg-bad-soft text-bad", ok: "border-ok/40 bg-ok-soft text-ok", warn: "border-warn/40 bg-warn-soft text-warn" };
  return (
    <div role={tone === "bad" ? "alert" : "status"} className={`rounded-md border px-4 py-3 text-sm font-medium ${styles[tone]}`}>
      {children}
    </div>
  );
}

export function SubmitButton({ children, pendingText, className = "", ...rest }: React.ButtonHTMLAttributes<HTMLButtonElement> & { pendingText?: string }) {
  const navigation = useNavigation();
  const pending = navigation.state === "submitting";
  return (
    <button
      type="submit"
      disabled={pending}
      className={`inline-flex min-h-11 items-center justify-center rounded-md bg-edge px-5 py-2.5 font-semibold text-white hover:bg-edge-dark disabled:opacity-60 ${className}`}
      {...rest}
    >
      {pending && pendingText ? pendingText : children}
    </button>
  );
}

/** The centred card of the signed-out pages. */
export function AuthCard({ title, children, footer }: { title: string; children: ReactNode; footer?: ReactNode }) {
  return (
    <main className="flex min-h-screen flex-col items-center justify-center px-4 py-10">
      <title>{`${title} · Stopwise`}</title>
      <div className="w-full max-w-md space-y-6">
        <a href="/" className="mx-auto block w-fit">
          <Wordmark />
        </a>
        <section className="space-y-5 rounded-xl border border-line bg-card p-6 shadow-sm sm:p-8">
          <h1 className="text-2xl font-semibold">{title}</h1>
          {children}
        </section>
        {footer && <div className="text-center text-sm text-muted">{footer}</div>}
      </div>
    </main>
  );
}
