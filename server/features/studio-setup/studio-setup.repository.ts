import type { HazardKey, TemplateStage } from '../../../shared/hazards';
import type { ListItem } from '../../../shared/schemas/commissions';
import type { Db } from '../../lib/db';

export type TemplateRow = { key: string; name: string; position: number; default_minutes: number; wait_minutes: number; hazards: string };
export type ListName = 'tier' | 'extra';

export const parseKeys = (json: string | null | undefined): string[] => {
  try {
    const v = JSON.parse(json ?? '[]');
    return Array.isArray(v) ? v.filter((x): x is string => typeof x === 'string') : [];
  } catch {
    return [];
  }
};

/** A studio's stage template, tier and extra lists, and hazard texts; every query takes the studio id first. */
export function studioSetupRepository(db: Db) {
  return {
    async template(studioId: number, trx: Db = db): Promise<TemplateStage[]> {
      const rows: TemplateRow[] = await trx('stage_templates').where({ studio_id: studioId }).orderBy('position');
      return rows.map((r) => ({ key: r.key, name: r.name, defaultMinutes: r.default_minutes, waitMinutes: r.wait_minutes, hazards: parseKeys(r.hazards) as HazardKey[] }));
    },
    async replaceTemplate(studioId: number, stages: TemplateStage[], trx: Db = db) {
      await trx('stage_templates').where({ studio_id: studioId }).delete();
      if (!stages.length) return;
      await trx('stage_templates').insert(
        stages.map((s, i) => ({
          studio_id: studioId,
          key: s.key,
          name: s.name,
          position: i + 1,
          default_minutes: s.defaultMinutes,
          wait_minutes: s.waitMinutes,
          hazards: JSON.stringify(s.hazards),
        })),
      );
    },
    list: (studioId: number, list: ListName, trx: Db = db): Promise<ListItem[]> =>
      trx('studio_lists').where({ studio_id: studioId, list }).orderBy('position').select('key', 'label'),
    async replaceList(studioId: number, list: ListName, items: ListItem[], trx: Db = db) {
      await trx('studio_lists').where({ studio_id: studioId, list }).delete();
      if (!items.length) return;
      await trx('studio_lists').insert(items.map((it, i) => ({ studio_id: studioId, list, key: it.key, label: it.label, position: i + 1 })));
    },
    hazards: (studioId: number, trx: Db = db): Promise<{ key: string; title: string; text: string }[]> =>
      trx('studio_hazards').where({ studio_id: studioId }).select('key', 'title', 'text'),
    async upsertHazard(studioId: number, h: { key: string; title: string; text: string }, trx: Db = db) {
      await trx('studio_hazards').insert({ studio_id: studioId, ...h }).onConflict(['studio_id', 'key']).merge(['title', 'text']);
    },
  };
}

export type StudioSetupRepository = ReturnType<typeof studioSetupRepository>;
