'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { callApi, formObject } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { ROLES, ROLE_SUMMARY, type Role } from '@/lib/auth/roles';
import { SubmitButton } from '@/components/forms/submit-button';

/** Invite by e-mail with a role. The e-mail goes out from the job queue within moments; the list shows when it was sent. */
export function InviteForm({ coopSlug }: { coopSlug: string }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<{ tone: 'ok' | 'warn' | 'danger'; text: string } | null>(null);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    setBusy(true);
    setMessage(null);
    const f = formObject(form);
    // The select offers the four roles; the server names a bad value.
    const body = { email: f.email ?? '', role: f.role as Role };
    const r = await callApi(
      (b) => apiClient.POST('/api/coops/{coop}/invitations', { params: { path: { coop: coopSlug } }, body: b }),
      { schema: 'invitationCreateSchema', body },
    );
    setBusy(false);
    if (!r.ok) {
      setFields(r.fields);
      setMessage({ tone: 'danger', text: r.error });
      return;
    }
    setFields({});
    form.reset();
    setMessage({
      tone: 'ok',
      text: `Invitation to ${r.data.invitation.email} saved; the e-mail goes out in a moment. The link works for 7 days from sending.`,
    });
    router.refresh();
  }

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
      <div aria-live="polite">{message ? <Notice tone={message.tone}>{message.text}</Notice> : null}</div>
      <div className="grid gap-3 sm:grid-cols-[1fr_11rem]">
        <TextField label="E-mail address" name="email" type="email" autoComplete="off" required errors={fields.email} />
        <SelectField label="Role" name="role" defaultValue="member" errors={fields.role}>
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {r}
            </option>
          ))}
        </SelectField>
      </div>
      <details className="text-sm text-stone-700">
        <summary className="cursor-pointer">What each role may do</summary>
        <dl className="mt-2 grid gap-1">
          {ROLES.map((r) => (
            <div key={r}>
              <dt className="inline font-semibold">{r} can </dt>
              <dd className="inline">{ROLE_SUMMARY[r]}.</dd>
            </div>
          ))}
        </dl>
      </details>
      <div>
        <SubmitButton disabled={busy}>{busy ? 'Sending…' : 'Send invitation'}</SubmitButton>
      </div>
    </form>
  );
}
