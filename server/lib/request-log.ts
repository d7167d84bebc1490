import crypto from 'node:crypto';
import type { IncomingMessage } from 'node:http';
import type { RequestHandler } from 'express';
import type { Logger } from 'pino';
import { hideTokens } from './security-log';

declare module 'http' {
  interface IncomingMessage {
    /** This request's id, also sent back as X-Request-Id and quoted in a 500's message. */
    id: string;
    /** The logger for lines about this request: each carries its id. */
    log: Logger;
  }
}

/** How a request appears in a log line: method, path with tokens hidden, the request id and the peer; never headers or body. */
export const requestSerializer = (r: IncomingMessage & { originalUrl?: string }) => ({
  id: r.id,
  method: r.method,
  url: hideTokens(r.originalUrl ?? r.url ?? ''),
  remoteAddress: r.socket?.remoteAddress,
});

/**
 * Gives every request an id (X-Request-Id) and a `req.log` that stamps it on each line. The child logger
 * is made only when a line is written: most requests write none, and making one per request cost more
 * than some routes do (measured with `npm run bench`). With `eachRequest` (log level debug or trace) a
 * line is written for every answer, with its status and time.
 */
export function requestLog(log: Logger, opts: { eachRequest: boolean }): RequestHandler {
  return (req, res, next) => {
    const id = crypto.randomUUID();
    req.id = id;
    res.setHeader('x-request-id', id);
    let child: Logger | undefined;
    Object.defineProperty(req, 'log', { configurable: true, get: () => (child ??= log.child({ reqId: id })) });
    if (opts.eachRequest) {
      const started = performance.now();
      res.on('finish', () => req.log.info({ req, res: { statusCode: res.statusCode }, responseTime: Math.round(performance.now() - started) }, 'request completed'));
    }
    next();
  };
}
