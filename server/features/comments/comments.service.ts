import type { CreateCommentInput } from '../../../shared/schemas/comments';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import type { PageParams } from '../../../shared/schemas/common';
import { pageOf } from '../../lib/page';
import { errors } from '../../lib/errors';
import type { Member } from '../../lib/policy';
import { quote, type NoticesService } from '../notices/notices.service';
import type { CommentsRepository } from './comments.repository';

/** The thread between the studio and the client on one commission. */
export function commentsService(deps: { db: Db; repo: CommentsRepository; notices: NoticesService; clock: Clock }) {
  const { db, repo, notices, clock } = deps;

  async function commissionFor(m: Member, commissionId: number) {
    const c = await repo.commission(m.studioId, commissionId);
    if (!c || (m.role === 'client' && c.client_id !== m.clientId)) throw errors.notFound('That commission');
    return c;
  }

  return {
    async list(m: Member, commissionId: number, q: PageParams) {
      await commissionFor(m, commissionId);
      const { rows, total } = await repo.list(m.studioId, commissionId, q);
      return pageOf(rows, total, q);
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
