import type { RequestHandler } from 'express';
import type { ZodType } from 'zod';
import { dropUnclosedBidiDeep } from '../../shared/text';
import { AppError } from './errors';

type Schemas = { body?: ZodType; query?: ZodType; params?: ZodType };

/** Turns zod issues into `{ "address.city": "message" }`, one message per field. */
export function fieldErrors(issues: { path: PropertyKey[]; message: string }[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of issues) {
    const key = issue.path.map(String).join('.') || '_';
    out[key] ??= issue.message;
  }
  return out;
}

export function parseOrThrow<T>(schema: ZodType<T>, value: unknown, where = 'body'): T {
  const r = schema.safeParse(value);
  if (!r.success) {
    throw new AppError(400, 'invalid', where === 'body' ? 'Some fields need a look.' : `The ${where} is not valid.`, fieldErrors(r.error.issues));
  }
  return r.data;
}

/**
 * Validates and replaces req.body / req.query / req.params with the parsed values.
 * Express 5 makes req.query a getter, so the parsed query is stored on res.locals.query as well.
 */
export function validate(schemas: Schemas): RequestHandler {
  return (req, res, next) => {
    if (schemas.params) {
      const r = schemas.params.safeParse(req.params);
      if (!r.success) throw new AppError(404, 'not_found', 'That was not found.');
      res.locals.params = r.data;
    }
    if (schemas.query) res.locals.query = parseOrThrow(schemas.query, req.query, 'query');
    // A bidirectional override a text leaves open is dropped (shared/text.ts), so no name or note can turn
    // the app's own words after it backwards on a screen, in an e-mail or a document.
    if (schemas.body) req.body = dropUnclosedBidiDeep(parseOrThrow(schemas.body, req.body ?? {}, 'body'), (key) => /password/i.test(key));
    next();
  };
}
