import { forwardRef, type InputHTMLAttributes, type SelectHTMLAttributes, type TextareaHTMLAttributes } from "react";

const INPUT = "mt-1 block w-full rounded border border-line-strong bg-surface px-2.5 py-1.5 text-sm aria-[invalid=true]:border-danger";

/** Label, control and the field's error messages (client and server alike), wired for screen readers. */
export function FieldShell({ id, label, hint, errors, children }: { id: string; label: string; hint?: string; errors?: (string | undefined)[]; children: React.ReactNode }) {
  const messages = (errors ?? []).filter(Boolean);
  return (
    <div className="mb-3">
      <label htmlFor={id} className="block text-sm font-semibold">
        {label}
      </label>
      {children}
      {hint && messages.length === 0 ? <p className="mt-1 text-xs text-ink-faint">{hint}</p> : null}
      {messages.map((m) => (
        <p key={m} id={`${id}-error`} className="mt-1 text-xs font-semibold text-danger">
          {m}
        </p>
      ))}
    </div>
  );
}

type Common = { label: string; hint?: string; errors?: (string | undefined)[] };

export const TextField = forwardRef<HTMLInputElement, InputHTMLAttributes<HTMLInputElement> & Common & { name: string }>(function TextField(
  { label, hint, errors, id, ...props },
  ref,
) {
  const fieldId = id ?? `f-${props.name}`;
  const invalid = (errors ?? []).some(Boolean);
  return (
    <FieldShell id={fieldId} label={label} hint={hint} errors={errors}>
      <input ref={ref} id={fieldId} aria-invalid={invalid} aria-describedby={invalid ? `${fieldId}-error` : undefined} className={INPUT} {...props} />
    </FieldShell>
  );
});

export const TextAreaField = forwardRef<HTMLTextAreaElement, TextareaHTMLAttributes<HTMLTextAreaElement> & Common & { name: string }>(function TextAreaField(
  { label, hint, errors, id, ...props },
  ref,
) {
  const fieldId = id ?? `f-${props.name}`;
  const invalid = (errors ?? []).some(Boolean);
  return (
    <FieldShell id={fieldId} label={label} hint={hint} errors={errors}>
      <textarea ref={ref} id={fieldId} rows={3} aria-invalid={invalid} className={INPUT} {...props} />
    </FieldShell>
  );
});

export const SelectField = forwardRef<HTMLSelectElement, SelectHTMLAttributes<HTMLSelectElement> & Common & { name: string }>(function SelectField(
  { label, hint, errors, id, children, ...props },
  ref,
) {
  const fieldId = id ?? `f-${props.name}`;
  const invalid = (errors ?? []).some(Boolean);
  return (
    <FieldShell id={fieldId} label={label} hint={hint} errors={errors}>
      <select ref={ref} id={fieldId} aria-invalid={invalid} className={INPUT} {...props}>
        {children}
      </select>
    </FieldShell>
  );
});
