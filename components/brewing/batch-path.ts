/**
 * The typed client's path parameters of a batch's API address (`/api/coops/riverbend/batches/12`
 * → `{ coop: 'riverbend', id: '12' }`): the batch page hands its forms that address.
 */
export function batchPath(url: string): { coop: string; id: string } {
  const m = /^\/api\/coops\/([^/]+)\/batches\/(\d+)/.exec(url);
  return { coop: m?.[1] ?? '', id: m?.[2] ?? '' };
}
