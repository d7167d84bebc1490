import type { Knex } from 'knex';

// Both ends of a commission: the studio's public page and its enquiries (with figure lines, photos and
// the abuse counters of the public form), the models received from the client, and shipping out
// (the studio's packing defaults and auto-close setting, one shipment per commission).
export async function up(knex: Knex) {
  await knex.schema.createTable('studio_public_pages', (t) => {
    t.integer('studio_id').primary().references('studios.id').onDelete('CASCADE');
    t.boolean('enabled').notNullable().defaultTo(false);
    t.string('intro', 1000);
    t.string('turnaround_text', 300);
    t.string('turnaround_source', 10).notNullable().defaultTo('forecast'); // forecast | text
    t.string('updated_at', 30).notNullable();
  });

  await knex.schema.createTable('studio_shipping_settings', (t) => {
    t.integer('studio_id').primary().references('studios.id').onDelete('CASCADE');
    t.integer('auto_close_days'); // null: never close by itself
    t.string('from_country', 2);
    t.text('packing_items').notNullable(); // JSON array of labels
    t.string('updated_at', 30).notNullable();
  });

  await knex.schema.createTable('enquiries', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.string('status', 12).notNullable(); // new | accepted | declined
    t.string('name', 120).notNullable();
    t.string('email', 254).notNullable();
    t.string('tier', 32);
    t.text('extras').notNullable(); // JSON array of extra keys
    t.string('due_date', 10);
    t.bigInteger('budget_minor');
    t.string('currency', 3).notNullable();
    t.text('notes');
    t.string('consent_at', 30).notNullable();
    t.string('created_at', 30).notNullable();
    t.string('decided_at', 30);
    t.integer('decided_by').references('users.id').onDelete('SET NULL');
    t.integer('client_id').references('clients.id').onDelete('SET NULL');
    t.integer('commission_id').references('commissions.id').onDelete('SET NULL');
    t.text('decline_message');
    t.index(['studio_id', 'status', 'created_at']);
  });

  await knex.schema.createTable('enquiry_figures', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('enquiry_id').notNullable().references('enquiries.id').onDelete('CASCADE');
    t.integer('position').notNullable();
    t.string('name', 120).notNullable();
    t.integer('quantity').notNullable();
    t.string('size_class', 8).notNullable();
    t.index(['enquiry_id', 'position']);
  });

  // The files follow the photos feature's layout (<key>/original.<ext>, <key>/<size>.webp); on accept a
  // reference photo of the new commission takes over the same key.
  await knex.schema.createTable('enquiry_photos', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('enquiry_id').notNullable().references('enquiries.id').onDelete('CASCADE');
    t.string('storage_key', 120).notNullable().unique();
    t.string('format', 8).notNullable();
    t.integer('width').notNullable();
    t.integer('height').notNullable();
    t.integer('bytes').notNullable();
    t.integer('photo_id').references('photos.id').onDelete('SET NULL');
    t.string('created_at', 30).notNullable();
    t.index(['enquiry_id']);
  });

  // Submissions of the public form, by hashed address and e-mail, for the rate limits.
  await knex.schema.createTable('public_attempts', (t) => {
    t.increments('id');
    t.string('scope', 12).notNullable(); // try | ip | email
    t.string('key', 64).notNullable();
    t.string('at', 30).notNullable();
    t.index(['scope', 'key', 'at']);
  });

  await knex.schema.createTable('models_in', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('commission_id').notNullable().unique().references('commissions.id').onDelete('CASCADE');
    t.string('supplier', 16).notNullable(); // client_ships | studio_buys | retailer
    t.string('retailer', 120);
    t.string('expected_on', 10);
    t.string('received_on', 10);
    t.string('carrier', 80);
    t.string('tracking', 80);
    t.text('note');
    t.string('notice_sent_at', 30);
    t.integer('updated_by').references('users.id').onDelete('SET NULL');
    t.string('created_at', 30).notNullable();
    t.string('updated_at', 30).notNullable();
  });

  await knex.schema.createTable('models_in_figures', (t) => {
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('commission_id').notNullable().references('commissions.id').onDelete('CASCADE');
    t.integer('figure_id').notNullable().references('figures.id').onDelete('CASCADE');
    t.integer('received').notNullable().defaultTo(0);
    t.boolean('damaged').notNullable().defaultTo(false);
    t.string('note', 300);
    t.primary(['commission_id', 'figure_id']);
  });

  await knex.schema.createTable('shipments', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('commission_id').notNullable().unique().references('commissions.id').onDelete('CASCADE');
    t.string('status', 12).notNullable(); // preparing | shipped | delivered
    t.string('ship_to_name', 120);
    t.string('ship_to_line1', 200);
    t.string('ship_to_line2', 200);
    t.string('ship_to_city', 100);
    t.string('ship_to_region', 100);
    t.string('ship_to_postal_code', 20);
    t.string('ship_to_country', 2);
    t.string('carrier', 80);
    t.string('service', 80);
    t.string('tracking', 80);
    t.integer('weight_grams');
    t.integer('length_cm');
    t.integer('width_cm');
    t.integer('height_cm');
    t.bigInteger('insured_minor');
    t.string('currency', 3).notNullable();
    t.text('customs_text');
    t.text('checklist').notNullable(); // JSON [{label, done}]
    t.string('shipped_at', 30);
    t.integer('shipped_by').references('users.id').onDelete('SET NULL');
    t.string('override_reason', 500);
    t.string('delivered_on', 10);
    t.string('received_by', 8); // client | studio
    t.string('auto_closed_at', 30);
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.string('created_at', 30).notNullable();
    t.string('updated_at', 30).notNullable();
    t.index(['status', 'shipped_at']);
  });
}

export async function down(knex: Knex) {
  for (const table of [
    'shipments',
    'models_in_figures',
    'models_in',
    'public_attempts',
    'enquiry_photos',
    'enquiry_figures',
    'enquiries',
    'studio_shipping_settings',
    'studio_public_pages',
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
}
