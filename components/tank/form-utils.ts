'use client';

/**
 * FormData → plain object for a form whose inputs are named `${prefix}-${field}` (so two forms
 * on one page never share an element id); empty strings are dropped.
 */
export function prefixedObject(form: HTMLFormElement, prefix: string): Record<string, string> {
  const out: Record<string, string> = {};
  new FormData(form).forEach((v, k) => {
    if (typeof v === 'string' && v.trim() !== '' && k.startsWith(`${prefix}-`))
      out[k.slice(prefix.length + 1)] = v.trim();
  });
  return out;
}

/** Field errors keyed by API field → keyed by the prefixed input name. */
export function prefixedErrors(fields: Record<string, string[]>, prefix: string): Record<string, string[]> {
  return Object.fromEntries(Object.entries(fields).map(([k, v]) => [`${prefix}-${k}`, v]));
}

/** Fetcher for SWR: JSON or a thrown error with the status. */
export async function jsonFetcher<T>(url: string): Promise<T> {
  const res = await fetch(url, { headers: { accept: 'application/json' } });
  if (!res.ok) throw Object.assign(new Error(`Request failed (${res.status})`), { status: res.status });
  return res.json() as Promise<T>;
}
