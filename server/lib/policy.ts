import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { decimalId, MAX_ID, type Role } from '../../shared/schemas/common';
import { readFirst, type Db } from './db';
import { errors } from './errors';

export type AuthUser = { id: number; email: string; name: string; emailNotices: boolean };
export type Member = { studioId: number; role: Role; clientId: number | null };

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport's Express.User is the signed-in person
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends AuthUser {}
    interface Request {
      member?: Member;
    }
  }
}

/** Marks a handler as a policy, so the route table can insist that every route starts with one. */
export const POLICY = Symbol('policy');
/** Who a route declares it lets through, readable from the router (the security tests build their matrix from it). */
export type DeclaredPolicy = { kind: 'public' | 'signed-in' | 'allow'; roles: Role[] };
type Policy = RequestHandler & { [POLICY]: string; declared: DeclaredPolicy };

function mark(fn: RequestHandler, label: string, declared: DeclaredPolicy): Policy {
  return Object.assign(fn, { [POLICY]: label, declared: { kind: declared.kind, roles: [...declared.roles] } });
}

export const isPolicy = (fn: unknown): fn is Policy => typeof fn === 'function' && POLICY in fn;

/** Anyone, signed in or not (public pages, sign-in, webhooks with their own signature check). */
export const publicRoute = () => mark((_req, _res, next) => next(), 'public', { kind: 'public', roles: [] });

/** Any signed-in person, no studio involved. */
export const signedIn = () =>
  mark((req, _res, next) => {
    if (!req.user) throw errors.unauthenticated();
    next();
  }, 'signed-in', { kind: 'signed-in', roles: [] });

/**
 * Studio routes: the caller must be a member of :studioId with one of the roles.
 * A non-member gets 404 (no existence leak); a member with another role gets 403.
 */
export function allowFactory(db: Db) {
  return (...roles: Role[]) =>
    mark(async (req: Request, _res: Response, next: NextFunction) => {
      if (!req.user) throw errors.unauthenticated();
      const raw = String(req.params.studioId);
      const studioId = decimalId.test(raw) ? Number(raw) : Number.NaN;
      if (!Number.isSafeInteger(studioId) || studioId <= 0 || studioId > MAX_ID) throw errors.notFound();
      const row = await readFirst<{ role: Role; client_id: number | null }>(
        db,
        db('memberships as m')
          .leftJoin('clients as c', function () {
            this.on('c.studio_id', '=', 'm.studio_id').andOn('c.user_id', '=', 'm.user_id');
          })
          .where({ 'm.studio_id': studioId, 'm.user_id': req.user.id })
          .select('m.role', 'c.id as client_id'),
      );
      // a non-member learns nothing (404); the log says why
      if (!row) throw Object.assign(errors.notFound(), { refusal: 'not-a-member' });
      if (!roles.includes(row.role)) throw errors.forbidden();
      req.member = { studioId, role: row.role, clientId: row.client_id ?? null };
      next();
    }, `allow(${roles.join(',')})`, { kind: 'allow', roles });
}

export type Allow = ReturnType<typeof allowFactory>;

/** The member set by allow(); routes behind allow() may rely on it. */
export function member(req: Request): Member {
  if (!req.member) throw new Error('member() used on a route without allow()');
  return req.member;
}

export function user(req: Request): AuthUser {
  if (!req.user) throw errors.unauthenticated();
  return req.user;
}
