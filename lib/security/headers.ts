// The security headers Tallyvat sends, in one place: proxy.ts puts them on pages, lib/http.ts's
// handler() and next.config.mjs on everything else, and file downloads carry DOWNLOAD_CSP.

/**
 * For anything that is not a page (JSON, PDFs, CSV, uploaded files): nothing may load, run or
 * frame it, and a document opened anyway is sandboxed (no scripts, no same-origin access).
 */
export const DOWNLOAD_CSP = "default-src 'none'; frame-ancestors 'none'; sandbox";

/** Two years, sub-domains included; sent only when the app is served over https. */
export const HSTS = 'max-age=63072000; includeSubDomains';

/** Browser features the app never uses, switched off for it and anything it embeds. */
export const PERMISSIONS_POLICY =
  'camera=(), microphone=(), geolocation=(), payment=(), usb=(), serial=(), hid=(), midi=()';

/** Headers every response carries (also set for static files in next.config.mjs). */
export const COMMON_HEADERS: Readonly<Record<string, string>> = {
  'x-frame-options': 'DENY',
  'x-content-type-options': 'nosniff',
  'referrer-policy': 'strict-origin-when-cross-origin',
  'permissions-policy': PERMISSIONS_POLICY,
  'cross-origin-opener-policy': 'same-origin',
};

/**
 * The Content-Security-Policy of a page: scripts only with this request's nonce (Next.js puts it
 * on its own scripts; 'strict-dynamic' lets those load the page's chunks), no plugins, no
 * framing, forms and the base URL on the app's own origin. Styles allow 'unsafe-inline' because
 * the chart library and Next.js write style attributes; styles can't run code. Development adds
 * 'unsafe-eval' for React's debugging and the dev server's websocket.
 */
export function pageCsp(nonce: string, dev = false): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ''}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    `connect-src 'self'${dev ? ' ws: wss:' : ''}`,
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    "frame-src 'none'",
    "worker-src 'self' blob:",
    "manifest-src 'self'",
  ].join('; ');
}
