import type { Knex } from 'knex';

/**
 * `commissions.thread_version`: a number the database moves whenever a row read by one of the commission's
 * own sub-lists changes: its comments (GET …/commissions/:id/comments), its activity (…/activity) and the
 * time logged on its stages (GET …/stages/:id/time). Those answers are kept in memory per commission,
 * version and query (server/features/comments/comments.service.ts, activity/activity.service.ts,
 * time/time.service.ts); the version is read in the same one-row read as the access check each request
 * makes anyway (does the commission, or the stage's commission, exist in this studio, and may a client see
 * it), so a kept answer costs that read alone. Per commission, not per studio: a comment or a time entry
 * moves only its own commission's answers, not those of the studio's other commissions.
 *
 * What those answers read, and what moves the version (every insert, delete and update unless columns are named):
 *
 * - comments (every column; the thread) and activity (every column; the log): their commission, old and new
 *   (an activity row without a commission moves nothing).
 * - time_entries (every column; a stage's time): the commission of the entry's stage, old and new stage (the
 *   time list is read under its stage's commission, so that is the one moved, whatever the entry's own
 *   commission_id says).
 * - stages.commission_id: both commissions (a stage's time is kept under the commission it is in).
 * - users.name (the author shown on comments, activity and time): every commission with a comment, an
 *   activity row or time of that person. A person deleted sets comments' and activity's user_id to null
 *   (their foreign keys), which moves them as updates; time keeps its person (no cascade).
 * - memberships (the author's role in the studio, shown on comments): inserts, deletes and changes of
 *   role, user_id or studio_id, on the studio's commissions with comments of that person.
 *
 * What the answers do not read: the commission, stage and figure rows themselves beyond their existence
 * (checked live by the version read, never kept), and the clock.
 *
 * Same shape as the lists version's triggers (20270207120000-lists-version.ts), on both engines: inside the
 * writing transaction, whatever code writes (the API, seeds, an import, a foreign-key cascade). PostgreSQL:
 * deferred constraint triggers bump a commission once per transaction, at its commit, through
 * `thread_version_touch(commission)`. Updating `thread_version` alone fires no other trigger on commissions
 * (theirs name their columns). Trigger names start with `thread_version_` (the bench generator sets them
 * aside while it fills: a freshly filled database needs no version but 0).
 *
 * Two indexes, comments(user_id) and activity(user_id), let a change of a person's name find their
 * commissions without reading every comment and activity row.
 */

const bump = (where: string) => `update commissions set thread_version = thread_version + 1 where ${where};`;

/** The commission ids a person's rows are on (`u` the person's id): comments, activity, and the stages of their time. */
const personsCommissions = (u: string) =>
  `select commission_id from comments where user_id = ${u} union select commission_id from activity where user_id = ${u} and commission_id is not null union select s.commission_id from time_entries t join stages s on s.id = t.stage_id where t.user_id = ${u}`;
/** The studio's commissions with comments of a membership's person (`m` is NEW or OLD). */
const membersCommissions = (m: string) => `select commission_id from comments where studio_id = ${m}.studio_id and user_id = ${m}.user_id`;
const stageCommission = (r: string) => `(select commission_id from stages where id = ${r}.stage_id)`;

type Trigger = { name: string; table: string; event: string; when?: string; sqlite: string[]; pg: string };

const rowTables = ['comments', 'activity'] as const;
const memberColumns = ['role', 'user_id', 'studio_id'];
const changed = (columns: string[]) => columns.map((c) => `old.${c} is distinct from new.${c}`).join(' or ');

const triggers: Trigger[] = [
  ...rowTables.flatMap((table): Trigger[] => [
    { name: `thread_version_${table}_insert`, table, event: 'insert', sqlite: [bump('id = new.commission_id')], pg: 'thread_version_row' },
    { name: `thread_version_${table}_delete`, table, event: 'delete', sqlite: [bump('id = old.commission_id')], pg: 'thread_version_row' },
    { name: `thread_version_${table}_update`, table, event: 'update', sqlite: [bump('id in (new.commission_id, old.commission_id)')], pg: 'thread_version_row' },
  ]),
  { name: 'thread_version_time_entries_insert', table: 'time_entries', event: 'insert', sqlite: [bump(`id = ${stageCommission('new')}`)], pg: 'thread_version_time' },
  { name: 'thread_version_time_entries_delete', table: 'time_entries', event: 'delete', sqlite: [bump(`id = ${stageCommission('old')}`)], pg: 'thread_version_time' },
  {
    name: 'thread_version_time_entries_update',
    table: 'time_entries',
    event: 'update',
    sqlite: [bump(`id in (${stageCommission('new')}, ${stageCommission('old')})`)],
    pg: 'thread_version_time',
  },
  {
    name: 'thread_version_stages_update',
    table: 'stages',
    event: 'update of commission_id',
    when: changed(['commission_id']),
    sqlite: [bump('id in (new.commission_id, old.commission_id)')],
    pg: 'thread_version_row',
  },
  { name: 'thread_version_users_update', table: 'users', event: 'update of name', when: changed(['name']), sqlite: [bump(`id in (${personsCommissions('new.id')})`)], pg: 'thread_version_user' },
  { name: 'thread_version_memberships_insert', table: 'memberships', event: 'insert', sqlite: [bump(`id in (${membersCommissions('new')})`)], pg: 'thread_version_member' },
  { name: 'thread_version_memberships_delete', table: 'memberships', event: 'delete', sqlite: [bump(`id in (${membersCommissions('old')})`)], pg: 'thread_version_member' },
  {
    name: 'thread_version_memberships_update',
    table: 'memberships',
    event: `update of ${memberColumns.join(', ')}`,
    when: changed(memberColumns),
    sqlite: [bump(`id in (${membersCommissions('new')}) or id in (${membersCommissions('old')})`)],
    pg: 'thread_version_member',
  },
];

/** Every trigger by name, with its table (the tests drop them one at a time). */
export const threadVersionTriggers = () => triggers.map((t) => ({ name: t.name, table: t.table }));

const indexes = [
  { table: 'comments', column: 'user_id', name: 'comments_user_id_index' },
  { table: 'activity', column: 'user_id', name: 'activity_user_id_index' },
];

/** PostgreSQL: once per commission and transaction (the commissions bumped are listed in a transaction-local setting). */
const pgFunctions = [
  `create function thread_version_touch(cid bigint) returns void language plpgsql as $$
declare
  seen text := coalesce(current_setting('sablework.thread_version_bumped', true), '');
begin
  if cid is null or position(',' || cid || ',' in seen) > 0 then
    return;
  end if;
  ${bump('id = cid')}
  perform set_config('sablework.thread_version_bumped', coalesce(nullif(seen, ''), ',') || cid || ',', true);
end
$$`,
  // comments, activity and stages: the row's commission_id.
  `create function thread_version_row() returns trigger language plpgsql as $$
begin
  if tg_op = 'DELETE' then
    perform thread_version_touch(old.commission_id);
  elsif tg_op = 'UPDATE' then
    perform thread_version_touch(new.commission_id);
    perform thread_version_touch(old.commission_id);
  else
    perform thread_version_touch(new.commission_id);
  end if;
  return null;
end
$$`,
  // time_entries: the commission of the entry's stage (at commit).
  `create function thread_version_time() returns trigger language plpgsql as $$
begin
  if tg_op = 'DELETE' then
    perform thread_version_touch(${stageCommission('old')});
  elsif tg_op = 'UPDATE' then
    perform thread_version_touch(${stageCommission('new')});
    perform thread_version_touch(${stageCommission('old')});
  else
    perform thread_version_touch(${stageCommission('new')});
  end if;
  return null;
end
$$`,
  `create function thread_version_user() returns trigger language plpgsql as $$
begin
  perform thread_version_touch(c.commission_id) from (${personsCommissions('new.id')} order by 1) c;
  return null;
end
$$`,
  `create function thread_version_member() returns trigger language plpgsql as $$
begin
  if tg_op <> 'INSERT' then
    perform thread_version_touch(c.commission_id) from (${membersCommissions('old')}) c;
  end if;
  if tg_op <> 'DELETE' then
    perform thread_version_touch(c.commission_id) from (${membersCommissions('new')}) c;
  end if;
  return null;
end
$$`,
];
const pgFunctionNames = ['thread_version_row()', 'thread_version_time()', 'thread_version_user()', 'thread_version_member()', 'thread_version_touch(bigint)'];

const isPostgres = (knex: Knex) => knex.client.config.client === 'pg';

function statements(pg: boolean): string[] {
  if (pg)
    return [
      ...pgFunctions,
      ...triggers.map(
        (t) =>
          `create constraint trigger ${t.name} after ${t.event} on ${t.table} deferrable initially deferred for each row${t.when ? ` when (${t.when})` : ''} execute function ${t.pg}()`,
      ),
    ];
  return triggers.map((t) => `create trigger ${t.name} after ${t.event} on ${t.table}${t.when ? ` when ${t.when}` : ''} begin ${t.sqlite.join(' ')} end`);
}

/** The triggers, for the migration and for a bulk loader that sets them aside while it fills tables. */
export async function createThreadVersionTriggers(knex: Knex) {
  for (const s of statements(isPostgres(knex))) await knex.raw(s);
}

export async function dropThreadVersionTriggers(knex: Knex) {
  if (isPostgres(knex)) {
    for (const t of triggers) await knex.raw(`drop trigger if exists ${t.name} on ${t.table}`);
    for (const f of pgFunctionNames) await knex.raw(`drop function if exists ${f}`);
    return;
  }
  for (const t of triggers) await knex.raw(`drop trigger if exists ${t.name}`);
}

export async function up(knex: Knex) {
  await knex.schema.alterTable('commissions', (t) => {
    t.integer('thread_version').notNullable().defaultTo(0);
  });
  for (const i of indexes)
    await knex.schema.alterTable(i.table, (t) => {
      t.index([i.column], i.name);
    });
  await createThreadVersionTriggers(knex);
}

export async function down(knex: Knex) {
  await dropThreadVersionTriggers(knex);
  for (const i of indexes)
    await knex.schema.alterTable(i.table, (t) => {
      t.dropIndex([i.column], i.name);
    });
  if (isPostgres(knex)) {
    await knex.schema.alterTable('commissions', (t) => {
      t.dropColumn('thread_version');
    });
    return;
  }
  // In place (SQLite 3.35+): Knex's dropColumn would copy the table.
  await knex.raw('alter table commissions drop column thread_version');
}
