import type { PageParams, Role } from '../../../shared/schemas/common';
import type { UpdateStudioInput } from '../../../shared/schemas/studios';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import { pageOf } from '../../lib/page';
import { slugify } from '../../lib/tokens';
import type { StudiosRepository } from './studios.repository';

/** Hooks that later features register to set up a new studio's defaults (stage template, price table …). */
export type StudioSetupHook = (studioId: number, trx: Db) => Promise<void>;

export function studiosService(deps: { db: Db; repo: StudiosRepository; clock: Clock }) {
  const { db, repo, clock } = deps;
  const setupHooks: StudioSetupHook[] = [];

  async function uniqueSlug(name: string, trx: Db) {
    const base = slugify(name);
    for (let i = 1; i < 1000; i++) {
      const slug = i === 1 ? base : `${base}-${i}`;
      if (!(await repo.slugTaken(slug, trx))) return slug;
    }
    throw errors.conflict('Could not find a free address for this studio name; try another name.');
  }

  return {
    onStudioCreated(hook: StudioSetupHook) {
      setupHooks.push(hook);
    },
    async createStudioFor(ownerId: number, s: { name: string; currency: string; timezone: string }, trx: Db = db) {
      const now = iso(clock.now());
      const studioId = await repo.createStudio({ ...s, slug: await uniqueSlug(s.name, trx), now }, trx);
      await repo.addMember(studioId, ownerId, 'owner', now, trx);
      for (const hook of setupHooks) await hook(studioId, trx);
      return studioId;
    },
    async get(studioId: number, role: Role) {
      const s = await repo.getStudio(studioId);
      if (!s) throw errors.notFound('That studio');
      return { id: s.id, name: s.name, slug: s.slug, currency: s.currency, timezone: s.timezone, about: s.about ?? null, role };
    },
    async update(studioId: number, input: UpdateStudioInput, role: Role) {
      if (input.slug) {
        const current = await repo.getStudio(studioId);
        if (current?.slug !== input.slug && (await repo.slugTaken(input.slug))) throw errors.field('slug', 'Another studio already uses this address.');
      }
      const patch = Object.fromEntries(Object.entries(input).filter(([, v]) => v !== undefined)) as Record<string, string | null>;
      if ('about' in input) patch.about = input.about ?? null;
      if (Object.keys(patch).length) await repo.updateStudio(studioId, patch);
      return this.get(studioId, role);
    },
    async members(studioId: number, q: PageParams) {
      const { rows, total } = await repo.listMembers(studioId, q);
      return pageOf(rows, total, q);
    },
    async removeMember(studioId: number, userId: number) {
      await db.transaction(async (trx) => {
        const m = await repo.findMember(studioId, userId, trx);
        if (!m || m.role === 'client') throw errors.notFound('That team member');
        if (m.role === 'owner' && (await repo.countOwners(studioId, trx)) <= 1) {
          throw errors.conflict('A studio needs at least one owner. Make someone else an owner first.', 'last_owner');
        }
        await repo.removeMember(studioId, userId, trx);
      });
    },
  };
}

export type StudiosService = ReturnType<typeof studiosService>;
