import type { Knex } from 'knex';

// A person's sessions remember the epoch they were signed in at; raising it (after a password reset) ends every
// session from before, on every device, while the session rows themselves expire as usual.
export async function up(knex: Knex) {
  await knex.schema.alterTable('users', (t) => {
    t.integer('session_epoch').notNullable().defaultTo(0);
  });
}

export async function down(knex: Knex) {
  await knex.schema.alterTable('users', (t) => {
    t.dropColumn('session_epoch');
  });
}
