/**
 * The app's own origin (scheme, host and port), as configured for links and cookies (APP_URL,
 * else NEXTAUTH_URL); null when neither is set. Read once per process.
 */
let configured: string | null | undefined;
export function appOrigin(): string | null {
  if (configured !== undefined) return configured;
  const raw = process.env.APP_URL ?? process.env.NEXTAUTH_URL ?? '';
  try {
    configured = raw ? new URL(raw).origin : null;
  } catch {
    configured = null;
  }
  return configured;
}

/** True when the app is served over https (its configured origin, or this request's URL). */
export function servedOverHttps(requestUrl?: string): boolean {
  return (appOrigin() ?? '').startsWith('https:') || (requestUrl ?? '').startsWith('https:');
}

/**
 * Whether a state-changing request comes from the app's own pages. Browsers send `Origin` on every
 * POST, PUT, PATCH and DELETE; it must be the configured origin, or the scheme and `Host` the
 * request was addressed to (a browser on another site can't choose the Host it sends). Without `Origin`, only `Sec-Fetch-Site: same-origin` counts. A request with
 * neither (or `Origin: null`, sent by sandboxed frames and after cross-site redirects) is refused:
 * another site's form or script cannot forge these headers, so this stops cross-origin writes,
 * including from sibling sites that `SameSite=Lax` cookies would let through.
 */
export function isSameOriginRequest(req: Request): boolean {
  const origin = req.headers.get('origin');
  if (origin === null) return req.headers.get('sec-fetch-site') === 'same-origin';
  if (origin === 'null') return false;
  if (origin === appOrigin()) return true;
  const host = req.headers.get('host');
  if (!host) return false;
  try {
    return origin === `${new URL(req.url).protocol}//${host}`;
  } catch {
    return false;
  }
}
