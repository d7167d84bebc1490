import type { Knex } from 'knex';

/**
 * The bench board is kept in memory under `studios.schedule_version` too
 * (server/features/board/board.service.ts), so the version must move whenever a row the board's answer
 * depends on changes, not only the forecast's (migrations/20270121120000-schedule-version.ts). Column by
 * column, what the board reads (server/features/board/board.repository.ts) and what moves the version:
 *
 * - commissions: status, title, due_date (20270121120000); priority, which orders the board: here.
 *   `figure_count` (the board's total) changes only with figures added, removed or moved, which bump.
 * - figures: name, quantity, painter_id, commission_id, inserts and deletes (20270121120000). The stage
 *   totals and `current_stage_id` are written by the figure-totals triggers
 *   (20270202120000-figure-totals.ts) from a stage's status, estimate_minutes, position and figure_id,
 *   all watched on stages, in the same statement as the stage write: the bump commits with them.
 * - stages: name, position, status, estimate_minutes, wait_minutes, done_at, inserts and deletes
 *   (20270121120000); template_key (the card's column) and hazards (shown on the card): here.
 * - users: name, for the studios a person paints or painted for (20270121120000).
 * - stage_templates (the board's columns, their names and order): inserts, deletes and a change of key,
 *   name or position: here. Saving a template deletes and inserts its rows, so every save bumps.
 *
 * Same shape as the forecast's triggers, on both engines: inside the writing transaction, whatever writes.
 * PostgreSQL: deferred constraint triggers calling the forecast migration's `schedule_version_row()`, which
 * bumps a studio once per transaction at commit, after every other lock the transaction takes (immediate
 * triggers deadlocked: see 20270121120000). The figure totals are written by immediate triggers earlier in
 * the same transaction, so whoever reads the new version reads them too.
 *
 * The trigger names start with `schedule_version_` so a bulk loader that sets the schedule version's
 * triggers aside by name (tests/bench/support/generate.ts) sets these aside as well.
 */

type Watch = { table: string; columns: string[]; rows: boolean };

const watched: Watch[] = [
  { table: 'commissions', columns: ['priority'], rows: false },
  { table: 'stages', columns: ['template_key', 'hazards'], rows: false },
  { table: 'stage_templates', columns: ['key', 'name', 'position'], rows: true },
];

const name = (w: Watch, op: string) => `schedule_version_board_${w.table}_${op}`;
const ops = (w: Watch) => (w.rows ? ['insert', 'delete', 'update'] : ['update']);
const changed = (columns: string[]) => columns.map((c) => `old.${c} is distinct from new.${c}`).join(' or ');
const bump = (where: string) => `update studios set schedule_version = schedule_version + 1 where ${where};`;

function sqliteTriggers(): string[] {
  const out: string[] = [];
  for (const w of watched) {
    if (w.rows) {
      out.push(`create trigger ${name(w, 'insert')} after insert on ${w.table} begin ${bump('id = new.studio_id')} end`);
      out.push(`create trigger ${name(w, 'delete')} after delete on ${w.table} begin ${bump('id = old.studio_id')} end`);
    }
    out.push(`create trigger ${name(w, 'update')} after update of ${w.columns.join(', ')} on ${w.table} when ${changed(w.columns)} begin ${bump('id = new.studio_id')} end`);
  }
  return out;
}

const deferred = (trigger: string, event: string, table: string, when: string | null) =>
  `create constraint trigger ${trigger} after ${event} on ${table} deferrable initially deferred for each row${when ? ` when (${when})` : ''} execute function schedule_version_row()`;

function pgTriggers(): string[] {
  const out: string[] = [];
  for (const w of watched) {
    if (w.rows) {
      out.push(deferred(name(w, 'insert'), 'insert', w.table, null));
      out.push(deferred(name(w, 'delete'), 'delete', w.table, null));
    }
    out.push(deferred(name(w, 'update'), `update of ${w.columns.join(', ')}`, w.table, changed(w.columns)));
  }
  return out;
}

const isPostgres = (knex: Knex) => knex.client.config.client === 'pg';

export async function createBoardVersionTriggers(knex: Knex) {
  for (const s of isPostgres(knex) ? pgTriggers() : sqliteTriggers()) await knex.raw(s);
}

export async function dropBoardVersionTriggers(knex: Knex) {
  const pg = isPostgres(knex);
  for (const w of watched) for (const op of ops(w)) await knex.raw(pg ? `drop trigger if exists ${name(w, op)} on ${w.table}` : `drop trigger if exists ${name(w, op)}`);
}

export async function up(knex: Knex) {
  await createBoardVersionTriggers(knex);
}

export async function down(knex: Knex) {
  await dropBoardVersionTriggers(knex);
}
