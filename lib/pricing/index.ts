export { memberPriceCentsPerGallon, drawCharge, drawChargeCents, DECLARED_USES } from './member-price';
export type { PricingPolicy, PricingPolicyKind, DeclaredUse, PriceBreakdown, DrawCharge } from './member-price';
