'use client';

import { useState } from 'react';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { checkBody } from '@/components/forms/use-api-form';
import { signInWithPassword } from './credentials';
import { SubmitButton } from '@/components/forms/submit-button';

/**
 * Signs in through next-auth's credentials endpoint directly (csrf token + form post), so a
 * 429 from the rate limit reaches the person as a clear message.
 */
export function SignInForm({ next, email }: { next: string; email?: string }) {
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    setMessage(null);
    const form = new FormData(e.currentTarget);
    const email = String(form.get('email') ?? '');
    const password = String(form.get('password') ?? '');
    const fe = await checkBody('signInSchema', { email, password });
    if (fe) {
      setErrors(fe);
      return;
    }
    setErrors({});
    setBusy(true);
    const r = await signInWithPassword(email, password);
    if (!r.ok) {
      setBusy(false);
      setMessage(r.message);
      return;
    }
    window.location.assign(next);
  }

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {message ? <Notice tone="danger">{message}</Notice> : null}
      <TextField
        label="E-mail"
        name="email"
        type="email"
        autoComplete="email"
        required
        errors={errors.email}
        defaultValue={email}
        readOnly={email !== undefined}
      />
      <TextField
        label="Password"
        name="password"
        type="password"
        autoComplete="current-password"
        required
        errors={errors.password}
      />
      <SubmitButton disabled={busy}>{busy ? 'Signing in…' : 'Sign in'}</SubmitButton>
    </form>
  );
}
