import type { Instrumentation } from 'next';

/**
 * Next prints every page error in plain text as well as handing it to `onRequestError` below. The
 * plain copy is dropped for the errors `onRequestError` logs — render errors, which carry a digest —
 * and for an unreachable database (logged once per outage), so each error is in the log once.
 */
export async function register() {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  const { isDatabaseUnavailable, noteDatabaseUnavailable } = await import('@/lib/db-outage');
  const print = console.error.bind(console);
  console.error = (...args: unknown[]) => {
    const err = args.find((a): a is Error & { digest?: unknown } => a instanceof Error);
    if (err && isDatabaseUnavailable(err)) return noteDatabaseUnavailable(err);
    if (err && typeof err.digest === 'string') return;
    print(...args);
  };
}

/**
 * Errors thrown while rendering a page (route handlers answer their own errors in lib/http.ts):
 * logged once as a JSON line with the digest the error page shows, so a person can quote it. An
 * unreachable database is logged once per outage (lib/db-outage.ts), not on every page view.
 */
export const onRequestError: Instrumentation.onRequestError = async (error, request, context) => {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  const [{ log }, outage] = await Promise.all([import('@/lib/log'), import('@/lib/db-outage')]);
  if (outage.isDatabaseUnavailable(error)) return outage.noteDatabaseUnavailable(error);
  const digest = (error as { digest?: string }).digest;
  log.error(
    {
      digest,
      method: request.method,
      route: request.path,
      routePath: context.routePath,
      routeType: context.routeType,
      err: error,
    },
    'page error',
  );
};
