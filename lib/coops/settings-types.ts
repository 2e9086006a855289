import type { z } from 'zod';
import type { coopSettingsSchema } from '@/lib/api/dto/core';

/** What the settings form shows: the co-op's columns plus its settings with defaults filled in (the API's CoopSettings). */
export type CoopSettingsDto = z.infer<typeof coopSettingsSchema>;
