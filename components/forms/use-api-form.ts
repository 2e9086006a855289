'use client';

import { useEffect, useState } from 'react';
import { afterLoad } from '@/components/ui/after-load';
import { apiError, type ClientResult } from '@/lib/api/client';
import { fieldErrors } from '@/lib/validation/fields';
import type * as FormSchemas from '@/lib/validation/forms';

// The one way a form talks to the API: the body is checked with the route's own zod schema
// (lib/validation, the one the handler parses with; named from lib/validation/forms, which loads
// after the page so zod stays out of first-load JavaScript) before any request, so its reasons show
// beside the field at once; then it goes through the typed client (lib/api/client), so the
// body's and the answer's fields are the contract's and a renamed one is a compile error here.
// The server's 4xx field errors land beside the same fields.

export type ApiResult<T> =
  | { ok: true; data: T }
  | { ok: false; status: number; error: string; fields: Record<string, string[]>; body: Record<string, unknown> };

/** An apiClient call (lib/api/client, openapi-fetch) under way. */
export type ClientCall<T> = Promise<ClientResult<T>>;

/** A schema forms check with, by its name in lib/validation/forms. */
export type FormSchema = {
  [K in keyof typeof FormSchemas]: (typeof FormSchemas)[K] extends { safeParse: unknown } ? K : never;
}[keyof typeof FormSchemas];

/** A body and the route's schema to check it with before it is sent. */
export type Checked<B> = { schema: FormSchema; body: B };

const UNREACHABLE = 'Could not reach Tallyvat. Check your connection and try again.';

let schemas: Promise<typeof FormSchemas> | undefined;
/** The form schemas, loaded once (after the page has loaded, or at the first check). */
function loadFormSchemas(): Promise<typeof FormSchemas> {
  if (!schemas) {
    schemas = import('@/lib/validation/forms');
    schemas.catch(() => (schemas = undefined)); // a failed load is tried again at the next check
  }
  return schemas;
}

/** Checks a body with a route's schema: its field errors, or null when the server would accept its shape. */
export async function checkBody(schema: FormSchema, body: unknown): Promise<Record<string, string[]> | null> {
  const r = (await loadFormSchemas())[schema].safeParse(body);
  return r.success ? null : { ...fieldErrors(r.error) };
}

/**
 * Calls the typed client (`(body) => apiClient.POST('/api/…', { params, body })`), after checking
 * `checked.body` with `checked.schema`: a body the route would refuse answers here as a 422 with
 * the same field reasons, and nothing is sent.
 */
export async function callApi<T, B = undefined>(
  call: (body: B) => ClientCall<T>,
  checked?: Checked<B>,
): Promise<ApiResult<T>> {
  try {
    if (checked) {
      const fields = await checkBody(checked.schema, checked.body);
      if (fields) return { ok: false, status: 422, error: 'Some fields need attention.', fields, body: {} };
    }
    const r = await call(checked?.body as B);
    if (r.response.ok) return { ok: true, data: r.data as T };
    const e = apiError(r.error, r.response.status);
    return {
      ok: false,
      status: r.response.status,
      ...e,
      body: r.error && typeof r.error === 'object' ? (r.error as Record<string, unknown>) : {},
    };
  } catch {
    return { ok: false, status: 0, error: UNREACHABLE, fields: {}, body: {} };
  }
}

/** Form state around `callApi`: busy flag, field errors (the form's own check, then the server's), a top message. */
export function useApiForm() {
  const [busy, setBusy] = useState(false);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<{ tone: 'ok' | 'danger'; text: string } | null>(null);
  useEffect(() => afterLoad(() => void loadFormSchemas().catch(() => undefined)), []);

  /**
   * `send((b) => apiClient.POST('/api/…', { params, body: b }), { schema, body }, 'Saved.')`: the
   * declared answer, or null with the reasons set beside the fields and in the message.
   */
  async function send<T, B = undefined>(
    call: (body: B) => ClientCall<T>,
    checked?: Checked<B>,
    okText?: string,
  ): Promise<T | null> {
    setBusy(true);
    setMessage(null);
    const r = await callApi(call, checked);
    setBusy(false);
    if (r.ok) {
      setFields({});
      if (okText) setMessage({ tone: 'ok', text: okText });
      return r.data;
    }
    setFields(r.fields);
    setMessage({ tone: 'danger', text: r.error });
    return null;
  }

  return { busy, fields, message, send, setMessage, setFields };
}

/** A number input's text as the number a body carries: empty → undefined; not a number → NaN, which the schema names. */
export const numberOf = (s: string | undefined): number | undefined =>
  s === undefined || s.trim() === '' ? undefined : Number(s);

/** FormData → plain object of strings (empty strings dropped). */
export function formObject(form: HTMLFormElement): Record<string, string> {
  const out: Record<string, string> = {};
  new FormData(form).forEach((v, k) => {
    if (typeof v === 'string' && v !== '') out[k] = v;
  });
  return out;
}
