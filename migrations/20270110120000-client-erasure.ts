import type { Knex } from 'knex';

// When a client's personal data was erased (privacy feature): the row stays as an anonymised
// placeholder because kept invoices point at it; this marks it so a second erase changes nothing.
export async function up(knex: Knex) {
  await knex.schema.alterTable('clients', (t) => {
    t.string('erased_at', 30);
  });
}

export async function down(knex: Knex) {
  await knex.schema.alterTable('clients', (t) => {
    t.dropColumn('erased_at');
  });
}
