import type { Knex } from 'knex';

/**
 * Each commission carries the totals its lists show (figures, models, stages, skipped, done, estimated
 * and done minutes), kept by triggers on `figures` and `stages`, so a page of commissions is read from
 * the commission rows alone instead of summing a thousand stage rows per page (issue 8's 1,000,000-stage
 * bench). A trigger runs inside the statement that changes the row, in its transaction, whatever code
 * wrote it (the API, the seeds, the bench generator, a foreign-key cascade): the totals commit or roll
 * back with the stages and figures they count, so they cannot drift from them.
 *
 * The sums are those the list computed on read: minutes_total counts the estimates of stages not
 * skipped, minutes_done those of done stages (shared/commission-lifecycle.ts totalsOf).
 *
 * Triggers are the one place this project needs each engine's own SQL: a SQLite trigger body, a PL/pgSQL
 * function on PostgreSQL. Both run the same UPDATE statements (built once below), so the sums match.
 */

const columns = ['figure_count', 'model_count', 'stage_count', 'stages_skipped', 'stages_done', 'minutes_total', 'minutes_done'] as const;

/** What one stage row adds to its commission's totals (`r` is NEW or OLD). */
const stageTerms = (r: string) => ({
  stage_count: '1',
  stages_skipped: `case when ${r}.status = 'skipped' then 1 else 0 end`,
  stages_done: `case when ${r}.status = 'done' then 1 else 0 end`,
  minutes_total: `case when ${r}.status <> 'skipped' then ${r}.estimate_minutes else 0 end`,
  minutes_done: `case when ${r}.status = 'done' then ${r}.estimate_minutes else 0 end`,
});

/** What one figure row adds to its commission's totals. */
const figureTerms = (r: string) => ({ figure_count: '1', model_count: `${r}.quantity` });

type Terms = Record<string, string>;

/** Adds `plus` and takes away `minus` (either may be absent) on the commission `id`; a term in both (a count's 1) cancels. */
function apply(id: string, plus: Terms | null, minus: Terms | null) {
  const keys = Object.keys(plus ?? minus ?? {}).filter((k) => !plus || !minus || plus[k] !== minus[k]);
  const set = keys.map((k) => `${k} = ${k}${plus ? ` + (${plus[k]})` : ''}${minus ? ` - (${minus[k]})` : ''}`).join(', ');
  return `update commissions set ${set} where id = ${id};`;
}

/** The UPDATE statements a change of one row runs: on the same commission one UPDATE, on a move two. */
const statements = (terms: (r: string) => Terms) => ({
  insert: apply('new.commission_id', terms('new'), null),
  remove: apply('old.commission_id', null, terms('old')),
  change: apply('new.commission_id', terms('new'), terms('old')),
});

const tables = {
  stages: { watched: ['status', 'estimate_minutes', 'commission_id'], terms: stageTerms },
  figures: { watched: ['quantity', 'commission_id'], terms: figureTerms },
};

/** Old and new differ in one of these columns. */
const changedWhen = (watched: string[]) => watched.map((c) => `old.${c} is distinct from new.${c}`).join(' or ');
const withoutCommission = (watched: string[]) => watched.filter((c) => c !== 'commission_id');

function sqliteTriggers(table: keyof typeof tables) {
  const { watched, terms } = tables[table];
  const s = statements(terms);
  const name = `commission_totals_${table}`;
  return [
    `create trigger ${name}_insert after insert on ${table} begin ${s.insert} end`,
    `create trigger ${name}_delete after delete on ${table} begin ${s.remove} end`,
    `create trigger ${name}_update after update of ${watched.join(', ')} on ${table} when old.commission_id = new.commission_id and (${changedWhen(withoutCommission(watched))}) begin ${s.change} end`,
    // A row moved to another commission: out of the old one's totals, into the new one's.
    `create trigger ${name}_move after update of commission_id on ${table} when old.commission_id <> new.commission_id begin ${s.remove} ${s.insert} end`,
  ];
}
const sqliteTriggerNames = (table: string) => ['insert', 'delete', 'update', 'move'].map((k) => `commission_totals_${table}_${k}`);

function pgTrigger(table: keyof typeof tables) {
  const { watched, terms } = tables[table];
  const s = statements(terms);
  const name = `commission_totals_${table}`;
  return [
    `create function ${name}() returns trigger language plpgsql as $$
begin
  if tg_op = 'INSERT' then
    ${s.insert}
  elsif tg_op = 'DELETE' then
    ${s.remove}
  elsif old.commission_id = new.commission_id then
    ${s.change}
  else
    ${s.remove}
    ${s.insert}
  end if;
  return null;
end
$$`,
    `create trigger ${name}_insert_delete after insert or delete on ${table} for each row execute function ${name}()`,
    `create trigger ${name}_update after update of ${watched.join(', ')} on ${table} for each row when (${changedWhen(watched)}) execute function ${name}()`,
  ];
}

const isPostgres = (knex: Knex) => knex.client.config.client === 'pg';

/**
 * Sets every commission's totals from its figures and stages as they are now: the migration's backfill,
 * and the bench generator's (tests/bench/support/generate.ts), which fills its tables with the triggers
 * set aside. Portable Knex: one correlated subquery per column, each read from the
 * (studio_id, commission_id, …) indexes.
 */
export function backfillCommissionTotals(knex: Knex) {
  // Columns named with their table: commissions has a status too.
  const of = (table: 'figures' | 'stages') => knex(table).where(`${table}.studio_id`, knex.ref('commissions.studio_id')).where(`${table}.commission_id`, knex.ref('commissions.id'));
  const count = (table: 'figures' | 'stages') => of(table).count('*');
  const sum = (table: 'figures' | 'stages', column: string) => of(table).select(knex.raw('coalesce(sum(??), 0)', [`${table}.${column}`]));
  return knex('commissions').update({
    figure_count: count('figures'),
    model_count: sum('figures', 'quantity'),
    stage_count: count('stages'),
    stages_skipped: count('stages').where('stages.status', 'skipped'),
    stages_done: count('stages').where('stages.status', 'done'),
    minutes_total: sum('stages', 'estimate_minutes').whereNot('stages.status', 'skipped'),
    minutes_done: sum('stages', 'estimate_minutes').where('stages.status', 'done'),
  });
}

export async function createCommissionTotalsTriggers(knex: Knex) {
  const sql = isPostgres(knex) ? [...pgTrigger('stages'), ...pgTrigger('figures')] : [...sqliteTriggers('stages'), ...sqliteTriggers('figures')];
  for (const s of sql) await knex.raw(s);
}

export async function dropCommissionTotalsTriggers(knex: Knex) {
  if (isPostgres(knex)) {
    for (const table of Object.keys(tables)) {
      await knex.raw(`drop trigger if exists commission_totals_${table}_insert_delete on ${table}`);
      await knex.raw(`drop trigger if exists commission_totals_${table}_update on ${table}`);
      await knex.raw(`drop function if exists commission_totals_${table}()`);
    }
    return;
  }
  for (const table of Object.keys(tables)) for (const name of sqliteTriggerNames(table)) await knex.raw(`drop trigger if exists ${name}`);
}

export async function up(knex: Knex) {
  await knex.schema.alterTable('commissions', (t) => {
    for (const c of columns) t.integer(c).notNullable().defaultTo(0);
  });
  await backfillCommissionTotals(knex);
  await createCommissionTotalsTriggers(knex);
}

export async function down(knex: Knex) {
  await dropCommissionTotalsTriggers(knex);
  if (isPostgres(knex)) {
    await knex.schema.alterTable('commissions', (t) => {
      t.dropColumns(...columns);
    });
    return;
  }
  // SQLite drops a column in place (3.35+); Knex's dropColumn would copy the table, and with it lose the
  // triggers other migrations put on `commissions`.
  for (const c of columns) await knex.raw(`alter table commissions drop column ${c}`);
}
