/**
 * A signed-event body as the payment service sends it when a checkout completes and is paid
 * (the fields our webhook reads). Pure: safe to import from tests that start the server in a child process.
 */
export type CompletedCheckout = { sessionId: string; amount: number; invoiceId: number; studioId: number; currency?: string; paymentIntent?: string };

export function checkoutCompletedEvent(id: string, s: CompletedCheckout, at: Date = new Date()): string {
  return JSON.stringify({
    id,
    object: 'event',
    type: 'checkout.session.completed',
    created: Math.floor(at.getTime() / 1000),
    data: {
      object: {
        id: s.sessionId,
        object: 'checkout.session',
        status: 'complete',
        payment_status: 'paid',
        amount_total: s.amount,
        currency: s.currency ?? 'eur',
        payment_intent: s.paymentIntent ?? `pi_test_${id}`,
        metadata: { invoiceId: String(s.invoiceId), studioId: String(s.studioId) },
      },
    },
  });
}
