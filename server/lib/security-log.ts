import crypto from 'node:crypto';
import type { Request } from 'express';

/** Long random-looking path segments (invitation and calendar-feed tokens) never reach the log. */
export const hideTokens = (url: string) => url.replace(/[A-Za-z0-9_-]{20,}/g, ':token');

/** An e-mail address appears in the log only as a short one-way hash: lines about one account match, the address is not kept. */
export const accountRef = (email: unknown) =>
  typeof email === 'string' && email ? crypto.createHash('sha256').update(email.trim().toLowerCase()).digest('hex').slice(0, 16) : undefined;

/** Who asked for what, without secrets: method, the route's pattern (or the path with tokens hidden), the person, the address. */
export function requester(req: Request) {
  // in the error handler the router's mount point is gone from baseUrl; the API router sits on /api
  const base = req.baseUrl || (req.originalUrl.startsWith('/api/') ? '/api' : '');
  const route = req.route?.path ? `${base}${String(req.route.path)}` : hideTokens(req.originalUrl.split('?')[0]);
  return { method: req.method, route, userId: req.user?.id ?? null, ip: req.ip };
}

/** Refusals worth a line in the log (ASVS 7.1.3, 7.2.1, 7.2.2); a plain "please sign in" is not one of them. */
export const LOGGED_REFUSALS = new Set(['invalid_credentials', 'throttled', 'csrf', 'forbidden']);

/** Log paths pino hides wherever they appear: cookies, CSRF tokens, payment signatures, passwords. */
export const REDACTED = [
  'req.headers.cookie',
  'req.headers["x-csrf-token"]',
  'req.headers.authorization',
  'req.headers["stripe-signature"]',
  'res.headers["set-cookie"]',
  '*.password',
  '*.token',
];
