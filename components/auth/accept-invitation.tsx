'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { callApi, formObject, useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { signInWithPassword, signOutTo } from './credentials';
import { SubmitButton } from '@/components/forms/submit-button';

/** A new person: name and password, then they are signed in and land in the co-op. */
export function AcceptWithNewAccount({ token, email }: { token: string; email: string }) {
  const { busy, fields, message, send, setFields, setMessage } = useApiForm();
  const [signingIn, setSigningIn] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    setMessage(null);
    const data = formObject(e.currentTarget);
    if ((data.password ?? '') !== (data.confirm ?? '')) {
      setFields({ confirm: ['The two passwords differ.'] });
      return;
    }
    const body = { name: data.name ?? '', password: data.password ?? '' };
    const r = await send((b) => apiClient.POST('/api/invitations/{token}', { params: { path: { token } }, body: b }), {
      schema: 'newAccountAcceptSchema',
      body,
    });
    if (!r) return;
    setSigningIn(true);
    const signedIn = await signInWithPassword(email, body.password);
    if (!signedIn.ok) {
      setSigningIn(false);
      setMessage({
        tone: 'danger',
        text: `Your account is ready and you joined ${r.coop.name}, but signing in failed: ${signedIn.message}`,
      });
      return;
    }
    window.location.assign(`/c/${r.coop.slug}`);
  }

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
      <TextField
        label="E-mail"
        name="email"
        type="email"
        autoComplete="username"
        value={email}
        readOnly
        hint="The invited address; you sign in with it."
      />
      <TextField
        label="Your name"
        name="name"
        autoComplete="name"
        required
        errors={fields.name}
        hint="As other members of the co-op will see it."
      />
      <TextField
        label="Choose a password"
        name="password"
        type="password"
        autoComplete="new-password"
        required
        errors={fields.password}
        hint="12 to 128 characters. A few unrelated words make a strong one."
      />
      <TextField
        label="Password again"
        name="confirm"
        type="password"
        autoComplete="new-password"
        required
        errors={fields.confirm}
      />
      <SubmitButton disabled={busy || signingIn}>
        {busy || signingIn ? 'Joining…' : 'Create account and join'}
      </SubmitButton>
    </form>
  );
}

/** Already signed in as the invited address: one click. */
export function JoinButton({ token, coopName }: { token: string; coopName: string }) {
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  async function join() {
    setBusy(true);
    setMessage(null);
    const r = await callApi(
      (b) => apiClient.POST('/api/invitations/{token}', { params: { path: { token } }, body: b }),
      { schema: 'invitationAcceptSchema', body: {} },
    );
    if (!r.ok) {
      setBusy(false);
      setMessage(r.error);
      return;
    }
    window.location.assign(`/c/${r.data.coop.slug}`);
  }
  return (
    <div className="flex flex-col gap-3">
      {message ? <Notice tone="danger">{message}</Notice> : null}
      <Button type="button" onClick={join} disabled={busy}>
        {busy ? 'Joining…' : `Join ${coopName}`}
      </Button>
    </div>
  );
}

/** Signed in as someone else: sign out and come back to the same link. */
export function SignOutAndReturn({ token }: { token: string }) {
  return (
    <Button type="button" variant="secondary" onClick={() => void signOutTo(`/invite/${token}`)}>
      Sign out and continue
    </Button>
  );
}
