'use client';

/**
 * Signs in through next-auth's credentials endpoint (csrf token + form post) and says what
 * happened in words a person can act on. Used by the sign-in form, after accepting an
 * invitation, and after a password change (which ends the current session too).
 */
export async function signInWithPassword(email: string, password: string): Promise<{ ok: true } | { ok: false; message: string }> {
  try {
    const { csrfToken } = await (await fetch('/api/auth/csrf')).json();
    const res = await fetch('/api/auth/callback/credentials', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ csrfToken, email, password, json: 'true' }),
    });
    const data = await res.json().catch(() => ({}));
    if (res.status === 429) return { ok: false, message: data.error ?? 'Too many attempts. Try again later.' };
    const error = data.url ? new URL(data.url, window.location.href).searchParams.get('error') : 'unknown';
    if (!res.ok || error) {
      return {
        ok: false,
        message: error === 'RATE_LIMITED' ? 'Too many failed sign-ins. Wait 15 minutes or reset your password.' : 'That e-mail and password do not match an account.',
      };
    }
    return { ok: true };
  } catch {
    return { ok: false, message: 'Could not reach Tallyvat. Check your connection and try again.' };
  }
}
