import type { ClientCall, FormSchema } from '@/components/forms/use-api-form';
import { apiClient, type paths } from '@/lib/api/client';

// The routes a configured step form (StepForm, QualityForm) saves to, each with the schema its
// handler parses with. Their inputs are listed in the page's field configuration, so the body is
// built by name; the schema checks it before anything is sent.

type JsonBody<P extends keyof paths, M extends keyof paths[P]> = paths[P][M] extends {
  requestBody?: { content: { 'application/json': infer B } };
}
  ? B
  : never;

export interface StepTarget {
  schema: FormSchema;
  call: (body: Record<string, unknown>) => ClientCall<unknown>;
}

/** The route behind a step form's API address and method; null for one no step form saves to. */
export function stepTarget(url: string, method: string): StepTarget | null {
  const batch = /^\/api\/coops\/([^/]+)\/batches\/(\d+)(\/review(\/close)?)?$/.exec(url);
  if (batch) {
    const path = { coop: batch[1]!, id: batch[2]! };
    if (!batch[3] && method === 'PATCH') {
      return {
        schema: 'batchUpdateSchema',
        call: (b) =>
          apiClient.PATCH('/api/coops/{coop}/batches/{id}', {
            params: { path },
            body: b as JsonBody<'/api/coops/{coop}/batches/{id}', 'patch'>,
          }),
      };
    }
    if (batch[4] && method === 'POST') {
      return {
        schema: 'reviewCloseSchema',
        call: (b) =>
          apiClient.POST('/api/coops/{coop}/batches/{id}/review/close', {
            params: { path },
            body: b as JsonBody<'/api/coops/{coop}/batches/{id}/review/close', 'post'>,
          }),
      };
    }
    if (batch[3] && method === 'POST') {
      return {
        schema: 'reviewOpenSchema',
        call: (b) =>
          apiClient.POST('/api/coops/{coop}/batches/{id}/review', {
            params: { path },
            body: b as JsonBody<'/api/coops/{coop}/batches/{id}/review', 'post'>,
          }),
      };
    }
  }
  const tank = /^\/api\/coops\/([^/]+)\/tanks\/(\d+)$/.exec(url);
  if (tank && method === 'PATCH') {
    const path = { coop: tank[1]!, tankId: tank[2]! };
    return {
      schema: 'tankUpdateSchema',
      call: (b) =>
        apiClient.PATCH('/api/coops/{coop}/tanks/{tankId}', {
          params: { path },
          body: b as JsonBody<'/api/coops/{coop}/tanks/{tankId}', 'patch'>,
        }),
    };
  }
  return null;
}
