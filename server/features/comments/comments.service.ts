import type { Comment, CreateCommentInput } from '../../../shared/schemas/comments';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import type { Page, PageParams } from '../../../shared/schemas/common';
import { pageOf } from '../../lib/page';
import { errors } from '../../lib/errors';
import { keptAtVersion } from '../../lib/version-cache';
import type { Member } from '../../lib/policy';
import { quote, type NoticesService } from '../notices/notices.service';
import type { CommentsRepository } from './comments.repository';

/** Comments the kept thread pages may hold across commissions and queries. */
export const COMMENT_LIST_CACHE_ROWS = 20_000;

/**
 * The thread between the studio and the client on one commission. Its pages are kept per commission, thread
 * version and page (`cacheRows` comments at most; 0 turns it off): the same for the studio and the client, so
 * one entry serves both; who may see it is checked on every request, in the read that gives the version.
 */
export function commentsService(deps: { db: Db; repo: CommentsRepository; notices: NoticesService; clock: Clock; cacheRows?: number }) {
  const { db, repo, notices, clock } = deps;
  const kept = keptAtVersion<Page<Comment>>({ maxWeight: deps.cacheRows ?? COMMENT_LIST_CACHE_ROWS, weigh: (p) => p.items.length + 1 });

  async function commissionFor(m: Member, commissionId: number) {
    const c = await repo.commission(m.studioId, commissionId);
    if (!c || (m.role === 'client' && c.client_id !== m.clientId)) throw errors.notFound('That commission');
    return c;
  }

  return {
    async list(m: Member, commissionId: number, q: PageParams) {
      const t = await repo.thread(m.studioId, commissionId);
      if (!t || (m.role === 'client' && t.client_id !== m.clientId)) throw errors.notFound('That commission');
      return kept(commissionId, Number(t.thread_version), `${q.limit} ${q.offset}`, async () => {
        const { rows, total } = await repo.list(m.studioId, commissionId, q);
        return pageOf(rows, total, q);
      });
    },
    /** A client's comment goes to the studio; the studio's to the client. */
    async create(m: Member, user: { id: number; name: string }, commissionId: number, input: CreateCommentInput) {
      await commissionFor(m, commissionId);
      const at = iso(clock.now());
      const id = await db.transaction(async (trx) => {
        const id = await repo.insert({ studio_id: m.studioId, commission_id: commissionId, user_id: user.id, body: input.body, created_at: at }, trx);
        await repo.logActivity(trx, { studioId: m.studioId, commissionId, userId: user.id, action: 'comment.added', detail: { commentId: id, summary: 'added a comment.' }, at });
        await notices.notify(trx, {
          studioId: m.studioId,
          commissionId,
          to: m.role === 'client' ? 'studio' : 'client',
          actorId: user.id,
          template: 'notice.comment',
          subject: (c) => `New comment on "${c.title}"`,
          lines: [`${user.name} wrote:`, quote(input.body)],
        });
        return id;
      });
      notices.kick();
      return (await repo.get(m.studioId, id))!;
    },
  };
}

export type CommentsService = ReturnType<typeof commentsService>;
