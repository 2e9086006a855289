export { roundHalfUp, multiplyCents, sumCents, allocate, assertCents } from './rounding';
export {
  formatCents,
  formatRateCents,
  parseMoneyToCents,
  safeParseMoneyToCents,
  CENTS_PER_UNIT,
  INVOICE_ROUNDING_NOTE,
} from './format';
export type { MoneyParseResult } from './format';
