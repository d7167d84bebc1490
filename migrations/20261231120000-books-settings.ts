import type { Knex } from 'knex';

// What the payment service keeps of each card payment, so the books can show earnings net of fees.
// The service's own fee schedule varies by country and card; the owner enters theirs (basis points + fixed).
export async function up(knex: Knex) {
  await knex.schema.createTable('books_settings', (t) => {
    t.integer('studio_id').primary().references('studios.id').onDelete('CASCADE');
    t.integer('card_fee_bp').notNullable().defaultTo(0); // 1 bp = 0.01 %
    t.integer('card_fee_fixed').notNullable().defaultTo(0); // minor units per card payment
    t.string('updated_at', 30).notNullable();
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTableIfExists('books_settings');
}
