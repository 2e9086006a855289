import { NextResponse, type NextRequest } from 'next/server';
import { COMMON_HEADERS, HSTS, pageCsp } from '@/lib/security/headers';
import { servedOverHttps } from '@/lib/security/origin';

// Security headers for pages, with a fresh Content-Security-Policy nonce per request. Next.js reads
// the nonce from the request's CSP header and puts it on every script it renders, which is why
// every page renders per request (app/layout.tsx awaits connection()). No authorization happens
// here: each page and route handler checks the session itself.

export function proxy(request: NextRequest) {
  const nonce = Buffer.from(crypto.getRandomValues(new Uint8Array(18))).toString('base64');
  const csp = pageCsp(nonce, process.env.NODE_ENV === 'development');
  const requestHeaders = new Headers(request.headers);
  requestHeaders.set('content-security-policy', csp);
  requestHeaders.set('x-nonce', nonce);
  const response = NextResponse.next({ request: { headers: requestHeaders } });
  response.headers.set('content-security-policy', csp);
  for (const [k, v] of Object.entries(COMMON_HEADERS)) response.headers.set(k, v);
  if (servedOverHttps(request.url)) response.headers.set('strict-transport-security', HSTS);
  return response;
}

export const config = {
  matcher: [
    {
      // Pages only: route handlers get their headers from handler() (lib/http.ts), static files
      // from next.config.mjs. Prefetches carry no document, so they skip the nonce.
      source: '/((?!api/|_next/static|_next/image|favicon.ico).*)',
      missing: [
        { type: 'header', key: 'next-router-prefetch' },
        { type: 'header', key: 'purpose', value: 'prefetch' },
      ],
    },
  ],
};
