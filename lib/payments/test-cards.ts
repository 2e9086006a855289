/**
 * Cards a member may "use" in development and tests, in Tallyvat's own words. The screen and
 * the API speak of the neutral ids; only the payments adapter (lib/payments) turns an id into
 * the payment fake's token. Nobody ever types card data into Tallyvat; a live installation
 * would take a token from the provider's own hosted card field in the same place (see README).
 * Pure: safe for client components.
 */
export const TEST_CARDS = [
  { id: 'test-approved', label: 'Test card — approved', fakeToken: 'tok_visa' },
  { id: 'test-declined', label: 'Test card — declined', fakeToken: 'tok_chargeDeclined' },
  {
    id: 'test-insufficient-funds',
    label: 'Test card — insufficient funds',
    fakeToken: 'tok_chargeDeclinedInsufficientFunds',
  },
] as const;

export type TestCardId = (typeof TEST_CARDS)[number]['id'];
export const TEST_CARD_IDS = TEST_CARDS.map((c) => c.id) as unknown as readonly [TestCardId, ...TestCardId[]];

/** The payment fake's token for a test card id (anything else is passed on unchanged). */
export function fakeCardToken(cardId: string): string {
  return TEST_CARDS.find((c) => c.id === cardId)?.fakeToken ?? cardId;
}
