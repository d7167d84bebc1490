import type { Knex } from 'knex';

/**
 * The commission list is kept in memory under `studios.schedule_version` too
 * (server/features/commissions/commissions.service.ts), so the version must move whenever a row the list's
 * answer, its filters, search, order or count depend on changes. Column by column, what the list reads
 * (server/features/commissions/commissions.repository.ts `list`) and what moves the version:
 *
 * - commissions: id, client_id (the client filter and a client's own list), title (shown and searched),
 *   status (shown and filtered), due_date, created_at (the order), inserts and deletes
 *   (20270121120000-schedule-version.ts); priority (20270203120000-board-version.ts); `updated_at`, shown
 *   on every row and moved by edits the forecast and board do not read (the brief, the scheme notes): here.
 * - the totals on the commission row (figure_count, model_count, stage_count, stages_skipped, stages_done,
 *   minutes_total, minutes_done) are written by the commission-totals triggers
 *   (20270120120000-commission-totals.ts) only from a figure's quantity and commission_id, a stage's
 *   status, estimate_minutes and commission_id, and figure and stage inserts and deletes, all watched by
 *   20270121120000, in the same statement as that write: the bump commits with them.
 * - clients: name (shown and searched), 20270121120000. A client row without commissions is in no list,
 *   and one with commissions cannot be deleted (the foreign key refuses it).
 *
 * Every write that sets `updated_at` on a commission now moves the version, so the forecast and board
 * caches are read again after a brief edit too: such writes are rare beside the reads.
 *
 * Same shape as the board's triggers, on both engines: inside the writing transaction, whatever writes.
 * PostgreSQL: a deferred constraint trigger calling `schedule_version_row()` (20270121120000), which bumps
 * a studio once per transaction at its commit. The name starts with `schedule_version_` so the bench
 * generator (tests/bench/support/generate.ts) sets it aside with the others while it bulk-loads.
 */

const table = 'commissions';
const columns = ['updated_at'];
const trigger = 'schedule_version_list_commissions_update';
const changed = columns.map((c) => `old.${c} is distinct from new.${c}`).join(' or ');

const isPostgres = (knex: Knex) => knex.client.config.client === 'pg';

export async function createCommissionListVersionTriggers(knex: Knex) {
  if (isPostgres(knex)) {
    await knex.raw(
      `create constraint trigger ${trigger} after update of ${columns.join(', ')} on ${table} deferrable initially deferred for each row when (${changed}) execute function schedule_version_row()`,
    );
    return;
  }
  await knex.raw(
    `create trigger ${trigger} after update of ${columns.join(', ')} on ${table} when ${changed} begin update studios set schedule_version = schedule_version + 1 where id = new.studio_id; end`,
  );
}

export async function dropCommissionListVersionTriggers(knex: Knex) {
  await knex.raw(isPostgres(knex) ? `drop trigger if exists ${trigger} on ${table}` : `drop trigger if exists ${trigger}`);
}

export async function up(knex: Knex) {
  await createCommissionListVersionTriggers(knex);
}

export async function down(knex: Knex) {
  await dropCommissionListVersionTriggers(knex);
}
