'use client';

import { useState } from 'react';
import useSWR from 'swr';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { callApi, formObject, useApiForm } from '@/components/forms/use-api-form';
import { apiClient, apiError } from '@/lib/api/client';
import type { paths } from '@/lib/api/client';
import { SubmitButton } from '@/components/forms/submit-button';

type TokenList = paths['/api/coops/{coop}/tokens']['get']['responses'][200]['content']['application/json'];
type Token = TokenList['tokens'][number];

const when = (iso: string | null | undefined) => (iso ? new Date(iso).toLocaleString() : 'Never');

/** Personal access tokens of the co-op: create (shown once), see last use, revoke. */
export function ApiTokens({ coop }: { coop: string }) {
  const key = ['api-tokens', coop];
  const { data, error, isLoading, mutate } = useSWR(key, async () => {
    const r = await apiClient.GET('/api/coops/{coop}/tokens', { params: { path: { coop } } });
    if (r.error) throw new Error(apiError(r.error, r.response.status).error);
    return r.data;
  });
  const { busy, fields, message, send, setMessage } = useApiForm();
  const [secret, setSecret] = useState<{ name: string; value: string } | null>(null);

  async function create(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = formObject(form);
    const body = { name: f.name ?? '', access: f.access === 'write' ? ('write' as const) : ('read' as const) };
    const r = await send((b) => apiClient.POST('/api/coops/{coop}/tokens', { params: { path: { coop } }, body: b }), {
      schema: 'apiTokenCreateSchema',
      body,
    });
    if (!r) return;
    setSecret({ name: r.token.name, value: r.secret });
    form.reset();
    await mutate();
  }

  async function revoke(t: Token) {
    if (!window.confirm(`Revoke “${t.name}”? Anything using it stops working at once.`)) return;
    const r = await callApi(() =>
      apiClient.DELETE('/api/coops/{coop}/tokens/{id}', { params: { path: { coop, id: String(t.id) } } }),
    );
    setMessage(r.ok ? { tone: 'ok', text: `“${t.name}” is revoked.` } : { tone: 'danger', text: r.error });
    await mutate();
  }

  return (
    <div className="flex flex-col gap-5">
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
      {secret ? (
        <Notice tone="warn" title={`Copy the token for “${secret.name}” now`}>
          <p>
            It is shown only this once; Tallyvat keeps only a fingerprint of it. Send it as{' '}
            <code>Authorization: Bearer …</code>.
          </p>
          <p
            className="mt-2 break-all rounded bg-white p-2 font-mono text-sm text-stone-900"
            aria-label="New access token"
          >
            {secret.value}
          </p>
        </Notice>
      ) : null}
      <form
        onSubmit={create}
        noValidate
        className="grid gap-4 rounded-xl border border-stone-200 bg-white p-4 sm:grid-cols-[1fr_auto_auto] sm:items-end"
      >
        <TextField
          label="Name"
          name="name"
          maxLength={80}
          errors={fields.name}
          hint="What will use it, e.g. “pump meter logger”."
        />
        <SelectField label="Access" name="access" defaultValue="read" errors={fields.access}>
          <option value="read">Read only</option>
          <option value="write">Read and write</option>
        </SelectField>
        <SubmitButton disabled={busy}>{busy ? 'Creating…' : 'Create token'}</SubmitButton>
      </form>
      {isLoading ? <p className="text-stone-600">Loading tokens…</p> : null}
      {error ? <Notice tone="danger">Could not load the tokens: {String(error.message)}</Notice> : null}
      {data && data.tokens.length === 0 ? <p className="text-stone-600">No tokens yet.</p> : null}
      {data && data.tokens.length > 0 ? (
        <ul className="flex flex-col gap-3" aria-label="Access tokens">
          {data.tokens.map((t) => (
            <li
              key={t.id}
              className="flex flex-col gap-2 rounded-xl border border-stone-200 bg-white p-4 sm:flex-row sm:items-center sm:justify-between"
            >
              <div className="min-w-0">
                <p className="font-semibold text-stone-900">
                  {t.name} <span className="font-mono text-sm text-stone-600">{t.prefix}…</span>
                </p>
                <p className="text-sm text-stone-600">
                  {t.access === 'write' ? 'Read and write' : 'Read only'} · created {when(t.createdAt)}
                  {t.createdBy ? ` by ${t.createdBy}` : ''} · last used {when(t.lastUsedAt)}
                </p>
                {t.revokedAt ? (
                  <p className="text-sm font-semibold text-danger-700">Revoked {when(t.revokedAt)}</p>
                ) : null}
              </div>
              {t.revokedAt ? null : (
                <Button variant="secondary" onClick={() => revoke(t)} aria-label={`Revoke ${t.name}`}>
                  Revoke
                </Button>
              )}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
