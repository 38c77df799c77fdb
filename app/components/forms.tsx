import { Form } from "react-router";
import type { InputHTMLAttributes, ReactNode, SelectHTMLAttributes } from "react";

/** A labelled input with its server-side error beside it. */
export function Field({
  label,
  name,
  error,
  hint,
  ...input
}: { label: string; name: string; error?: string; hint?: ReactNode } & InputHTMLAttributes<HTMLInputElement>) {
  const id = input.id ?? `field-${name}`;
  return (
    <div>
      <label htmlFor={id} className="label">
        {label}
      </label>
      <input id={id} name={name} className="input" aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-error` : undefined} {...input} />
      {hint && !error ? <p className="mt-1 text-xs text-muted">{hint}</p> : null}
      {error ? (
        <p id={`${id}-error`} className="field-error" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}

export function SelectField({
  label,
  name,
  error,
  options,
  ...select
}: {
  label: string;
  name: string;
  error?: string;
  options: readonly { value: string; label: string }[];
} & SelectHTMLAttributes<HTMLSelectElement>) {
  const id = select.id ?? `field-${name}`;
  return (
    <div>
      <label htmlFor={id} className="label">
        {label}
      </label>
      <select id={id} name={name} className="input" aria-invalid={error ? true : undefined} {...select}>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      {error ? <p className="field-error" role="alert">{error}</p> : null}
    </div>
  );
}

export function FormError({ error }: { error?: string }) {
  if (!error) return null;
  return (
    <p role="alert" className="rounded-md border border-bad/40 bg-red-50 px-3 py-2 text-sm text-bad">
      {error}
    </p>
  );
}

export function Notice({ children }: { children: ReactNode }) {
  return <p className="rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-sm text-ok">{children}</p>;
}

/**
 * A one-button form that asks before it posts (delete, remove): the hidden fields say what to act on,
 * including the version the page showed, so a stale view is refused by the server.
 */
export function ConfirmForm({
  question,
  fields,
  label,
  className,
  buttonClassName = "text-xs text-bad hover:underline",
  disabled,
}: {
  question: string;
  fields: Record<string, string | number>;
  label: string;
  className?: string;
  buttonClassName?: string;
  disabled?: boolean;
}) {
  return (
    <Form method="post" className={className} onSubmit={(e) => { if (!confirm(question)) e.preventDefault(); }}>
      {Object.entries(fields).map(([name, value]) => (
        <input key={name} type="hidden" name={name} value={value} />
      ))}
      <button type="submit" className={buttonClassName} disabled={disabled}>
        {label}
      </button>
    </Form>
  );
}
