import type { Knex } from 'knex';

// Hours are kept as whole minutes (integers); the API speaks hours with up to two decimals.
export async function up(knex: Knex) {
  // The studio's own lists: tiers and extras (editable), seeded at studio creation.
  await knex.schema.createTable('studio_lists', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.string('list', 16).notNullable(); // 'tier' | 'extra'
    t.string('key', 40).notNullable();
    t.string('label', 80).notNullable();
    t.integer('position').notNullable();
    t.unique(['studio_id', 'list', 'key']);
  });
  // Hazard texts per studio (defaults from the handbook's safety notes; the studio may edit them).
  await knex.schema.createTable('studio_hazards', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.string('key', 24).notNullable();
    t.string('title', 80).notNullable();
    t.text('text').notNullable();
    t.unique(['studio_id', 'key']);
  });
  await knex.schema.createTable('stage_templates', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.string('key', 40).notNullable();
    t.string('name', 80).notNullable();
    t.integer('position').notNullable();
    t.integer('default_minutes').notNullable().defaultTo(0);
    t.integer('wait_minutes').notNullable().defaultTo(0);
    t.text('hazards').notNullable().defaultTo('[]'); // JSON array of hazard keys
    t.unique(['studio_id', 'key']);
  });
  await knex.schema.createTable('commissions', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('client_id').notNullable().references('clients.id');
    t.string('title', 120).notNullable();
    t.text('brief');
    t.text('scheme_notes'); // the client's notes for the colour scheme
    t.string('due_date', 10); // local date yyyy-mm-dd in the studio's timezone
    t.string('priority', 12).notNullable().defaultTo('normal');
    t.string('status', 16).notNullable().defaultTo('enquiry');
    t.string('status_before_hold', 16);
    t.text('cancel_reason');
    t.integer('queue_position');
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.string('created_at', 30).notNullable();
    t.string('updated_at', 30).notNullable();
    t.index(['studio_id', 'status']);
    t.index(['studio_id', 'client_id']);
    t.index(['studio_id', 'queue_position']);
  });
  await knex.schema.createTable('figures', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('commission_id').notNullable().references('commissions.id').onDelete('CASCADE');
    t.string('name', 120).notNullable();
    t.integer('quantity').notNullable().defaultTo(1);
    t.string('size_class', 8).notNullable(); // '25' … '160' (base diameter in mm) or 'large'
    t.string('footprint', 80); // for 'large': e.g. '180 × 110 mm'
    t.string('tier', 40).notNullable();
    t.text('extras').notNullable().defaultTo('[]');
    t.text('sub_assemblies').notNullable().defaultTo('[]');
    t.string('light_source', 200);
    t.integer('painter_id').references('users.id').onDelete('SET NULL');
    t.integer('position').notNullable().defaultTo(0);
    t.string('created_at', 30).notNullable();
    t.string('updated_at', 30).notNullable();
    t.index(['studio_id', 'commission_id']);
    t.index(['studio_id', 'painter_id']);
  });
  await knex.schema.createTable('stages', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('commission_id').notNullable().references('commissions.id').onDelete('CASCADE');
    t.integer('figure_id').notNullable().references('figures.id').onDelete('CASCADE');
    t.string('template_key', 40).notNullable();
    t.string('name', 80).notNullable();
    t.integer('position').notNullable();
    t.string('status', 12).notNullable().defaultTo('todo'); // todo | working | done | skipped
    t.integer('estimate_minutes').notNullable().defaultTo(0);
    t.integer('wait_minutes').notNullable().defaultTo(0);
    t.text('hazards').notNullable().defaultTo('[]');
    t.integer('done_by').references('users.id').onDelete('SET NULL');
    t.string('done_at', 30);
    t.string('updated_at', 30).notNullable();
    t.index(['studio_id', 'figure_id', 'position']);
    t.index(['studio_id', 'commission_id']);
    t.index(['studio_id', 'status']);
  });
  await knex.schema.createTable('time_entries', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('commission_id').notNullable().references('commissions.id').onDelete('CASCADE');
    t.integer('figure_id').notNullable().references('figures.id').onDelete('CASCADE');
    t.integer('stage_id').notNullable().references('stages.id').onDelete('CASCADE');
    t.integer('user_id').notNullable().references('users.id');
    t.string('source', 8).notNullable(); // timer | manual
    t.string('started_at', 30).notNullable();
    t.string('ended_at', 30); // null while a timer runs
    t.integer('minutes'); // set when the entry is closed
    t.string('note', 500);
    t.string('created_at', 30).notNullable();
    t.string('updated_at', 30).notNullable();
    t.index(['studio_id', 'stage_id']);
    t.index(['studio_id', 'commission_id']);
    t.index(['user_id', 'ended_at']);
  });
  // Who did what, when, on a commission: every change lands here and shows on the commission.
  await knex.schema.createTable('activity', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('commission_id').references('commissions.id').onDelete('CASCADE');
    t.integer('user_id').references('users.id').onDelete('SET NULL');
    t.string('action', 40).notNullable();
    t.text('detail').notNullable().defaultTo('{}'); // JSON
    t.string('at', 30).notNullable();
    t.index(['studio_id', 'commission_id', 'at']);
  });
}

export async function down(knex: Knex) {
  for (const table of ['activity', 'time_entries', 'stages', 'figures', 'commissions', 'stage_templates', 'studio_hazards', 'studio_lists']) {
    await knex.schema.dropTableIfExists(table);
  }
}
