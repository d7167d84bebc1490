import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.createTable('photos', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('commission_id').notNullable().references('commissions.id').onDelete('CASCADE');
    t.integer('figure_id').references('figures.id').onDelete('SET NULL');
    t.integer('stage_id').references('stages.id').onDelete('SET NULL');
    t.string('kind', 12).notNullable(); // progress | reference | condition | packing
    t.string('caption', 300);
    t.boolean('shared').notNullable().defaultTo(false);
    t.integer('uploaded_by').references('users.id').onDelete('SET NULL');
    t.integer('width').notNullable();
    t.integer('height').notNullable();
    t.integer('bytes').notNullable();
    t.string('storage_key', 120).notNullable().unique();
    t.string('created_at', 30).notNullable();
    t.index(['studio_id', 'commission_id', 'created_at']);
  });
  await knex.schema.createTable('comments', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('commission_id').notNullable().references('commissions.id').onDelete('CASCADE');
    t.integer('user_id').references('users.id').onDelete('SET NULL');
    t.text('body').notNullable();
    t.string('created_at', 30).notNullable();
    t.index(['studio_id', 'commission_id', 'created_at']);
  });
  // Approval requests to the client: the scheme, a test figure, the finished work.
  await knex.schema.createTable('approvals', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('commission_id').notNullable().references('commissions.id').onDelete('CASCADE');
    t.string('subject', 16).notNullable(); // scheme | test-figure | finished
    t.string('status', 16).notNullable().defaultTo('requested'); // requested | approved | changes
    t.text('request_note');
    t.integer('requested_by').references('users.id').onDelete('SET NULL');
    t.string('requested_at', 30).notNullable();
    t.integer('decided_by').references('users.id').onDelete('SET NULL');
    t.string('decided_at', 30);
    t.text('comment');
    t.index(['studio_id', 'commission_id']);
  });
}

export async function down(knex: Knex) {
  for (const table of ['approvals', 'comments', 'photos']) await knex.schema.dropTableIfExists(table);
}
