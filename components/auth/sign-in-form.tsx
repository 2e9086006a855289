'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { signInSchema } from '@/lib/validation/auth';

/**
 * Signs in through next-auth's credentials endpoint directly (csrf token + form post), so a
 * 429 from the rate limit reaches the person as a clear message.
 */
export function SignInForm({ next }: { next: string }) {
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    setMessage(null);
    const form = new FormData(e.currentTarget);
    const parsed = signInSchema.safeParse({ email: form.get('email'), password: form.get('password') });
    if (!parsed.success) {
      const fe: Record<string, string[]> = {};
      for (const i of parsed.error.issues) (fe[String(i.path[0])] ??= []).push(i.message);
      setErrors(fe);
      return;
    }
    setErrors({});
    setBusy(true);
    try {
      const { csrfToken } = await (await fetch('/api/auth/csrf')).json();
      const res = await fetch('/api/auth/callback/credentials', {
        method: 'POST',
        headers: { 'content-type': 'application/x-www-form-urlencoded' },
        body: new URLSearchParams({ csrfToken, email: parsed.data.email, password: parsed.data.password, json: 'true' }),
      });
      const data = await res.json().catch(() => ({}));
      if (res.status === 429) return setMessage(data.error ?? 'Too many attempts. Try again later.');
      const error = data.url ? new URL(data.url, window.location.href).searchParams.get('error') : 'unknown';
      if (!res.ok || error) {
        setMessage(error === 'RATE_LIMITED' ? 'Too many failed sign-ins. Wait 15 minutes or reset your password.' : 'That e-mail and password do not match an account.');
        return;
      }
      window.location.assign(next);
    } catch {
      setMessage('Could not reach Tallyvat. Check your connection and try again.');
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {message ? <Notice tone="danger">{message}</Notice> : null}
      <TextField label="E-mail" name="email" type="email" autoComplete="email" required errors={errors.email} />
      <TextField label="Password" name="password" type="password" autoComplete="current-password" required errors={errors.password} />
      <Button type="submit" disabled={busy}>{busy ? 'Signing in…' : 'Sign in'}</Button>
    </form>
  );
}
