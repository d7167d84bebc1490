import {
  addTotals,
  commissionStatusLabels,
  currentStage,
  emptyTotals,
  lockedStatuses,
  minutesToHours,
  hoursToMinutes,
  progressFromTotals,
  stageEstimates,
  totalsOf,
  waitUntil,
  type CommissionStatus,
  type ProgressTotals,
  type StageStatus,
} from '../../../shared/commission-lifecycle';
import { sortHazards, type TemplateStage } from '../../../shared/hazards';
import type { Figure, FigureInput, SizeClass, Stage, UpdateFigureInput, UpdateStageInput } from '../../../shared/schemas/commissions';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import type { Member } from '../../lib/policy';
import type { ActivityService } from '../activity/activity.service';
import type { StudioSetupService } from '../studio-setup/studio-setup.service';
import { parseKeys } from '../studio-setup/studio-setup.repository';
import type { FigureRow, FiguresRepository, StageContext, StageRow } from './figures.repository';

export type Actor = Member & { userId: number };

/** Figures, stages and time can no longer change once a commission is closed or cancelled. */
export function assertOpen(status: CommissionStatus) {
  if (lockedStatuses.includes(status)) {
    throw errors.conflict(`This commission is ${commissionStatusLabels[status]}; its figures, stages and time can no longer change.`, 'commission_locked');
  }
}

function toStage(r: StageRow, logged: Map<number, number>, forClient: boolean): Stage {
  return {
    id: r.id,
    figureId: r.figure_id,
    key: r.template_key,
    name: r.name,
    position: r.position,
    status: r.status,
    estimateHours: minutesToHours(r.estimate_minutes),
    waitHours: minutesToHours(r.wait_minutes),
    hazards: sortHazards(parseKeys(r.hazards)),
    doneBy: r.done_by !== null && r.done_by_name !== null ? { id: r.done_by, name: r.done_by_name } : null,
    doneAt: r.done_at,
    loggedHours: forClient ? null : minutesToHours(logged.get(r.id) ?? 0),
    waitUntil: r.status === 'done' ? waitUntil(r.done_at, r.wait_minutes) : null,
  };
}

const stageTotals = (rows: StageRow[]) => totalsOf(rows.map((s) => ({ status: s.status, estimateMinutes: s.estimate_minutes })));

function toFigure(f: FigureRow, stageRows: StageRow[], logged: Map<number, number>, forClient: boolean): Figure {
  const current = currentStage(stageRows);
  const loggedMinutes = stageRows.reduce((n, s) => n + (logged.get(s.id) ?? 0), 0);
  return {
    id: f.id,
    commissionId: f.commission_id,
    name: f.name,
    quantity: f.quantity,
    sizeClass: f.size_class as SizeClass,
    footprint: f.footprint,
    tier: f.tier,
    extras: parseKeys(f.extras),
    subAssemblies: parseKeys(f.sub_assemblies),
    lightSource: f.light_source,
    painter: f.painter_id !== null && f.painter_name !== null ? { id: f.painter_id, name: f.painter_name } : null,
    stages: stageRows.map((s) => toStage(s, logged, forClient)),
    progress: progressFromTotals(stageTotals(stageRows)),
    currentStageId: current?.id ?? null,
    loggedHours: forClient ? null : minutesToHours(loggedMinutes),
  };
}

export function figuresService(deps: { db: Db; repo: FiguresRepository; setup: StudioSetupService; activity: ActivityService; clock: Clock }) {
  const { db, repo, setup, activity, clock } = deps;
  const now = () => iso(clock.now());

  /** Tier and extras from the studio's lists, the painter from its team; one field error per bad value. */
  async function checkRefs(studioId: number, f: { tier?: string; extras?: string[]; painterId?: number | null }, trx: Db, prefix = '', keepExtras: string[] = []) {
    const fields: Record<string, string> = {};
    if (f.tier !== undefined) {
      const tiers = await setup.tiers(studioId, trx);
      if (!tiers.some((t) => t.key === f.tier)) fields[`${prefix}tier`] = `Choose one of the studio's tiers: ${tiers.map((t) => t.label).join(', ')}.`;
    }
    if (f.extras?.length) {
      const extras = new Set([...(await setup.extras(studioId, trx)).map((e) => e.key), ...keepExtras]);
      f.extras.forEach((k, i) => {
        if (!extras.has(k)) fields[`${prefix}extras.${i}`] ??= `“${k}” is not one of the studio's extras.`;
      });
    }
    let painterName: string | null = null;
    if (f.painterId !== undefined && f.painterId !== null) {
      const p = await repo.teamMember(studioId, f.painterId, trx);
      if (!p) fields[`${prefix}painterId`] = 'Choose a painter or owner of this studio.';
      else painterName = p.name;
    }
    if (Object.keys(fields).length) throw errors.invalid('Some fields need a look.', fields);
    return { painterName };
  }

  /**
   * Copies the studio's stage template onto a figure. `stageMinutes` (whole-batch minutes by stage key)
   * replaces the template's default minutes × quantity; the accepted quote's hours plug in here.
   */
  async function copyStages(
    trx: Db,
    at: { studioId: number; commissionId: number; figureId: number },
    template: TemplateStage[],
    quantity: number,
    stageMinutes?: Partial<Record<string, number>>,
  ) {
    const estimates = stageEstimates(template, quantity, stageMinutes);
    const t = now();
    await repo.insertStages(
      trx,
      template.map((s, i) => ({
        studio_id: at.studioId,
        commission_id: at.commissionId,
        figure_id: at.figureId,
        template_key: s.key,
        name: s.name,
        position: i + 1,
        status: 'todo',
        estimate_minutes: estimates[s.key],
        wait_minutes: s.waitMinutes,
        hazards: JSON.stringify(s.hazards),
        updated_at: t,
      })),
    );
  }

  /** Adds a figure with its stage checklist inside the caller's transaction; `prefix` places field errors (figures.0.). */
  async function addInTransaction(
    trx: Db,
    actor: Actor,
    commissionId: number,
    input: FigureInput,
    opts: { prefix?: string; stageMinutes?: Partial<Record<string, number>> } = {},
  ) {
    const { studioId } = actor;
    const extras = [...new Set(input.extras ?? [])];
    await checkRefs(studioId, { tier: input.tier, extras, painterId: input.painterId }, trx, opts.prefix);
    const t = now();
    const figureId = await repo.insertFigure(trx, {
      studio_id: studioId,
      commission_id: commissionId,
      name: input.name,
      quantity: input.quantity,
      size_class: input.sizeClass,
      footprint: input.sizeClass === 'large' ? (input.footprint ?? null) : null,
      tier: input.tier,
      extras: JSON.stringify(extras),
      sub_assemblies: JSON.stringify(input.subAssemblies ?? []),
      light_source: input.lightSource ?? null,
      painter_id: input.painterId ?? null,
      position: await repo.nextPosition(studioId, commissionId, trx),
      created_at: t,
      updated_at: t,
    });
    await copyStages(trx, { studioId, commissionId, figureId }, await setup.template(studioId, trx), input.quantity, opts.stageMinutes);
    await activity.record(trx, { studioId, commissionId, userId: actor.userId, action: 'figure.added', detail: { figureId, name: input.name, quantity: input.quantity } });
    return figureId;
  }

  /** Figures as the API shows them, with the summed totals of their stages (for the commission's progress). */
  async function views(studioId: number, by: { commissionIds?: number[]; figureIds?: number[] }, forClient: boolean, trx: Db = db) {
    const { figures, stages, logged } = await repo.load(studioId, by, trx);
    const byFigure = new Map<number, StageRow[]>();
    for (const s of stages) {
      const list = byFigure.get(s.figure_id) ?? [];
      list.push(s);
      byFigure.set(s.figure_id, list);
    }
    let totals: ProgressTotals = emptyTotals();
    let loggedMinutes = 0;
    const out = figures.map((f) => {
      const rows = byFigure.get(f.id) ?? [];
      totals = addTotals(totals, stageTotals(rows));
      loggedMinutes += rows.reduce((n, s) => n + (logged.get(s.id) ?? 0), 0);
      return toFigure(f, rows, logged, forClient);
    });
    return { figures: out, totals, loggedMinutes };
  }

  async function view(studioId: number, figureId: number, forClient = false, trx: Db = db) {
    const [f] = (await views(studioId, { figureIds: [figureId] }, forClient, trx)).figures;
    if (!f) throw errors.notFound('That figure');
    return f;
  }

  async function stageContext(studioId: number, stageId: number, trx: Db = db): Promise<StageContext> {
    const ctx = await repo.stageContext(studioId, stageId, trx);
    if (!ctx) throw errors.notFound('That stage');
    return ctx;
  }

  /** Sets a stage's status: done records who and when, leaving done clears them. Logged; no-op when unchanged. */
  async function setStageStatus(trx: Db, actor: Actor, ctx: StageContext, to: StageStatus) {
    if (ctx.status === to) return false;
    const t = now();
    await repo.updateStage(trx, actor.studioId, ctx.id, {
      status: to,
      done_by: to === 'done' ? actor.userId : null,
      done_at: to === 'done' ? t : null,
      updated_at: t,
    });
    await repo.touchCommission(trx, actor.studioId, ctx.commission_id, t);
    await activity.record(trx, {
      studioId: actor.studioId,
      commissionId: ctx.commission_id,
      userId: actor.userId,
      action: 'stage.status',
      detail: { figureId: ctx.figure_id, figureName: ctx.figure_name, stageId: ctx.id, stageName: ctx.name, from: ctx.status, to },
    });
    return true;
  }

  async function figureInCommission(studioId: number, figureId: number, trx: Db) {
    const f = await repo.figure(studioId, figureId, trx);
    if (!f) throw errors.notFound('That figure');
    const c = await repo.commission(studioId, f.commission_id, trx);
    if (!c) throw errors.notFound('That figure');
    return { f, c };
  }

  /**
   * Sets a figure's stage estimates from whole-batch minutes per stage key (an accepted quote's hours), inside
   * the caller's transaction; stages the minutes do not name keep theirs.
   */
  async function setStageEstimates(trx: Db, studioId: number, figureId: number, minutes: Record<string, number>) {
    await repo.lockCommission(trx, studioId, { figureId });
    const t = now();
    for (const s of await repo.stagesOfFigure(studioId, figureId, trx)) {
      const m = minutes[s.template_key];
      if (m === undefined || Math.round(m) === s.estimate_minutes) continue;
      await repo.updateStage(trx, studioId, s.id, { estimate_minutes: Math.max(0, Math.round(m)), updated_at: t });
    }
  }

  return {
    addInTransaction,
    /** For other features' transactions that write stages (the timer sets one working): call first. */
    lockCommission: (trx: Db, studioId: number, of: { stageId: number }) => repo.lockCommission(trx, studioId, of),
    copyStages,
    setStageEstimates,
    views,
    view,
    stageContext,
    setStageStatus,

    async add(actor: Actor, commissionId: number, input: FigureInput) {
      const figureId = await db.transaction(async (trx) => {
        const c = await repo.commission(actor.studioId, commissionId, trx);
        if (!c) throw errors.notFound('That commission');
        assertOpen(c.status);
        const id = await addInTransaction(trx, actor, commissionId, input);
        await repo.touchCommission(trx, actor.studioId, commissionId, now());
        return id;
      });
      return view(actor.studioId, figureId);
    },

    async update(actor: Actor, figureId: number, input: UpdateFigureInput) {
      const { studioId } = actor;
      await db.transaction(async (trx) => {
        await repo.lockCommission(trx, studioId, { figureId }); // first (see lockCommission)
        const { f, c } = await figureInCommission(studioId, figureId, trx);
        assertOpen(c.status);
        const sizeClass = input.sizeClass ?? (f.size_class as SizeClass);
        const footprint = sizeClass === 'large' ? (input.footprint !== undefined ? input.footprint : f.footprint) : null;
        if (sizeClass === 'large' && !footprint) throw errors.field('footprint', 'Give the footprint of a large figure, e.g. 180 × 110 mm.');
        const extras = input.extras ? [...new Set(input.extras)] : undefined;
        // Only new values are checked: a tier or extra the studio has since removed may stay on the figure.
        const current = parseKeys(f.extras);
        const { painterName } = await checkRefs(
          studioId,
          {
            tier: input.tier !== undefined && input.tier !== f.tier ? input.tier : undefined,
            extras,
            painterId: input.painterId !== f.painter_id ? input.painterId : undefined,
          },
          trx,
          '',
          current,
        );

        const patch: Record<string, unknown> = {};
        const changes: Record<string, { from: unknown; to: unknown }> = {};
        const set = (field: string, column: string, from: unknown, to: unknown, shown?: { from: unknown; to: unknown }) => {
          if (to === undefined || JSON.stringify(from) === JSON.stringify(to)) return;
          patch[column] = Array.isArray(to) ? JSON.stringify(to) : to;
          changes[field] = shown ?? { from: Array.isArray(from) ? from.join(', ') : from, to: Array.isArray(to) ? to.join(', ') : to };
        };
        set('name', 'name', f.name, input.name);
        set('quantity', 'quantity', f.quantity, input.quantity);
        set('sizeClass', 'size_class', f.size_class, input.sizeClass);
        set('footprint', 'footprint', f.footprint, footprint);
        set('tier', 'tier', f.tier, input.tier);
        set('extras', 'extras', current, extras);
        set('subAssemblies', 'sub_assemblies', parseKeys(f.sub_assemblies), input.subAssemblies);
        set('lightSource', 'light_source', f.light_source, input.lightSource);
        set('painterId', 'painter_id', f.painter_id, input.painterId, { from: f.painter_name, to: painterName });
        if (!Object.keys(patch).length) return;

        const t = now();
        if (patch.quantity !== undefined) {
          // Estimates cover the whole batch; a new quantity scales them (hand-edited ones keep their proportion).
          for (const s of await repo.stagesOfFigure(studioId, figureId, trx)) {
            await repo.updateStage(trx, studioId, s.id, { estimate_minutes: Math.round((s.estimate_minutes * Number(patch.quantity)) / f.quantity), updated_at: t });
          }
        }
        await repo.updateFigure(trx, studioId, figureId, { ...patch, updated_at: t });
        await repo.touchCommission(trx, studioId, f.commission_id, t);
        await activity.record(trx, { studioId, commissionId: f.commission_id, userId: actor.userId, action: 'figure.updated', detail: { figureId, name: input.name ?? f.name, changes } });
      });
      return view(studioId, figureId);
    },

    async remove(actor: Actor, figureId: number) {
      const { studioId } = actor;
      await db.transaction(async (trx) => {
        await repo.lockCommission(trx, studioId, { figureId });
        const { f, c } = await figureInCommission(studioId, figureId, trx);
        assertOpen(c.status);
        await repo.deleteFigure(trx, studioId, figureId);
        await repo.touchCommission(trx, studioId, f.commission_id, now());
        await activity.record(trx, { studioId, commissionId: f.commission_id, userId: actor.userId, action: 'figure.removed', detail: { figureId, name: f.name, quantity: f.quantity } });
      });
    },

    async updateStage(actor: Actor, stageId: number, input: UpdateStageInput) {
      const { studioId } = actor;
      const figureId = await db.transaction(async (trx) => {
        await repo.lockCommission(trx, studioId, { stageId });
        const ctx = await stageContext(studioId, stageId, trx);
        assertOpen(ctx.commission_status);
        const patch: Record<string, unknown> = {};
        const changes: Record<string, { from: number; to: number }> = {};
        if (input.estimateHours !== undefined && hoursToMinutes(input.estimateHours) !== ctx.estimate_minutes) {
          patch.estimate_minutes = hoursToMinutes(input.estimateHours);
          changes.estimateHours = { from: minutesToHours(ctx.estimate_minutes), to: minutesToHours(hoursToMinutes(input.estimateHours)) };
        }
        if (input.waitHours !== undefined && hoursToMinutes(input.waitHours) !== ctx.wait_minutes) {
          patch.wait_minutes = hoursToMinutes(input.waitHours);
          changes.waitHours = { from: minutesToHours(ctx.wait_minutes), to: minutesToHours(hoursToMinutes(input.waitHours)) };
        }
        if (Object.keys(patch).length) {
          const t = now();
          await repo.updateStage(trx, studioId, stageId, { ...patch, updated_at: t });
          await repo.touchCommission(trx, studioId, ctx.commission_id, t);
          await activity.record(trx, {
            studioId,
            commissionId: ctx.commission_id,
            userId: actor.userId,
            action: 'stage.updated',
            detail: { figureId: ctx.figure_id, figureName: ctx.figure_name, stageId, stageName: ctx.name, changes },
          });
        }
        if (input.status) await setStageStatus(trx, actor, ctx, input.status);
        return ctx.figure_id;
      });
      const f = await view(studioId, figureId);
      return f.stages.find((s) => s.id === stageId)!;
    },

    /** Marks the current stage done, so the next becomes current (the board's move to the next column). */
    async advance(actor: Actor, figureId: number) {
      const { studioId } = actor;
      await db.transaction(async (trx) => {
        await repo.lockCommission(trx, studioId, { figureId });
        const { c } = await figureInCommission(studioId, figureId, trx);
        assertOpen(c.status);
        const current = currentStage(await repo.stagesOfFigure(studioId, figureId, trx));
        if (!current) throw errors.conflict('Every stage of this figure is done or skipped.', 'no_stage_left');
        await setStageStatus(trx, actor, await stageContext(studioId, current.id, trx), 'done');
      });
      return view(studioId, figureId);
    },

  };
}

export type FiguresService = ReturnType<typeof figuresService>;
