import type { Knex } from 'knex';

/**
 * Each figure carries what its bench-board card shows of its stages, kept by triggers on `stages`: how
 * many stages, skipped and done, the estimated minutes of the stages not skipped and of the done ones
 * (the sums shared/commission-lifecycle.ts totalsOf makes), and its current stage. The board then reads a
 * page of figures without summing or grouping their thousand stages (issue 8's 1,000,000-stage bench).
 *
 * The current stage is the board's (server/features/board/board.service.ts before these columns): the
 * lowest position among the figure's stages to do or in work, the lowest id if two share a position;
 * null when every stage is done or skipped (or there are none). There is no foreign key on it: a stage
 * deleted takes its trigger's recomputation along, and on SQLite a new foreign key would copy the table.
 *
 * Each trigger recomputes the figure's columns from its stages (about ten rows, read by the
 * (studio_id, figure_id, position) index) rather than adding and taking away: simple, and right after any
 * change, including one that moves a stage to another figure (both figures are recomputed). The backfill
 * runs the very same SET clause over every figure, so it cannot give other values than the triggers.
 * Like the commission totals (20270120120000-commission-totals.ts) they run inside the writing statement,
 * whatever wrote it (the API, seeds, a foreign-key cascade), and commit or roll back with it.
 *
 * PostgreSQL, concurrent writers: the recomputation reads the figure's stages, so it must see every
 * committed change to them. Under READ COMMITTED an UPDATE that waits for another transaction's lock on
 * the figure row goes on with the snapshot it took before waiting (its subqueries would miss the other's
 * stage change). So the function first locks the figure row(s), then runs the UPDATE, which as a new
 * statement of a volatile function takes a fresh snapshot: every other writer of this figure's stages
 * held that lock until its commit, so its changes are seen. The lock is FOR NO KEY UPDATE (what an UPDATE
 * of the row takes), in id order: it does not wait for the key-share locks that inserts referencing the
 * figure (stages, time entries) take.
 *
 * Lock order: a stage write locks the stage row, then the commission row (the commission totals'
 * trigger fires first: PostgreSQL fires the triggers of one event in name order), then the figure row. A
 * figure's own write (rename, painter) would lock the figure and then touch its commission, the other way
 * round, and a transaction writing several stages (a new quantity, an accepted quote) holds the commission
 * while it takes the next stage: either could wait for a stage tick that waits for it (a deadlock, as the
 * queue reorder and stage edits once did over the studio row: 20270121120000-schedule-version.ts). So
 * every transaction that writes a commission's figures or stages locks the commission row first
 * (server/features/figures/figures.repository.ts lockCommission), and tests/api/figure-totals.test.ts
 * runs such writes side by side on PostgreSQL.
 */

const counts = ['stage_count', 'stages_skipped', 'stages_done', 'minutes_total', 'minutes_done'] as const;
export const figureTotalColumns = [...counts, 'current_stage_id'] as const;

/** The figure's stages, for a subquery correlated with the `figures` row being updated. */
const ofFigure = 's.studio_id = figures.studio_id and s.figure_id = figures.id';

/**
 * The SET clause of both the triggers' UPDATE and the backfill: one aggregate over the figure's stages
 * (a row value, SQLite 3.15+ and PostgreSQL 9.5+) and the current stage picked by its own subquery.
 */
const setClause = [
  `(${counts.join(', ')}) = (select count(*),
      coalesce(sum(case when s.status = 'skipped' then 1 else 0 end), 0),
      coalesce(sum(case when s.status = 'done' then 1 else 0 end), 0),
      coalesce(sum(case when s.status <> 'skipped' then s.estimate_minutes else 0 end), 0),
      coalesce(sum(case when s.status = 'done' then s.estimate_minutes else 0 end), 0)
    from stages s where ${ofFigure})`,
  `current_stage_id = (select s.id from stages s where ${ofFigure} and s.status in ('todo', 'working') order by s.position, s.id limit 1)`,
].join(', ');

const recompute = (where: string) => `update figures set ${setClause} where ${where}`;

/**
 * Sets every figure's columns from its stages as they are now: the migration's backfill and the bench
 * generator's (tests/bench/support/generate.ts), which fills its tables with the triggers set aside.
 */
export const backfillFigureTotalsSql = `update figures set ${setClause}`;

export async function backfillFigureTotals(knex: Knex) {
  await knex.raw(backfillFigureTotalsSql);
}

/** Columns whose change moves a figure's totals or its current stage. */
const watched = ['status', 'estimate_minutes', 'position', 'figure_id'];
const changed = watched.map((c) => `old.${c} is distinct from new.${c}`).join(' or ');

const sqliteTriggers = () => [
  `create trigger figure_totals_stages_insert after insert on stages begin ${recompute('id = new.figure_id')}; end`,
  `create trigger figure_totals_stages_delete after delete on stages begin ${recompute('id = old.figure_id')}; end`,
  // A stage moved to another figure: both are recomputed (one row when it stayed).
  `create trigger figure_totals_stages_update after update of ${watched.join(', ')} on stages when ${changed} begin ${recompute('id in (old.figure_id, new.figure_id)')}; end`,
];
const sqliteTriggerNames = ['figure_totals_stages_insert', 'figure_totals_stages_delete', 'figure_totals_stages_update'];

const pgSql = () => [
  `create function figure_totals_stages() returns trigger language plpgsql as $$
declare
  ids bigint[];
begin
  if tg_op = 'INSERT' then
    ids := array[new.figure_id];
  elsif tg_op = 'DELETE' then
    ids := array[old.figure_id];
  else
    ids := array[old.figure_id, new.figure_id];
  end if;
  -- Lock first, then recompute with a snapshot taken after the lock (see the migration's comment).
  perform 1 from figures where id = any(ids) order by id for no key update;
  ${recompute('id = any(ids)')};
  return null;
end
$$`,
  `create trigger figure_totals_stages_insert_delete after insert or delete on stages for each row execute function figure_totals_stages()`,
  `create trigger figure_totals_stages_update after update of ${watched.join(', ')} on stages for each row when (${changed}) execute function figure_totals_stages()`,
];

const isPostgres = (knex: Knex) => knex.client.config.client === 'pg';

export async function createFigureTotalsTriggers(knex: Knex) {
  for (const s of isPostgres(knex) ? pgSql() : sqliteTriggers()) await knex.raw(s);
}

export async function dropFigureTotalsTriggers(knex: Knex) {
  if (isPostgres(knex)) {
    await knex.raw('drop trigger if exists figure_totals_stages_insert_delete on stages');
    await knex.raw('drop trigger if exists figure_totals_stages_update on stages');
    await knex.raw('drop function if exists figure_totals_stages()');
    return;
  }
  for (const name of sqliteTriggerNames) await knex.raw(`drop trigger if exists ${name}`);
}

/**
 * Two indexes for the board's reads. The waits (stages that make the next one wait once done: drying,
 * curing) of a page's figures, from the few stages that have one instead of every stage of the page's
 * figures; partial, and SQLite uses it for a query that says `wait_minutes > 0` in so many words (not with
 * the 0 bound as a parameter). And a board filtered by painter: the figures of each board commission with
 * their painter, so the filter and its count are read from the index alone.
 */
const indexes = [
  { table: 'stages', columns: ['studio_id', 'figure_id'], name: 'stages_studio_figure_waits', where: 'wait_minutes > 0' },
  { table: 'figures', columns: ['studio_id', 'commission_id', 'painter_id'], name: 'figures_studio_commission_painter' },
];

export async function up(knex: Knex) {
  await knex.schema.alterTable('figures', (t) => {
    for (const c of counts) t.integer(c).notNullable().defaultTo(0);
    t.integer('current_stage_id');
  });
  for (const i of indexes) {
    await knex.schema.alterTable(i.table, (t) => {
      t.index(i.columns, i.name, i.where ? { predicate: knex.whereRaw(i.where) } : undefined);
    });
  }
  await backfillFigureTotals(knex);
  await createFigureTotalsTriggers(knex);
}

export async function down(knex: Knex) {
  await dropFigureTotalsTriggers(knex);
  for (const i of [...indexes].reverse()) {
    await knex.schema.alterTable(i.table, (t) => {
      t.dropIndex(i.columns, i.name);
    });
  }
  if (isPostgres(knex)) {
    await knex.schema.alterTable('figures', (t) => {
      t.dropColumns(...figureTotalColumns);
    });
    return;
  }
  // In place (SQLite 3.35+): Knex's dropColumn would copy the table and lose the triggers on `figures`.
  for (const c of figureTotalColumns) await knex.raw(`alter table figures drop column ${c}`);
}
