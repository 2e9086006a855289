'use client';

import { useState } from 'react';

export type ApiResult<T> = { ok: true; data: T } | { ok: false; status: number; error: string; fields: Record<string, string[]>; body: Record<string, unknown> };

/** Sends JSON to an API route and keeps the field errors and message it answers with. */
export async function sendJson<T = unknown>(url: string, method: string, body?: unknown): Promise<ApiResult<T>> {
  try {
    const res = await fetch(url, {
      method,
      headers: body === undefined ? undefined : { 'content-type': 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    const data = await res.json().catch(() => ({}));
    if (res.ok) return { ok: true, data: data as T };
    return { ok: false, status: res.status, error: data.error ?? `Request failed (${res.status}).`, fields: data.fields ?? {}, body: data };
  } catch {
    return { ok: false, status: 0, error: 'Could not reach Tallyvat. Check your connection and try again.', fields: {}, body: {} };
  }
}

/** Form state for a JSON API call: busy flag, field errors, a top message. */
export function useApiForm() {
  const [busy, setBusy] = useState(false);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<{ tone: 'ok' | 'danger'; text: string } | null>(null);

  async function submit<T>(url: string, method: string, body: unknown, okText?: string): Promise<T | null> {
    setBusy(true);
    setMessage(null);
    const r = await sendJson<T>(url, method, body);
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

  return { busy, fields, message, submit, setMessage, setFields };
}

/** FormData → plain object of strings (empty strings dropped). */
export function formObject(form: HTMLFormElement): Record<string, string> {
  const out: Record<string, string> = {};
  new FormData(form).forEach((v, k) => {
    if (typeof v === 'string' && v !== '') out[k] = v;
  });
  return out;
}
