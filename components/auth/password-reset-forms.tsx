'use client';

import Link from 'next/link';
import { useState } from 'react';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { formObject, useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { SubmitButton } from '@/components/forms/submit-button';

/** Asks for a reset link; the answer is the same whether or not the address has an account. */
export function ResetRequestForm() {
  const { busy, fields, message, send } = useApiForm();
  const [done, setDone] = useState<string | null>(null);
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const body = { email: formObject(e.currentTarget).email ?? '' };
    const r = await send((b) => apiClient.POST('/api/password-reset', { body: b }), {
      schema: 'passwordResetRequestSchema',
      body,
    });
    if (r) setDone(r.message);
  }
  if (done)
    return (
      <Notice tone="ok" title="Check your e-mail">
        {done}
      </Notice>
    );
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
      <p className="text-sm text-stone-700">
        Enter the e-mail address you sign in with. We will send a link to choose a new password.
      </p>
      <TextField label="E-mail" name="email" type="email" autoComplete="email" required errors={fields.email} />
      <SubmitButton disabled={busy}>{busy ? 'Sending…' : 'Send the link'}</SubmitButton>
    </form>
  );
}

/** Sets the new password from a reset link. */
export function ResetPasswordForm({ token, email }: { token: string; email: string }) {
  const { busy, fields, message, send, setFields } = useApiForm();
  const [done, setDone] = useState(false);
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const data = formObject(e.currentTarget);
    if ((data.password ?? '') !== (data.confirm ?? '')) {
      setFields({ confirm: ['The two passwords differ.'] });
      return;
    }
    const body = { password: data.password ?? '' };
    const r = await send(
      (b) => apiClient.POST('/api/password-reset/{token}', { params: { path: { token } }, body: b }),
      { schema: 'passwordResetSchema', body },
    );
    if (r) setDone(true);
  }
  if (done) {
    return (
      <Notice tone="ok" title="Password changed">
        You were signed out on every device. <Link href="/sign-in">Sign in with your new password</Link>.
      </Notice>
    );
  }
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
      <input type="hidden" name="username" autoComplete="username" value={email} readOnly />
      <p className="text-sm text-stone-700">
        For <strong>{email}</strong>. Setting it signs you out on every device.
      </p>
      <TextField
        label="New password"
        name="password"
        type="password"
        autoComplete="new-password"
        required
        minLength={12}
        maxLength={128}
        errors={fields.password}
        hint="12 to 128 characters. A few unrelated words make a strong one."
      />
      <TextField
        label="New password again"
        name="confirm"
        type="password"
        autoComplete="new-password"
        required
        errors={fields.confirm}
      />
      <SubmitButton disabled={busy}>{busy ? 'Saving…' : 'Set new password'}</SubmitButton>
    </form>
  );
}
