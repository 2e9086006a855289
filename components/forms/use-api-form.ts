'use client';

import { useState } from 'react';
import { apiError, type ClientResult } from '@/lib/api/client';

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

/** An apiClient call (lib/api/client, openapi-fetch) under way. */
export type ClientCall<T> = Promise<ClientResult<T>>;

/**
 * Awaits a typed-client call (`apiClient.POST('/api/…', { params, body })`) as the same result
 * `sendJson` gives: the data is the operation's declared answer, so reading a field the contract
 * does not have is a compile error in the component.
 */
export async function callApi<T>(request: ClientCall<T>): Promise<ApiResult<T>> {
  try {
    const r = await request;
    if (r.response.ok) return { ok: true, data: r.data as T };
    const e = apiError(r.error, r.response.status);
    return { ok: false, status: r.response.status, ...e, body: r.error && typeof r.error === 'object' ? (r.error as Record<string, unknown>) : {} };
  } catch {
    return { ok: false, status: 0, error: 'Could not reach Tallyvat. Check your connection and try again.', fields: {}, body: {} };
  }
}

/** Form state for a JSON API call: busy flag, field errors, a top message. */
export function useApiForm() {
  const [busy, setBusy] = useState(false);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<{ tone: 'ok' | 'danger'; text: string } | null>(null);

  /** Sends through the typed client (`send(apiClient.POST(…))`): the answer's type is the contract's. */
  async function send<T>(request: ClientCall<T>, okText?: string): Promise<T | null> {
    setBusy(true);
    setMessage(null);
    return settle(await callApi(request), okText);
  }

  async function submit<T>(url: string, method: string, body: unknown, okText?: string): Promise<T | null> {
    setBusy(true);
    setMessage(null);
    return settle(await sendJson<T>(url, method, body), okText);
  }

  function settle<T>(r: ApiResult<T>, okText?: string): T | null {
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

  return { busy, fields, message, submit, send, setMessage, setFields };
}

/** FormData → plain object of strings (empty strings dropped). */
export function formObject(form: HTMLFormElement): Record<string, string> {
  const out: Record<string, string> = {};
  new FormData(form).forEach((v, k) => {
    if (typeof v === 'string' && v !== '') out[k] = v;
  });
  return out;
}
