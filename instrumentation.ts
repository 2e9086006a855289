import type { Instrumentation } from 'next';

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
    return;
  }
  const digest = (error as { digest?: string }).digest;
  log.error({ digest, method: request.method, route: request.path, routePath: context.routePath, routeType: context.routeType, err: error }, 'page error');
};
