import { appOrigin } from './origin';

/** Where a person lands after signing in when no (acceptable) target was given. */
export const DEFAULT_AFTER_SIGN_IN = '/coops';

/**
 * The post-sign-in target from `?next=`: only a path on the app's own origin, decided by the URL
 * API the way a browser would read it (so `/\evil.example`, `/<tab>/evil.example`,
 * `https://evil.example` and `javascript:` all resolve elsewhere and are refused). Returns the
 * normalised path, query and fragment, or `fallback`.
 */
export function safeNextPath(next: string | null | undefined, fallback = DEFAULT_AFTER_SIGN_IN): string {
  if (typeof next !== 'string' || next === '' || next.length > 2000 || !next.startsWith('/')) return fallback;
  const base = appOrigin() ?? 'http://app.invalid';
  let url: URL;
  try {
    url = new URL(next, base);
  } catch {
    return fallback;
  }
  if (url.origin !== new URL(base).origin) return fallback;
  const path = `${url.pathname}${url.search}${url.hash}`;
  // A normalised path that starts with two slashes (from `/.//evil.example`) would be read as
  // another host when the browser follows it.
  if (!path.startsWith('/') || path.startsWith('//') || path.startsWith('/\\')) return fallback;
  return path;
}
