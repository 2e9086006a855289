export { roundHalfUp, multiplyCents, sumCents, allocate, assertCents } from './rounding';
export { formatCents, formatRateCents, parseMoneyToCents, safeParseMoneyToCents, CENTS_PER_UNIT } from './format';
export type { MoneyParseResult } from './format';
