'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { signInWithPassword, signOutTo } from '@/components/auth/credentials';
import { callApi, formObject, useApiForm } from '@/components/forms/use-api-form';
import { apiClient } from '@/lib/api/client';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useRefreshWhile } from '@/components/ui/use-refresh-while';
import { SubmitButton } from '@/components/forms/submit-button';

/** Rename. */
export function NameForm({ name }: { name: string }) {
  const router = useRouter();
  const { busy, fields, message, send } = useApiForm();
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const body = { name: formObject(e.currentTarget).name ?? '' };
    if (
      await send((b) => apiClient.PATCH('/api/me', { body: b }), { schema: 'profileUpdateSchema', body }, 'Name saved.')
    )
      router.refresh();
  }
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
      <TextField
        label="Name"
        name="name"
        autoComplete="name"
        defaultValue={name}
        required
        errors={fields.name}
        hint="As other members of your co-ops see it."
      />
      <div>
        <SubmitButton disabled={busy}>{busy ? 'Saving…' : 'Save name'}</SubmitButton>
      </div>
    </form>
  );
}

type Delivery = { status: 'queued' | 'sent' | 'failed'; sentAt: string | null } | null;

/** The pending change and how its confirmation e-mail is doing (followed while queued). */
function PendingChange({ pendingEmail, delivery }: { pendingEmail: string; delivery: Delivery }) {
  useRefreshWhile(delivery?.status === 'queued');
  if (delivery?.status === 'failed') {
    return (
      <Notice tone="danger" title="Confirmation e-mail not delivered">
        The link to <strong>{pendingEmail}</strong> could not be sent after several tries. Check the address and send it
        again below.
      </Notice>
    );
  }
  return (
    <Notice tone="info">
      A change to <strong>{pendingEmail}</strong> is waiting for you to open the link sent there.{' '}
      <span className="font-semibold">
        {delivery?.status === 'queued' ? 'Confirmation e-mail: queued.' : 'Confirmation e-mail: sent.'}
      </span>
    </Notice>
  );
}

/** New address + current password → a confirmation link goes to the new address. */
export function EmailForm({
  email,
  pendingEmail,
  delivery = null,
}: {
  email: string;
  pendingEmail: string | null;
  delivery?: Delivery;
}) {
  const router = useRouter();
  const { busy, fields, message, send, setMessage } = useApiForm();
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = formObject(form);
    const body = { email: f.email ?? '', currentPassword: f.currentPassword ?? '' };
    const r = await send((b) => apiClient.POST('/api/me/email', { body: b }), { schema: 'emailChangeSchema', body });
    if (!r) return;
    form.reset();
    setMessage(
      r.sent
        ? {
            tone: 'ok',
            text: `A confirmation link is on its way to ${r.pendingEmail}. Your address changes when you open it (within 24 hours).`,
          }
        : {
            tone: 'danger',
            text: `The confirmation e-mail to ${r.pendingEmail} could not be sent just now. Try again in a few minutes.`,
          },
    );
    router.refresh();
  }
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
      <p className="text-sm text-stone-700">
        You sign in with <strong>{email}</strong>.
      </p>
      {pendingEmail ? <PendingChange pendingEmail={pendingEmail} delivery={delivery} /> : null}
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
      <TextField
        label="New e-mail address"
        name="email"
        type="email"
        autoComplete="email"
        required
        errors={fields.email}
      />
      <TextField
        label="Current password"
        id="email-current-password"
        name="currentPassword"
        type="password"
        autoComplete="current-password"
        required
        errors={fields.currentPassword}
      />
      <div>
        <SubmitButton disabled={busy}>{busy ? 'Sending…' : 'Send confirmation link'}</SubmitButton>
      </div>
    </form>
  );
}

/**
 * Password change. The server ends every session (this one too); the form signs this browser
 * straight back in with the new password, so only the OTHER devices are signed out.
 */
export function PasswordForm({ email }: { email: string }) {
  const { busy, fields, message, send, setFields, setMessage } = useApiForm();
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const data = formObject(form);
    if ((data.newPassword ?? '') !== (data.confirm ?? '')) {
      setFields({ confirm: ['The two passwords differ.'] });
      return;
    }
    const body = { currentPassword: data.currentPassword ?? '', newPassword: data.newPassword ?? '' };
    const r = await send((b) => apiClient.POST('/api/me/password', { body: b }), {
      schema: 'passwordChangeSchema',
      body,
    });
    if (!r) return;
    form.reset();
    const again = await signInWithPassword(email, data.newPassword ?? '');
    if (!again.ok) {
      window.location.assign('/sign-in?next=/profile');
      return;
    }
    setMessage({ tone: 'ok', text: 'Password changed. Your other devices were signed out.' });
  }
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
      {message ? <Notice tone={message.tone}>{message.text}</Notice> : null}
      <input type="hidden" name="username" autoComplete="username" value={email} readOnly />
      <TextField
        label="Current password"
        name="currentPassword"
        type="password"
        autoComplete="current-password"
        required
        errors={fields.currentPassword}
      />
      <TextField
        label="New password"
        name="newPassword"
        type="password"
        autoComplete="new-password"
        required
        errors={fields.newPassword}
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
      <div>
        <SubmitButton disabled={busy}>{busy ? 'Saving…' : 'Change password'}</SubmitButton>
      </div>
    </form>
  );
}

/** Ends every session on every device, then goes to the sign-in page. */
export function SignOutEverywhere() {
  const [confirming, setConfirming] = useState(false);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  async function go() {
    setBusy(true);
    const r = await callApi(() => apiClient.POST('/api/me/sign-out-everywhere'));
    if (!r.ok) {
      setBusy(false);
      setError(r.error);
      return;
    }
    await signOutTo('/sign-in');
  }
  return (
    <div className="flex flex-col gap-3">
      {error ? <Notice tone="danger">{error}</Notice> : null}
      {confirming ? (
        <div className="flex flex-wrap gap-2">
          <Button type="button" variant="danger" onClick={go} disabled={busy}>
            {busy ? 'Signing out…' : 'Yes, sign out everywhere'}
          </Button>
          <Button type="button" variant="secondary" onClick={() => setConfirming(false)} disabled={busy}>
            Cancel
          </Button>
        </div>
      ) : (
        <div>
          <Button type="button" variant="secondary" onClick={() => setConfirming(true)}>
            Sign out everywhere
          </Button>
        </div>
      )}
    </div>
  );
}

/** The button on the e-mail confirmation page. */
export function ConfirmEmailButton({ token, newEmail }: { token: string; newEmail: string }) {
  const [state, setState] = useState<{ busy: boolean; error: string | null; done: boolean }>({
    busy: false,
    error: null,
    done: false,
  });
  async function confirm() {
    setState({ busy: true, error: null, done: false });
    const r = await callApi((b) => apiClient.POST('/api/me/email/confirm', { body: b }), {
      schema: 'emailConfirmSchema',
      body: { token },
    });
    setState({ busy: false, error: r.ok ? null : r.error, done: r.ok });
  }
  if (state.done) {
    return (
      <Notice tone="ok" title="E-mail address changed">
        From now on, sign in with {newEmail}. <a href="/profile">Go to your profile</a>.
      </Notice>
    );
  }
  return (
    <div className="flex flex-col gap-3">
      {state.error ? <Notice tone="danger">{state.error}</Notice> : null}
      <Button type="button" onClick={confirm} disabled={state.busy}>
        {state.busy ? 'Confirming…' : `Use ${newEmail}`}
      </Button>
    </div>
  );
}
