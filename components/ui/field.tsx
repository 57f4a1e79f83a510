import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from "react";

export const inputClass =
  "block w-full rounded-md border border-rule-strong bg-white px-3 py-2 text-sm text-ink shadow-inner placeholder:text-ink-soft/60 aria-invalid:border-danger aria-invalid:bg-danger-wash";

interface FieldShellProps {
  label: string;
  hint?: ReactNode;
  errors?: string[];
  children: (ids: { id: string; describedBy: string | undefined; invalid: boolean }) => ReactNode;
}

/** Label, control, hint and field errors wired together for screen readers. */
export function FieldShell({ label, hint, errors, children }: FieldShellProps) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = errors?.length ? `${id}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(" ") || undefined;
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium text-ink">
        {label}
      </label>
      {children({ id, describedBy, invalid: Boolean(errorId) })}
      {hint ? (
        <p id={hintId} className="text-xs text-ink-soft">
          {hint}
        </p>
      ) : null}
      {errorId ? (
        <p id={errorId} className="text-xs font-medium text-danger" role="alert">
          {errors?.join(" ")}
        </p>
      ) : null}
    </div>
  );
}

type Common = { label: string; hint?: ReactNode; errors?: string[] };

export function TextField({ label, hint, errors, className = "", ...props }: Common & InputHTMLAttributes<HTMLInputElement>) {
  return (
    <FieldShell label={label} hint={hint} errors={errors}>
      {({ id, describedBy, invalid }) => (
        <input id={id} aria-describedby={describedBy} aria-invalid={invalid || undefined} className={`${inputClass} ${className}`} {...props} />
      )}
    </FieldShell>
  );
}

export function SelectField({ label, hint, errors, className = "", children, ...props }: Common & SelectHTMLAttributes<HTMLSelectElement>) {
  return (
    <FieldShell label={label} hint={hint} errors={errors}>
      {({ id, describedBy, invalid }) => (
        <select id={id} aria-describedby={describedBy} aria-invalid={invalid || undefined} className={`${inputClass} ${className}`} {...props}>
          {children}
        </select>
      )}
    </FieldShell>
  );
}

export function TextAreaField({ label, hint, errors, className = "", ...props }: Common & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  return (
    <FieldShell label={label} hint={hint} errors={errors}>
      {({ id, describedBy, invalid }) => (
        <textarea id={id} aria-describedby={describedBy} aria-invalid={invalid || undefined} className={`${inputClass} ${className}`} {...props} />
      )}
    </FieldShell>
  );
}
