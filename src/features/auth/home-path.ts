import type { MeResponse } from '../../../shared/schemas/auth';

/** One studio: straight in. Several (or none yet): the chooser. */
export function homePathFor(me: MeResponse): string {
  return me.memberships.length === 1 ? `/studio/${me.memberships[0].studioId}` : '/studios';
}

/** Only same-site paths survive a ?next= round trip, so a link cannot send someone elsewhere. */
export function safeNext(next: string | null): string | null {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return null;
  return next;
}
