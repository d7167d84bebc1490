import type { Request, RequestHandler, Response, Router } from 'express';
import { keptJson } from './kept-json';
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
