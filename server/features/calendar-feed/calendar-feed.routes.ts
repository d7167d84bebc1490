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
      res.set({ 'Content-Type': 'text/calendar; charset=utf-8', 'Cache-Control': 'private, max-age=300', 'Referrer-Policy': 'no-referrer' });
      res.send(body);
    }),
  );
}
