import type { ReactNode } from "react";

export interface FieldProps {
  /** The id of the control inside; the label points at it and the error describes it. */
  id: string;
  label: string;
  hint?: string;
  error?: string;
  children: ReactNode;
}

/** A labelled form control with an optional hint and an error in words (announced to screen readers). */
export function Field({ id, label, hint, error, children }: FieldProps) {
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium text-tremor-content-strong dark:text-dark-tremor-content-strong">
        {label}
      </label>
      {children}
      {hint && !error ? (
        <p id={`${id}-hint`} className="text-xs text-tremor-content dark:text-dark-tremor-content">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} role="alert" className="text-xs font-medium text-red-700 dark:text-red-300">
          Error: {error}
        </p>
      ) : null}
    </div>
  );
}

/** aria props a control inside <Field> needs so the hint or error is read with it. */
export function fieldAria(id: string, error?: string, hint?: string) {
  return {
    id,
    "aria-invalid": error ? true : undefined,
    "aria-describedby": error ? `${id}-error` : hint ? `${id}-hint` : undefined,
  } as const;
}
