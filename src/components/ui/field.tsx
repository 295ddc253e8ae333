// Labelled form fields with their error beneath, wired for screen readers.
import { forwardRef, useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes } from 'react';

export const inputClass =
  'block w-full min-h-11 rounded-md border border-rule-strong bg-paper-raised px-3 py-2 text-base text-ink placeholder:text-ink-faint focus:border-amber aria-[invalid=true]:border-danger';

interface FieldProps {
  label: ReactNode;
  error?: string;
  hint?: ReactNode;
}

export const TextField = forwardRef<HTMLInputElement, FieldProps & InputHTMLAttributes<HTMLInputElement>>(function TextField({ label, error, hint, id, className = '', ...rest }, ref) {
  const auto = useId();
  const fieldId = id ?? auto;
  return (
    <div className={className}>
      <label htmlFor={fieldId} className="mb-1 block text-sm font-semibold text-ink">
        {label}
      </label>
      <input ref={ref} id={fieldId} className={inputClass} aria-invalid={error ? true : undefined} aria-describedby={error ? `${fieldId}-error` : hint ? `${fieldId}-hint` : undefined} {...rest} />
      {hint && !error ? (
        <p id={`${fieldId}-hint`} className="mt-1 text-sm text-ink-soft">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${fieldId}-error`} className="mt-1 text-sm font-semibold text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
});

export function SelectField({ label, error, hint, id, children, className = '', ...rest }: FieldProps & SelectHTMLAttributes<HTMLSelectElement>) {
  const auto = useId();
  const fieldId = id ?? auto;
  return (
    <div className={className}>
      <label htmlFor={fieldId} className="mb-1 block text-sm font-semibold text-ink">
        {label}
      </label>
      <select id={fieldId} className={inputClass} aria-invalid={error ? true : undefined} aria-describedby={error ? `${fieldId}-error` : hint ? `${fieldId}-hint` : undefined} {...rest}>
        {children}
      </select>
      {hint && !error ? (
        <p id={`${fieldId}-hint`} className="mt-1 text-sm text-ink-soft">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${fieldId}-error`} className="mt-1 text-sm font-semibold text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}
