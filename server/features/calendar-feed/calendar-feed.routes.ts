import crypto from 'node:crypto';
import type { Request } from 'express';
import { z } from 'zod';
import { member, publicRoute, user, type Allow } from '../../lib/policy';
import { json, params, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { CalendarFeedService } from './calendar-feed.service';

const tokenParams = z.object({ token: z.string().max(200) });
const actor = (req: Request) => ({ ...member(req), userId: user(req).id });

export function calendarFeedRoutes(r: RouteTable, deps: { allow: Allow; calendarFeed: CalendarFeedService }) {
  const { allow, calendarFeed } = deps;
  r.get('/studios/:studioId/calendar-feed', allow('owner', 'painter'), json((req) => calendarFeed.status(actor(req))));
  r.post('/studios/:studioId/calendar-feed', allow('owner', 'painter'), json((req) => calendarFeed.create(actor(req)), 201));
  r.delete('/studios/:studioId/calendar-feed', allow('owner', 'painter'), json((req) => calendarFeed.remove(actor(req))));
  // Public: the secret token in the address is the credential (calendar apps cannot sign in).
  r.get(
    '/calendar/:token.ics',
    publicRoute(),
    validate({ params: tokenParams }),
    json(async (_req, res) => {
      const body = await calendarFeed.ics(params<{ token: string }>(res).token);
      // Calendar apps poll the feed: with the tag of its text they ask again with If-None-Match, and an
      // unchanged calendar answers 304 with no body (Express compares the tag when sending).
      const etag = `"${crypto.createHash('sha256').update(body).digest('base64url').slice(0, 27)}"`;
      res.set({ 'Content-Type': 'text/calendar; charset=utf-8', 'Cache-Control': 'private, max-age=300', 'Referrer-Policy': 'no-referrer', ETag: etag });
      res.send(body);
    }),
  );
}
