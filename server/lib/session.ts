import type { Request } from 'express';
import type { AuthUser } from './policy';

declare module 'express-session' {
  interface SessionData {
    csrf?: string;
  }
}

/** Signs in through passport, which regenerates the session id (no fixation). */
export const signIn = (req: Request, user: AuthUser) =>
  new Promise<void>((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));

export const signOut = (req: Request) =>
  new Promise<void>((resolve, reject) =>
    req.logout((err) => {
      if (err) return reject(err);
      req.session.destroy((e) => (e ? reject(e) : resolve()));
    }),
  );
