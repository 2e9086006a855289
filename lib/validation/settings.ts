import { z } from 'zod';
import { safeParseMoneyToCents } from '@/lib/money';
import { timeZoneSchema } from './common';

/** Co-op settings an admin may change. Money arrives as text ("15.00") and is kept in cents. */
export const coopSettingsUpdateSchema = z.strictObject({
  name: z.string().trim().min(3, 'At least 3 characters.').max(120, 'At most 120 characters.'),
  units: z.enum(['us', 'metric'], { error: 'Choose US gallons/°F or litres/°C.' }),
  timezone: timeZoneSchema,
  monthlyDues: z
    .string()
    .trim()
    .max(12)
    .transform((s, ctx) => {
      const r = safeParseMoneyToCents(s === '' ? '0' : s);
      if (!r.ok || r.cents < 0) {
        ctx.addIssue({ code: 'custom', message: 'An amount such as 15.00 (zero or more).' });
        return z.NEVER;
      }
      return r.cents;
    }),
  selfServeDraws: z.boolean({ error: 'Yes or no.' }),
  catalyst: z.enum(['KOH', 'NaOH'], { error: 'KOH or NaOH.' }),
  baseGramsPerLiter: z.coerce.number({ error: 'A number.' }).gt(0, 'More than 0 g/L.').max(20, 'At most 20 g/L.'),
  purityPct: z.coerce.number({ error: 'A number.' }).gt(0, 'More than 0 %.').max(100, 'At most 100 %.'),
  methanolPct: z.coerce.number({ error: 'A number.' }).min(10, 'At least 10 %.').max(40, 'At most 40 %.'),
  qualityStandard: z.enum(['ASTM D6751', 'EN 14214'], { error: 'ASTM D6751 or EN 14214.' }),
  /** Elevation of the brewing site in the co-op's units (feet for US units, metres for metric); blank = unchanged. */
  elevation: z.preprocess(
    (v) => (v === '' || v === null ? undefined : v),
    z.coerce
      .number({ error: 'A number.' })
      .min(-1640, 'At least −1,640 (ft) / −500 (m).')
      .max(16_400, 'At most 16,400 (ft) / 5,000 (m).')
      .optional(),
  ),
});
export type CoopSettingsUpdate = z.infer<typeof coopSettingsUpdateSchema>;
