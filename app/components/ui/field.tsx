import type { InputHTMLAttributes, ReactNode, SelectHTMLAttributes, TextareaHTMLAttributes } from "react";

/**
 * The one way a form field is drawn: a label bound by id, aria-invalid, aria-describedby
 * pointing at the hint and the error list, and space kept for errors so the form does not jump.
 */
type FieldFrameProps = {
  id: string;
  label: ReactNode;
  hint?: ReactNode;
  errors?: string[] | null;
  children: (aria: { id: string; "aria-invalid": boolean | undefined; "aria-describedby": string | undefined }) => ReactNode;
  className?: string;
};

export function FieldFrame({ id, label, hint, errors, children, className }: FieldFrameProps) {
  const errorId = `${id}-error`;
  const hintId = `${id}-hint`;
  const hasErrors = !!errors && errors.length > 0;
  const describedBy = [hint ? hintId : null, hasErrors ? errorId : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className={className ?? "flex flex-col gap-1"}>
      <label htmlFor={id} className="font-semibold">
        {label}
      </label>
      {hint ? (
        <p id={hintId} className="text-sm text-muted">
          {hint}
        </p>
      ) : null}
      {children({ id, "aria-invalid": hasErrors || undefined, "aria-describedby": describedBy })}
      <div className="min-h-6 text-sm text-coral" id={errorId} aria-live="polite">
        {hasErrors ? (
          <ul>
            {errors!.map((e) => (
              <li key={e}>{e}</li>
            ))}
          </ul>
        ) : null}
      </div>
    </div>
  );
}

/** What conform knows about a field, as far as drawing it needs. */
type ConformFieldMeta = { id: string; name: string; initialValue?: unknown; errors?: string[] };

/**
 * The props a field takes from conform's metadata: id, name, the value to show and the errors.
 * The `key` stays separate (React does not take it from a spread).
 */
export function fromConform(meta: ConformFieldMeta, options: { keepValue?: boolean } = {}) {
  return {
    id: meta.id,
    name: meta.name,
    // Secrets (PINs, one-time codes) are never written back into the page after a refusal.
    defaultValue: options.keepValue !== false && typeof meta.initialValue === "string" ? meta.initialValue : undefined,
    errors: meta.errors,
  };
}

/**
 * Where one page has several forms, each told apart by its `intent`: the last submission's
 * result if it came from this form, so errors land beside the right fields.
 */
export function resultFor<T>(result: T | undefined, intent: string): T | undefined {
  const initial = (result as { initialValue?: { intent?: unknown } | null } | undefined)?.initialValue;
  return initial?.intent === intent ? result : undefined;
}

const controlClass =
  "w-full rounded-md border border-muted/60 bg-card px-3 py-2 text-base text-ink aria-[invalid=true]:border-coral aria-[invalid=true]:border-2";

type TextFieldProps = Omit<InputHTMLAttributes<HTMLInputElement>, "id"> & {
  id: string;
  label: ReactNode;
  hint?: ReactNode;
  errors?: string[] | null;
};

export function TextField({ id, label, hint, errors, className, ...input }: TextFieldProps) {
  return (
    <FieldFrame id={id} label={label} hint={hint} errors={errors} className={className}>
      {(aria) => <input {...input} {...aria} className={controlClass} />}
    </FieldFrame>
  );
}

type SelectFieldProps = Omit<SelectHTMLAttributes<HTMLSelectElement>, "id"> & {
  id: string;
  label: ReactNode;
  hint?: ReactNode;
  errors?: string[] | null;
  options: { value: string; label: string }[];
};

export function SelectField({ id, label, hint, errors, options, className, ...select }: SelectFieldProps) {
  return (
    <FieldFrame id={id} label={label} hint={hint} errors={errors} className={className}>
      {(aria) => (
        <select {...select} {...aria} className={controlClass}>
          {options.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      )}
    </FieldFrame>
  );
}

type TextAreaFieldProps = Omit<TextareaHTMLAttributes<HTMLTextAreaElement>, "id"> & {
  id: string;
  label: ReactNode;
  hint?: ReactNode;
  errors?: string[] | null;
};

export function TextAreaField({ id, label, hint, errors, className, ...area }: TextAreaFieldProps) {
  return (
    <FieldFrame id={id} label={label} hint={hint} errors={errors} className={className}>
      {(aria) => <textarea {...area} {...aria} className={controlClass} />}
    </FieldFrame>
  );
}

/** Errors that belong to the whole form rather than one field. */
export function FormErrors({ id, errors }: { id: string; errors?: string[] | null }) {
  if (!errors || errors.length === 0) return null;
  return (
    <div id={id} role="alert" className="rounded-md border-l-4 border-coral bg-coral-wash px-4 py-3 text-ink">
      <ul>
        {errors.map((e) => (
          <li key={e}>{e}</li>
        ))}
      </ul>
    </div>
  );
}
