import 'server-only';
import { AsyncLocalStorage } from 'node:async_hooks';

/**
 * What one API request carries past its route handler's arguments: its method (a read-only
 * token may only read) and, once requireMember has accepted a personal access token, that
 * token's id, which lib/audit records beside the person on every change the request makes.
 * Set by handler() (lib/http.ts); absent in pages, server actions and the job worker.
 */
export interface RequestContext {
  method: string;
  apiTokenId?: number;
}

export const requestContext = new AsyncLocalStorage<RequestContext>();
