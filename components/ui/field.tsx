import type { InputHTMLAttributes, SelectHTMLAttributes, ReactNode } from 'react';

interface FieldProps {
  label: string;
  name: string;
  errors?: string[];
  hint?: ReactNode;
}

/** A labelled input with its hint and errors wired by aria-describedby. */
export function TextField({ label, name, errors, hint, ...input }: FieldProps & InputHTMLAttributes<HTMLInputElement>) {
  const errId = `${input.id ?? name}-error`;
  const hintId = `${input.id ?? name}-hint`;
  const describedBy = [hint ? hintId : null, errors?.length ? errId : null].filter(Boolean).join(' ') || undefined;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={input.id ?? name} className="text-sm font-medium text-stone-800">
        {label}
      </label>
      <input
        id={input.id ?? name}
        name={name}
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={describedBy}
        {...input}
        className={`min-h-11 rounded-lg border bg-white px-3 py-2 text-base ${errors?.length ? 'border-danger-600' : 'border-stone-300'} ${input.className ?? ''}`}
      />
      {hint ? (
        <p id={hintId} className="text-xs text-stone-600">
          {hint}
        </p>
      ) : null}
      <FieldErrors id={errId} errors={errors} />
    </div>
  );
}

export function SelectField({
  label,
  name,
  errors,
  hint,
  children,
  ...select
}: FieldProps & SelectHTMLAttributes<HTMLSelectElement>) {
  const errId = `${select.id ?? name}-error`;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={select.id ?? name} className="text-sm font-medium text-stone-800">
        {label}
      </label>
      <select
        id={select.id ?? name}
        name={name}
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={errors?.length ? errId : undefined}
        {...select}
        className={`min-h-11 rounded-lg border bg-white px-3 py-2 text-base ${errors?.length ? 'border-danger-600' : 'border-stone-300'}`}
      >
        {children}
      </select>
      {hint ? <p className="text-xs text-stone-600">{hint}</p> : null}
      <FieldErrors id={errId} errors={errors} />
    </div>
  );
}

export function FieldErrors({ id, errors }: { id: string; errors?: string[] }) {
  if (!errors?.length) return null;
  return (
    <p id={id} className="text-sm font-medium text-danger-700" role="alert">
      {errors.join(' ')}
    </p>
  );
}
