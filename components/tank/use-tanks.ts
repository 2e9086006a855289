'use client';

import useSWR from 'swr';
import { apiClient, dataOrThrow, type paths } from '@/lib/api/client';

/** GET /api/coops/{coop}/tanks as the typed client declares it. */
export type TanksResponse = paths['/api/coops/{coop}/tanks']['get']['responses'][200]['content']['application/json'];

/** The SWR key for a co-op's tanks; forms that change a tank revalidate it with mutate(key). */
export const tanksKey = (coopSlug: string) => `/api/coops/${coopSlug}/tanks`;

/** Refresh interval for the live tank figures (members watch "available" while deciding). */
export const TANKS_REFRESH_MS = 4000;

/** The co-op's tanks through the typed client, refreshed every few seconds, seeded with the server's figures. */
export function useTanks(coopSlug: string, initial: TanksResponse) {
  return useSWR(
    tanksKey(coopSlug),
    () => dataOrThrow(apiClient.GET('/api/coops/{coop}/tanks', { params: { path: { coop: coopSlug } } })),
    { fallbackData: initial, refreshInterval: TANKS_REFRESH_MS, revalidateOnMount: false },
  );
}
