'use client';

/** next-auth's CSRF token, which its sign-in and sign-out endpoints require. */
async function csrfToken(): Promise<string> {
  return ((await (await fetch('/api/auth/csrf')).json()) as { csrfToken: string }).csrfToken;
}

/**
 * Ends this browser's session through next-auth's sign-out endpoint, then opens `callbackUrl`
 * (a full load, so nothing of the signed-in pages stays in memory). The same endpoint
 * next-auth's own client calls, without loading that client on every page.
 */
export async function signOutTo(callbackUrl: string): Promise<void> {
  try {
    await fetch('/api/auth/signout', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ csrfToken: await csrfToken(), callbackUrl, json: 'true' }),
    });
  } finally {
    window.location.assign(callbackUrl);
  }
}

/**
 * Signs in through next-auth's credentials endpoint (csrf token + form post) and says what
 * happened in words a person can act on. Used by the sign-in form, after accepting an
 * invitation, and after a password change (which ends the current session too).
 */
export async function signInWithPassword(
  email: string,
  password: string,
): Promise<{ ok: true } | { ok: false; message: string }> {
  try {
    const res = await fetch('/api/auth/callback/credentials', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ csrfToken: await csrfToken(), email, password, json: 'true' }),
    });
    const data = await res.json().catch(() => ({}));
    if (res.status === 429) return { ok: false, message: data.error ?? 'Too many attempts. Try again later.' };
    const error = data.url ? new URL(data.url, window.location.href).searchParams.get('error') : 'unknown';
    if (!res.ok || error) {
      return {
        ok: false,
        message:
          error === 'RATE_LIMITED'
            ? 'Too many failed sign-ins. Wait 15 minutes or reset your password.'
            : 'That e-mail and password do not match an account.',
      };
    }
    return { ok: true };
  } catch {
    return { ok: false, message: 'Could not reach Tallyvat. Check your connection and try again.' };
  }
}
