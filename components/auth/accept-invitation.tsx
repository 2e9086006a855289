'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { formObject, sendJson } from '@/components/forms/use-api-form';
import { signInWithPassword, signOutTo } from './credentials';

type Accepted = { coop: { slug: string; name: string }; role: string; email: string; newAccount: boolean };

/** A new person: name and password, then they are signed in and land in the co-op. */
export function AcceptWithNewAccount({ token, email }: { token: string; email: string }) {
  const [busy, setBusy] = useState(false);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<string | null>(null);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    setMessage(null);
    const data = formObject(e.currentTarget);
    if ((data.password ?? '') !== (data.confirm ?? '')) {
      setFields({ confirm: ['The two passwords differ.'] });
      return;
    }
    setBusy(true);
    const r = await sendJson<Accepted>(`/api/invitations/${token}`, 'POST', { name: data.name ?? '', password: data.password ?? '' });
    if (!r.ok) {
      setBusy(false);
      setFields(r.fields);
      setMessage(r.error);
      return;
    }
    setFields({});
    const signedIn = await signInWithPassword(email, data.password ?? '');
    if (!signedIn.ok) {
      setBusy(false);
      setMessage(`Your account is ready and you joined ${r.data.coop.name}, but signing in failed: ${signedIn.message}`);
      return;
    }
    window.location.assign(`/c/${r.data.coop.slug}`);
  }

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {message ? <Notice tone="danger">{message}</Notice> : null}
      <TextField label="E-mail" name="email" type="email" autoComplete="username" value={email} readOnly hint="The invited address; you sign in with it." />
      <TextField label="Your name" name="name" autoComplete="name" required errors={fields.name} hint="As other members of the co-op will see it." />
      <TextField label="Choose a password" name="password" type="password" autoComplete="new-password" required errors={fields.password} hint="12 to 128 characters. A few unrelated words make a strong one." />
      <TextField label="Password again" name="confirm" type="password" autoComplete="new-password" required errors={fields.confirm} />
      <Button type="submit" disabled={busy}>{busy ? 'Joining…' : 'Create account and join'}</Button>
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
    const r = await sendJson<Accepted>(`/api/invitations/${token}`, 'POST', {});
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
      <Button type="button" onClick={join} disabled={busy}>{busy ? 'Joining…' : `Join ${coopName}`}</Button>
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
