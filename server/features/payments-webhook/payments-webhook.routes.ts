import { publicRoute } from '../../lib/policy';
import { json, type RouteTable } from '../../lib/routes';
import type { PaymentsWebhookService } from './payments-webhook.service';

/** The one route without CSRF: the payment service signs its events, and the body arrives raw (app.ts). */
export function paymentsWebhookRoutes(r: RouteTable, deps: { webhook: PaymentsWebhookService }) {
  r.post('/webhooks/payments', publicRoute(), json(async (req) => ({ received: (await deps.webhook.receive(req.body, req.get('stripe-signature'))).received })));
}
