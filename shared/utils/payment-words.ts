/**
 * A payment's state in words, the same on every page: a card declined is "declined" (the provider's word), a payment
 * page left without paying is "not paid"; neither charged anything.
 */
export const PAYMENT_STATE_WORDS: Record<string, string> = {
  unpaid: 'not paid',
  pending: '○ pending: waiting for the provider',
  paid: '✓ paid',
  failed: '✕ declined: nothing was charged',
  cancelled: 'not paid: the payment page was left, nothing was charged',
  refunded: 'refunded',
}
