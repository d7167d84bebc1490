import type { TurnaroundSource } from '../../../shared/schemas/enquiries';
import type { Db } from '../../lib/db';

export type PublicPageRow = {
  studio_id: number;
  enabled: number | boolean;
  intro: string | null;
  turnaround_text: string | null;
  turnaround_source: TurnaroundSource;
  updated_at: string;
};

export type PublicStudioRow = { id: number; name: string; slug: string; currency: string; timezone: string; about: string | null };

export type AttemptScope = 'try' | 'ip' | 'email';

/** The studio's public page settings and the public form's attempt counters (keys are hashes, never addresses). */
export function publicStudioRepository(db: Db) {
  return {
    studio: (studioId: number) => db('studios').where({ id: studioId }).first('id', 'name', 'slug', 'currency', 'timezone', 'about') as Promise<PublicStudioRow | undefined>,
    studioBySlug: (slug: string) => db('studios').where({ slug }).first('id', 'name', 'slug', 'currency', 'timezone', 'about') as Promise<PublicStudioRow | undefined>,
    page: (studioId: number) => db('studio_public_pages').where({ studio_id: studioId }).first() as Promise<PublicPageRow | undefined>,
    savePage: (studioId: number, row: Omit<PublicPageRow, 'studio_id'>) =>
      db('studio_public_pages')
        .insert({ studio_id: studioId, ...row })
        .onConflict('studio_id')
        .merge(['enabled', 'intro', 'turnaround_text', 'turnaround_source', 'updated_at']),

    countAttempts: (scope: AttemptScope, key: string, since: string) =>
      db('public_attempts').where({ scope, key }).andWhere('at', '>', since).count({ n: '*' }).first().then((r) => Number(r?.n ?? 0)),
    oldestAttempt: (scope: AttemptScope, key: string, since: string) =>
      db('public_attempts').where({ scope, key }).andWhere('at', '>', since).min({ at: 'at' }).first().then((r) => (r?.at as string | null) ?? null),
    addAttempts: (rows: { scope: AttemptScope; key: string }[], at: string) => (rows.length ? db('public_attempts').insert(rows.map((r) => ({ ...r, at }))) : Promise.resolve()),
    pruneAttempts: (before: string) => db('public_attempts').where('at', '<=', before).delete(),
  };
}

export type PublicStudioRepository = ReturnType<typeof publicStudioRepository>;
