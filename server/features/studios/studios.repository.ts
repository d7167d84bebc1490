import type { PageParams, Role } from '../../../shared/schemas/common';
import type { Db } from '../../lib/db';
import { pageRows } from '../../lib/page';

export type StudioRow = { id: number; name: string; slug: string; currency: string; timezone: string; about: string | null };

export function studiosRepository(db: Db) {
  return {
    slugTaken: (slug: string, trx: Db = db) => trx('studios').where({ slug }).first('id').then(Boolean),
    async createStudio(s: { name: string; slug: string; currency: string; timezone: string; now: string }, trx: Db = db) {
      const [row] = await trx('studios').insert({ name: s.name, slug: s.slug, currency: s.currency, timezone: s.timezone, created_at: s.now }).returning('id');
      return typeof row === 'object' ? (row.id as number) : (row as number);
    },
    addMember: (studioId: number, userId: number, role: Role, now: string, trx: Db = db) =>
      trx('memberships').insert({ studio_id: studioId, user_id: userId, role, created_at: now }).onConflict(['studio_id', 'user_id']).ignore(),
    findMember: (studioId: number, userId: number, trx: Db = db) => trx('memberships').where({ studio_id: studioId, user_id: userId }).first(),
    getStudio: (studioId: number) => db<StudioRow>('studios').where({ id: studioId }).first(),
    updateStudio: (studioId: number, patch: Partial<Omit<StudioRow, 'id'>>) => db('studios').where({ id: studioId }).update(patch),
    /** One page of the team (owners first, then by name); the id breaks ties so pages never overlap. */
    listMembers: (studioId: number, q: PageParams) =>
      pageRows<{ userId: number; name: string; email: string; role: Role; joinedAt: string }>(
        db('memberships as m')
          .join('users as u', 'u.id', 'm.user_id')
          .where('m.studio_id', studioId)
          .whereIn('m.role', ['owner', 'painter'])
          .orderBy([{ column: 'm.role' }, { column: 'u.name' }, { column: 'u.id' }])
          .select('u.id as userId', 'u.name', 'u.email', 'm.role', 'm.created_at as joinedAt'),
        q,
      ),
    countOwners: (studioId: number, trx: Db = db) =>
      trx('memberships').where({ studio_id: studioId, role: 'owner' }).count({ n: '*' }).first().then((r) => Number(r?.n ?? 0)),
    removeMember: (studioId: number, userId: number, trx: Db = db) => trx('memberships').where({ studio_id: studioId, user_id: userId }).delete(),
  };
}

export type StudiosRepository = ReturnType<typeof studiosRepository>;
