import type { Knex } from 'knex';

// The stored original keeps the uploaded format (re-encoded, upright, without metadata), so serving it
// needs to know which one it is; renditions are always WebP.
export async function up(knex: Knex) {
  await knex.schema.alterTable('photos', (t) => {
    t.string('format', 8).notNullable().defaultTo('jpeg'); // jpeg | png | webp
  });
}

export async function down(knex: Knex) {
  await knex.schema.alterTable('photos', (t) => {
    t.dropColumn('format');
  });
}
