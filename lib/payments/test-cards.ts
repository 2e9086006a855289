/**
 * Cards a member may "use" in development and tests. These are the payment fake's test tokens
 * (stripe-stateful-mock understands them); nobody ever types card data into Tallyvat. In
 * production this choice would be replaced by the provider's hosted card field (Stripe Elements),
 * which hands the server a token in the same place. Pure: safe for client components.
 */
export const TEST_CARDS = [
  { token: 'tok_visa', label: 'Test Visa ending 4242 — approved' },
  { token: 'tok_mastercard', label: 'Test Mastercard ending 4444 — approved' },
  { token: 'tok_chargeDeclined', label: 'Test card — declined by the bank' },
  { token: 'tok_chargeDeclinedInsufficientFunds', label: 'Test card — insufficient funds' },
] as const;

export type TestCardToken = (typeof TEST_CARDS)[number]['token'];
export const TEST_CARD_TOKENS = TEST_CARDS.map((c) => c.token) as unknown as readonly [TestCardToken, ...TestCardToken[]];
