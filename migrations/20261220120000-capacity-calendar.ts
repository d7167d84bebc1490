import type { Knex } from 'knex';

// The studio's calendar: when each painter works, when they do not, and the secret addresses of the
// calendar feeds. Local dates are yyyy-mm-dd in the studio's timezone; clock times are 'HH:mm' local.
export async function up(knex: Knex) {
  // Working hours: one row per range of an ISO weekday (1 = Monday .. 7 = Sunday); a lunch break is two rows.
  await knex.schema.createTable('capacity_hours', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('user_id').notNullable().references('users.id').onDelete('CASCADE');
    t.integer('weekday').notNullable();
    t.string('start_time', 5).notNullable();
    t.string('end_time', 5).notNullable();
    t.string('updated_at', 30).notNullable();
    t.index(['studio_id', 'user_id']);
  });
  // Days without work, inclusive ranges: a painter's day off or holiday (user_id set), or a day the whole
  // studio is closed, such as a public holiday (user_id null).
  await knex.schema.createTable('capacity_days_off', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('user_id').references('users.id').onDelete('CASCADE');
    t.string('kind', 12).notNullable(); // day_off | holiday | closed
    t.string('date_from', 10).notNullable();
    t.string('date_to', 10).notNullable();
    t.string('note', 120);
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.string('created_at', 30).notNullable();
    t.index(['studio_id', 'date_to']);
  });
  // One feed per person and studio; only the SHA-256 of the token is kept, so the address is shown once.
  await knex.schema.createTable('calendar_feeds', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('user_id').notNullable().references('users.id').onDelete('CASCADE');
    t.string('token_hash', 64).notNullable().unique();
    t.string('created_at', 30).notNullable();
    t.string('last_used_at', 30);
    t.unique(['studio_id', 'user_id']);
  });
}

export async function down(knex: Knex) {
  for (const table of ['calendar_feeds', 'capacity_days_off', 'capacity_hours']) await knex.schema.dropTableIfExists(table);
}
