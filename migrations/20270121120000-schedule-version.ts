import type { Knex } from 'knex';

/**
 * `studios.schedule_version`: a number the database moves whenever a row the studio's forecast reads
 * changes (server/features/schedule/schedule.service.ts run(): the queue with its clients' names, the
 * figures, stages and closed time of its commissions, the painters, their names, hours and days off, the
 * studio's zone). The app keeps the last forecast of each studio in memory under its version and reads
 * only the version (one small query) while it is unchanged; several app instances on one PostgreSQL
 * database see the same version, so none serves a forecast older than another instance's committed write.
 *
 * The triggers run inside the writing transaction, whatever code writes (the API, seeds, a foreign-key
 * cascade), so the new version commits or rolls back with the change. A row change bumps only when a
 * column the forecast reads changed (a commission's totals or `updated_at` alone do not), and a running
 * timer (no `ended_at`) only once it is stopped, since the forecast counts closed time only.
 *
 * PostgreSQL: the bump is a deferred constraint trigger, so each transaction takes the studio row's lock
 * at its commit, after every other lock it takes: a transaction writing many rows (the queue reordered)
 * and one ticking a stage of the same studio then never wait for each other in opposite orders
 * (a deadlock), and each transaction bumps a studio once however many rows it writes.
 */

type Watch = {
  table: string;
  /** Columns the forecast reads; a change to any of them bumps the version. */
  columns: string[];
  /** Extra condition on the row (`r` is new or old) for inserts and deletes; absent: always. */
  row?: (r: string) => string;
  /** Whether inserts and deletes bump (false: only a change of the columns, e.g. a client's name). */
  rows?: boolean;
};

const closedTime = (r: string) => `${r}.ended_at is not null`;
const paints = (r: string) => `${r}.role in ('owner', 'painter')`;

/** Tables whose rows carry `studio_id` and are read by the forecast. */
const watched: Watch[] = [
  { table: 'commissions', columns: ['status', 'title', 'client_id', 'due_date', 'queue_position', 'created_at'] },
  { table: 'clients', columns: ['name'], rows: false },
  { table: 'figures', columns: ['commission_id', 'name', 'quantity', 'painter_id', 'position'] },
  { table: 'stages', columns: ['commission_id', 'figure_id', 'name', 'position', 'status', 'estimate_minutes', 'wait_minutes', 'done_at'] },
  { table: 'time_entries', columns: ['commission_id', 'stage_id', 'ended_at', 'minutes'], row: closedTime },
  { table: 'capacity_hours', columns: ['user_id', 'weekday', 'start_time', 'end_time'] },
  { table: 'capacity_days_off', columns: ['user_id', 'date_from', 'date_to'] },
  { table: 'memberships', columns: ['user_id', 'role'], row: paints },
];

const changed = (columns: string[]) => columns.map((c) => `old.${c} is distinct from new.${c}`).join(' or ');
/** An update bumps when a watched column changed, and (with a row condition) the row counts before or after. */
const updateWhen = (w: Watch) => (w.row ? `(${changed(w.columns)}) and (${w.row('old')} or ${w.row('new')})` : changed(w.columns));

/** Studios a renamed person paints for, or once painted for (figures keep their painter after they leave). */
const studiosOfUser = 'select studio_id from memberships where user_id = new.id union select studio_id from figures where painter_id = new.id';

const bump = (where: string) => `update studios set schedule_version = schedule_version + 1 where ${where};`;

function sqliteTriggers(): string[] {
  const out: string[] = [];
  for (const w of watched) {
    const name = `schedule_version_${w.table}`;
    if (w.rows !== false) {
      const when = (r: string) => (w.row ? ` when ${w.row(r)}` : '');
      out.push(`create trigger ${name}_insert after insert on ${w.table}${when('new')} begin ${bump('id = new.studio_id')} end`);
      out.push(`create trigger ${name}_delete after delete on ${w.table}${when('old')} begin ${bump('id = old.studio_id')} end`);
    }
    out.push(`create trigger ${name}_update after update of ${w.columns.join(', ')} on ${w.table} when ${updateWhen(w)} begin ${bump('id = new.studio_id')} end`);
  }
  // SQLite runs no trigger from inside its own trigger's update (recursive_triggers is off), and this
  // update leaves the zone alone anyway.
  out.push(`create trigger schedule_version_studios_update after update of timezone on studios when ${changed(['timezone'])} begin ${bump('id = new.id')} end`);
  out.push(`create trigger schedule_version_users_update after update of name on users when ${changed(['name'])} begin ${bump(`id in (${studiosOfUser})`)} end`);
  return out;
}

const sqliteTriggerNames = () => [
  ...watched.flatMap((w) => (w.rows !== false ? ['insert', 'delete', 'update'] : ['update']).map((k) => `schedule_version_${w.table}_${k}`)),
  'schedule_version_studios_update',
  'schedule_version_users_update',
];

/**
 * PostgreSQL: `schedule_version_touch(studio)` bumps a studio once per transaction (the studios already
 * bumped are listed in a transaction-local setting, gone at commit or rollback); the trigger functions
 * find the studio of the row.
 */
const pgFunctions = [
  `create function schedule_version_touch(sid bigint) returns void language plpgsql as $$
declare
  seen text := coalesce(current_setting('sablework.schedule_version_bumped', true), '');
begin
  if sid is null or position(',' || sid || ',' in seen) > 0 then
    return;
  end if;
  ${bump('id = sid')}
  perform set_config('sablework.schedule_version_bumped', coalesce(nullif(seen, ''), ',') || sid || ',', true);
end
$$`,
  `create function schedule_version_row() returns trigger language plpgsql as $$
begin
  if tg_op = 'DELETE' then
    perform schedule_version_touch(old.studio_id);
  else
    perform schedule_version_touch(new.studio_id);
  end if;
  return null;
end
$$`,
  `create function schedule_version_studio() returns trigger language plpgsql as $$
begin
  perform schedule_version_touch(new.id);
  return null;
end
$$`,
  `create function schedule_version_user() returns trigger language plpgsql as $$
declare
  sid bigint;
begin
  for sid in ${studiosOfUser} order by 1 loop
    perform schedule_version_touch(sid);
  end loop;
  return null;
end
$$`,
];
const pgFunctionNames = ['schedule_version_row()', 'schedule_version_studio()', 'schedule_version_user()', 'schedule_version_touch(bigint)'];

const deferred = (name: string, event: string, table: string, when: string | null, fn: string) =>
  `create constraint trigger ${name} after ${event} on ${table} deferrable initially deferred for each row${when ? ` when (${when})` : ''} execute function ${fn}()`;

function pgTriggers(): string[] {
  const out: string[] = [];
  for (const w of watched) {
    const name = `schedule_version_${w.table}`;
    if (w.rows !== false) {
      out.push(deferred(`${name}_insert`, 'insert', w.table, w.row ? w.row('new') : null, 'schedule_version_row'));
      out.push(deferred(`${name}_delete`, 'delete', w.table, w.row ? w.row('old') : null, 'schedule_version_row'));
    }
    out.push(deferred(`${name}_update`, `update of ${w.columns.join(', ')}`, w.table, updateWhen(w), 'schedule_version_row'));
  }
  out.push(deferred('schedule_version_studios_update', 'update of timezone', 'studios', changed(['timezone']), 'schedule_version_studio'));
  out.push(deferred('schedule_version_users_update', 'update of name', 'users', changed(['name']), 'schedule_version_user'));
  return out;
}

const pgTriggerTables = () => [
  ...watched.flatMap((w) => (w.rows !== false ? ['insert', 'delete', 'update'] : ['update']).map((k) => ({ name: `schedule_version_${w.table}_${k}`, table: w.table }))),
  { name: 'schedule_version_studios_update', table: 'studios' },
  { name: 'schedule_version_users_update', table: 'users' },
];

const isPostgres = (knex: Knex) => knex.client.config.client === 'pg';

/** The triggers, for the migration and for a bulk loader that sets them aside while it fills tables. */
export async function createScheduleVersionTriggers(knex: Knex) {
  const sql = isPostgres(knex) ? [...pgFunctions, ...pgTriggers()] : sqliteTriggers();
  for (const s of sql) await knex.raw(s);
}

export async function dropScheduleVersionTriggers(knex: Knex) {
  if (isPostgres(knex)) {
    for (const t of pgTriggerTables()) await knex.raw(`drop trigger if exists ${t.name} on ${t.table}`);
    for (const f of pgFunctionNames) await knex.raw(`drop function if exists ${f}`);
    return;
  }
  for (const name of sqliteTriggerNames()) await knex.raw(`drop trigger if exists ${name}`);
}

export async function up(knex: Knex) {
  await knex.schema.alterTable('studios', (t) => {
    t.integer('schedule_version').notNullable().defaultTo(0);
  });
  await createScheduleVersionTriggers(knex);
}

export async function down(knex: Knex) {
  await dropScheduleVersionTriggers(knex);
  if (isPostgres(knex)) {
    await knex.schema.alterTable('studios', (t) => {
      t.dropColumn('schedule_version');
    });
    return;
  }
  // In place (SQLite 3.35+): Knex's dropColumn would copy the table.
  await knex.raw('alter table studios drop column schedule_version');
}
