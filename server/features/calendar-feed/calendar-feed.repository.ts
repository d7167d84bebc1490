import type { Db } from '../../lib/db';

export type FeedRow = { id: number; studio_id: number; user_id: number; created_at: string; last_used_at: string | null };
export type FeedOwnerRow = FeedRow & { role: string | null; studio_name: string };

/** Calendar feeds, one per person and studio; found by the hash of their token. */
export function calendarFeedRepository(db: Db) {
  const columns = ['f.id', 'f.studio_id', 'f.user_id', 'f.created_at', 'f.last_used_at'];
  return {
    get: (studioId: number, userId: number, trx: Db = db) =>
      trx('calendar_feeds as f').where({ 'f.studio_id': studioId, 'f.user_id': userId }).first(columns) as Promise<FeedRow | undefined>,
    /** The feed with this token hash, its studio and the owner's current role there (null once they left). */
    byHash: (tokenHash: string, trx: Db = db) =>
      trx('calendar_feeds as f')
        .join('studios as s', 's.id', 'f.studio_id')
        .leftJoin('memberships as m', function () {
          this.on('m.studio_id', '=', 'f.studio_id').andOn('m.user_id', '=', 'f.user_id');
        })
        .where('f.token_hash', tokenHash)
        .first([...columns, 'm.role', 's.name as studio_name']) as Promise<FeedOwnerRow | undefined>,
    /** Replaces the person's feed: the old address stops working at once. */
    async replace(trx: Db, studioId: number, userId: number, tokenHash: string, now: string) {
      await trx('calendar_feeds').where({ studio_id: studioId, user_id: userId }).delete();
      await trx('calendar_feeds').insert({ studio_id: studioId, user_id: userId, token_hash: tokenHash, created_at: now });
    },
    remove: (studioId: number, userId: number, trx: Db = db) => trx('calendar_feeds').where({ studio_id: studioId, user_id: userId }).delete(),
    touch: (id: number, now: string, trx: Db = db) => trx('calendar_feeds').where({ id }).update({ last_used_at: now }),
  };
}

export type CalendarFeedRepository = ReturnType<typeof calendarFeedRepository>;
