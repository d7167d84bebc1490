import { minutesToHours, hoursToMinutes } from '../../../shared/commission-lifecycle';
import { defaultHazards, defaultStageTemplate, hazardKeys, sortHazards, stripFooter, withFooter, type TemplateStage } from '../../../shared/hazards';
import {
  defaultExtras,
  defaultTiers,
  keyFromLabel,
  type Hazard,
  type HazardsInput,
  type ListItem,
  type ListsInput,
  type StageTemplateInput,
  type StudioLists,
  type TemplateStageView,
} from '../../../shared/schemas/commissions';
import type { Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import type { StudioSetupRepository } from './studio-setup.repository';

/**
 * Gives every item a key: its own, or one made from its label. Explicit keys must be unique (a field
 * error names the repeat); a made key that collides gets a number.
 */
function withKeys<T extends { key?: string }>(items: T[], labelOf: (t: T) => string, path: string): (T & { key: string })[] {
  const explicit = new Map<string, number>();
  items.forEach((it, i) => {
    if (!it.key) return;
    if (explicit.has(it.key)) throw errors.field(`${path}.${i}.key`, 'Another item in this list already uses this key.');
    explicit.set(it.key, i);
  });
  const used = new Set(explicit.keys());
  return items.map((it) => {
    if (it.key) return { ...it, key: it.key };
    const base = keyFromLabel(labelOf(it));
    let k = base;
    for (let n = 2; used.has(k); n++) k = `${base.slice(0, 28)}-${n}`;
    used.add(k);
    return { ...it, key: k };
  });
}

export function studioSetupService(deps: { db: Db; repo: StudioSetupRepository }) {
  const { db, repo } = deps;

  const viewTemplate = (t: TemplateStage[]): TemplateStageView[] =>
    t.map((s, i) => ({ key: s.key, name: s.name, position: i + 1, defaultHours: minutesToHours(s.defaultMinutes), waitHours: minutesToHours(s.waitMinutes), hazards: sortHazards(s.hazards) }));

  async function hazards(studioId: number, trx: Db = db): Promise<Hazard[]> {
    const rows = new Map((await repo.hazards(studioId, trx)).map((h) => [h.key, h]));
    return hazardKeys.map((key) => {
      const h = rows.get(key) ?? defaultHazards.find((d) => d.key === key)!;
      return { key, title: h.title, text: withFooter(h.text) };
    });
  }

  return {
    /** The defaults of a new studio, inside its sign-up transaction (registered with studios.onStudioCreated). */
    async seedDefaults(studioId: number, trx: Db) {
      await repo.replaceTemplate(studioId, defaultStageTemplate, trx);
      await repo.replaceList(studioId, 'tier', defaultTiers, trx);
      await repo.replaceList(studioId, 'extra', defaultExtras, trx);
      for (const h of defaultHazards) await repo.upsertHazard(studioId, h, trx);
    },

    /** For other features: the raw template (minutes) and the lists, read in the caller's transaction. */
    template: (studioId: number, trx: Db = db) => repo.template(studioId, trx),
    tiers: (studioId: number, trx: Db = db) => repo.list(studioId, 'tier', trx),
    extras: (studioId: number, trx: Db = db) => repo.list(studioId, 'extra', trx),

    getTemplate: async (studioId: number) => viewTemplate(await repo.template(studioId)),
    async putTemplate(studioId: number, input: StageTemplateInput) {
      const stages = withKeys(input.stages, (s) => s.name, 'stages').map((s) => ({
        key: s.key,
        name: s.name,
        defaultMinutes: hoursToMinutes(s.defaultHours),
        waitMinutes: hoursToMinutes(s.waitHours),
        hazards: sortHazards(s.hazards),
      }));
      // Figures keep their own copies of the stages; editing the template changes only figures added later.
      await db.transaction((trx) => repo.replaceTemplate(studioId, stages, trx));
      return viewTemplate(await repo.template(studioId));
    },

    async getLists(studioId: number): Promise<StudioLists> {
      return { tiers: await repo.list(studioId, 'tier'), extras: await repo.list(studioId, 'extra') };
    },
    async putLists(studioId: number, input: ListsInput): Promise<StudioLists> {
      const tiers: ListItem[] = withKeys(input.tiers, (t) => t.label, 'tiers').map(({ key, label }) => ({ key, label }));
      const extras: ListItem[] = withKeys(input.extras, (t) => t.label, 'extras').map(({ key, label }) => ({ key, label }));
      // Figures keep the keys they were given; a removed item still shows on them by its key.
      await db.transaction(async (trx) => {
        await repo.replaceList(studioId, 'tier', tiers, trx);
        await repo.replaceList(studioId, 'extra', extras, trx);
      });
      return this.getLists(studioId);
    },

    getHazards: (studioId: number) => hazards(studioId),
    async putHazards(studioId: number, input: HazardsInput) {
      const seen = new Set<string>();
      input.forEach((h, i) => {
        if (seen.has(h.key)) throw errors.field(`${i}.key`, 'This hazard is listed twice.');
        seen.add(h.key);
        if (!stripFooter(h.text)) throw errors.field(`${i}.text`, 'Write the caution itself; the closing sentence is added for you.');
      });
      await db.transaction(async (trx) => {
        for (const h of input) await repo.upsertHazard(studioId, { key: h.key, title: h.title, text: stripFooter(h.text) }, trx);
      });
      return hazards(studioId);
    },
  };
}

export type StudioSetupService = ReturnType<typeof studioSetupService>;
