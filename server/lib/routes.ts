import type { Request, RequestHandler, Response, Router } from 'express';
import { isPolicy, type DeclaredPolicy } from './policy';

type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

/**
 * The one way to add an API route: the first handler must be a policy (publicRoute, signedIn, allow),
 * so no route can exist without declaring who may call it.
 */
export function routeTable(router: Router) {
  const add =
    (method: Method) =>
    (path: string, policy: RequestHandler, ...handlers: RequestHandler[]) => {
      if (!isPolicy(policy)) throw new Error(`${method.toUpperCase()} ${path}: the first handler must be a policy`);
      router[method](path, policy, ...handlers);
    };
  return { get: add('get'), post: add('post'), put: add('put'), patch: add('patch'), delete: add('delete') };
}

export type RouteTable = ReturnType<typeof routeTable>;

/** Wraps a handler that returns the response body; `status` for 201, and 204 when it returns nothing. */
export const json =
  (fn: (req: Request, res: Response) => unknown, status = 200): RequestHandler =>
  async (req, res) => {
    const body = await fn(req, res);
    if (res.headersSent) return;
    if (body === undefined) res.status(204).end();
    else {
      const kept = keptJson(body);
      if (kept) res.status(status).type('json').send(kept);
      else res.status(status).json(body);
    }
  };

/** The UTF-8 JSON of frozen values, by identity (see keptJson). */
const keptBytes = new WeakMap<object, Buffer>();
const isObject = (v: unknown): v is object => typeof v === 'object' && v !== null;
function bytesOf(v: object): Buffer {
  let bytes = keptBytes.get(v);
  if (!bytes) keptBytes.set(v, (bytes = Buffer.from(JSON.stringify(v))));
  return bytes;
}

/**
 * The body as UTF-8 JSON when it is, or holds at its top level, a value kept frozen (keptReads freezes what it
 * keeps: server/lib/version-cache.ts), else undefined. A frozen value cannot change, so its JSON is written out
 * once and kept beside it for as long as it is kept itself (a WeakMap): an unchanged kept list is not
 * serialised again on every request. The bytes are those JSON.stringify gives: keys in their order, properties
 * whose value JSON leaves out (undefined, functions, symbols) left out.
 */
export function keptJson(body: unknown): Buffer | undefined {
  if (!isObject(body)) return undefined;
  if (Object.isFrozen(body)) return bytesOf(body);
  if (Array.isArray(body) || Object.getPrototypeOf(body) !== Object.prototype || 'toJSON' in body) return undefined;
  const entries = Object.entries(body);
  if (!entries.some(([, v]) => isObject(v) && Object.isFrozen(v))) return undefined;
  const parts: Buffer[] = [];
  for (const [k, v] of entries) {
    const text = isObject(v) && Object.isFrozen(v) ? bytesOf(v) : JSON.stringify(v);
    if (text === undefined) continue;
    parts.push(Buffer.from(`${parts.length ? ',' : '{'}${JSON.stringify(k)}:`), typeof text === 'string' ? Buffer.from(text) : text);
  }
  parts.push(Buffer.from(parts.length ? '}' : '{}'));
  return Buffer.concat(parts);
}

/** The parsed params/query from validate(). */
export const params = <T = Record<string, number>>(res: Response) => res.locals.params as T;
export const query = <T>(res: Response) => res.locals.query as T;

/**
 * Lists `METHOD /api/path` for every route on the API router, read from Express itself, with the policy each
 * route declares (its first handler: public, signed-in, or allow(...roles)).
 */
export function listRoutes(router: Router): { method: string; path: string; policy: DeclaredPolicy | null }[] {
  const out: { method: string; path: string; policy: DeclaredPolicy | null }[] = [];
  type Layer = { route?: { path: string; methods: Record<string, boolean>; stack?: { handle: unknown }[] } };
  for (const layer of (router as unknown as { stack: Layer[] }).stack) {
    if (!layer.route) continue;
    const first = layer.route.stack?.[0]?.handle;
    const policy = isPolicy(first) ? { kind: first.declared.kind, roles: [...first.declared.roles] } : null;
    for (const m of Object.keys(layer.route.methods)) if (m !== '_all') out.push({ method: m.toUpperCase(), path: `/api${layer.route.path}`, policy });
  }
  return out;
}
