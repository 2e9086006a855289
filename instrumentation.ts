import type { Instrumentation } from 'next';

/** Marks an error this file has logged, so Next's own plain-text copy of it is not printed too. */
const LOGGED = Symbol.for('tallyvat.logged');

type Marked = { [LOGGED]?: boolean };

/**
 * Next prints every page error itself after `onRequestError` has seen it; errors logged below are
 * marked, and their second, plain-text copy is dropped here so each error is in the log once.
 */
export async function register() {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  const print = console.error.bind(console);
  console.error = (...args: unknown[]) => {
    if (args.some((a) => typeof a === 'object' && a !== null && (a as Marked)[LOGGED])) return;
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
  if (outage.isDatabaseUnavailable(error)) {
    outage.noteDatabaseUnavailable(error);
  } else {
    const digest = (error as { digest?: string }).digest;
    log.error({ digest, method: request.method, route: request.path, routePath: context.routePath, routeType: context.routeType, err: error }, 'page error');
  }
  if (typeof error === 'object' && error !== null) (error as Marked)[LOGGED] = true;
};
