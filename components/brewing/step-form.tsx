'use client';

import { useRouter } from 'next/navigation';
import type { ReactNode } from 'react';
import { SelectField, TextField, FieldErrors } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useApiForm } from '@/components/forms/use-api-form';
import { stepTarget } from './step-targets';
import { useUnsavedForm } from './unsaved';
import { SubmitButton } from '@/components/forms/submit-button';

/** One input of a step form. Values are sent as typed; the server parses and converts units. */
export interface StepField {
  name: string;
  label: string;
  kind?: 'number' | 'text' | 'textarea' | 'select' | 'list';
  defaultValue?: string;
  hint?: string;
  options?: { value: string; label: string }[];
  /** Empty means "leave unchanged" instead of "clear". */
  omitEmpty?: boolean;
  /** A live figure shown beside the input (e.g. the computed amount). */
  aside?: ReactNode;
}

/**
 * A small form that PATCHes (or POSTs) a batch's fields and refreshes the page. Empty inputs
 * clear the value (null) unless the field says omitEmpty; "list" inputs take numbers separated
 * by commas or spaces. Errors appear beside their fields.
 */
export function StepForm({
  url,
  method = 'PATCH',
  fields,
  submitLabel = 'Save',
  disabled,
  okText = 'Saved.',
  extra,
}: {
  url: string;
  method?: string;
  fields: StepField[];
  submitLabel?: string;
  disabled?: boolean;
  okText?: string;
  extra?: Record<string, unknown>;
}) {
  const { busy, fields: errors, message, send, setMessage } = useApiForm();
  const router = useRouter();
  // Typed values are registered so that moving the batch on saves them first; leaving the page asks.
  const { formRef, dirty, onChange, onSubmit } = useUnsavedForm(save);

  async function save(form: HTMLFormElement): Promise<boolean> {
    const data = new FormData(form);
    const body: Record<string, unknown> = { ...extra };
    for (const f of fields) {
      const raw = String(data.get(f.name) ?? '').trim();
      if (raw === '') {
        if (!f.omitEmpty) body[f.name] = null;
        continue;
      }
      body[f.name] = f.kind === 'list' ? raw.split(/[\s,;]+/).filter(Boolean) : raw;
    }
    const target = stepTarget(url, method);
    if (!target) {
      setMessage({ tone: 'danger', text: 'This form has nowhere to save to.' });
      return false;
    }
    const ok = Boolean(await send(target.call, { schema: target.schema, body }, okText));
    if (ok) router.refresh();
    return ok;
  }

  const formErrors = errors._form;
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} noValidate className="flex flex-col gap-3">
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
      <FieldErrors id={`${url}-form-error`} errors={formErrors} />
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        {fields.map((f) => (
          <div key={f.name} className={f.kind === 'textarea' ? 'sm:col-span-2' : undefined}>
            {f.kind === 'select' ? (
              <SelectField
                label={f.label}
                name={f.name}
                defaultValue={f.defaultValue ?? ''}
                errors={errors[f.name]}
                hint={f.hint}
                disabled={disabled}
              >
                {(f.options ?? []).map((o) => (
                  <option key={o.value} value={o.value}>
                    {o.label}
                  </option>
                ))}
              </SelectField>
            ) : f.kind === 'textarea' ? (
              <TextArea field={f} errors={errors[f.name]} disabled={disabled} />
            ) : (
              <TextField
                label={f.label}
                name={f.name}
                defaultValue={f.defaultValue ?? ''}
                inputMode={f.kind === 'number' ? 'decimal' : undefined}
                errors={
                  errors[f.name] ??
                  Object.entries(errors)
                    .filter(([k]) => k.startsWith(`${f.name}.`))
                    .flatMap(([, v]) => v)
                }
                hint={f.hint}
                disabled={disabled}
                autoComplete="off"
              />
            )}
            {f.aside ? <div className="mt-1 text-sm text-stone-700">{f.aside}</div> : null}
          </div>
        ))}
      </div>
      {disabled ? null : (
        <div className="flex items-center gap-3">
          <SubmitButton disabled={busy}>{busy ? 'Saving…' : submitLabel}</SubmitButton>
          {dirty ? <span className="text-xs text-stone-600">Unsaved changes</span> : null}
        </div>
      )}
    </form>
  );
}

function TextArea({ field, errors, disabled }: { field: StepField; errors?: string[]; disabled?: boolean }) {
  const errId = `${field.name}-error`;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={field.name} className="text-sm font-medium text-stone-800">
        {field.label}
      </label>
      <textarea
        id={field.name}
        name={field.name}
        defaultValue={field.defaultValue ?? ''}
        rows={3}
        disabled={disabled}
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={errors?.length ? errId : undefined}
        className={`rounded-lg border bg-white px-3 py-2 text-base ${errors?.length ? 'border-danger-600' : 'border-stone-300'}`}
      />
      {field.hint ? <p className="text-xs text-stone-600">{field.hint}</p> : null}
      <FieldErrors id={errId} errors={errors} />
    </div>
  );
}
