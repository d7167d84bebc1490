import type { Knex } from 'knex';

// The paint rack, reusable recipes with ordered steps, a commission's scheme, and a cache of the
// dominant colours of reference photos (matches against the rack are computed fresh: the rack changes).
export async function up(knex: Knex) {
  await knex.schema.createTable('paints', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.string('name', 120).notNullable();
    t.string('maker', 80);
    t.string('range_name', 80);
    t.string('type', 16).notNullable(); // shared/schemas/paints paintTypes
    t.string('finish', 8); // matte | satin | gloss
    t.string('hex', 7); // "#RRGGBB"; a medium or varnish may have none
    t.integer('stock').notNullable().defaultTo(0); // pots on the rack
    t.integer('low_stock_threshold'); // low when stock is under this
    t.text('notes');
    // lower-cased "name|maker": one paint of a name per maker in a studio, and what CSV import matches on
    t.string('match_key', 210).notNullable();
    t.string('created_at', 30).notNullable();
    t.string('updated_at', 30).notNullable();
    t.unique(['studio_id', 'match_key']);
  });
  await knex.schema.createTable('recipes', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.string('name', 120).notNullable();
    t.text('description');
    t.string('colour', 7); // the target colour, e.g. picked from a reference photo
    t.integer('source_photo_id').references('photos.id').onDelete('SET NULL');
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.string('created_at', 30).notNullable();
    t.string('updated_at', 30).notNullable();
    t.index(['studio_id', 'name']);
  });
  await knex.schema.createTable('recipe_steps', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('recipe_id').notNullable().references('recipes.id').onDelete('CASCADE');
    t.integer('position').notNullable();
    t.string('technique', 20).notNullable();
    t.boolean('airbrush').notNullable().defaultTo(false);
    t.float('psi');
    t.integer('dilution_diluent_parts'); // e.g. 5 (water) : 1 (paint) for a glaze
    t.integer('dilution_paint_parts');
    t.string('dilution_with', 8); // water | medium | thinner
    t.integer('ladder_steps'); // set when the step is a ladder from its first paint to its second
    t.string('tool', 80);
    t.text('notes');
    t.index(['studio_id', 'recipe_id', 'position']);
  });
  await knex.schema.createTable('recipe_step_paints', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('step_id').notNullable().references('recipe_steps.id').onDelete('CASCADE');
    // No cascade: a paint used by a recipe cannot be taken off the rack until the recipe lets go of it.
    t.integer('paint_id').notNullable().references('paints.id');
    t.integer('position').notNullable();
    t.float('parts').notNullable().defaultTo(1);
    t.index(['studio_id', 'paint_id']);
    t.index(['step_id']);
  });
  await knex.schema.createTable('schemes', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('commission_id').notNullable().references('commissions.id').onDelete('CASCADE');
    t.integer('figure_id').references('figures.id').onDelete('CASCADE'); // null: every figure of the commission
    t.string('area', 80).notNullable();
    t.integer('recipe_id').notNullable().references('recipes.id'); // no cascade, as for paints
    t.integer('position').notNullable();
    t.string('notes', 500);
    t.string('created_at', 30).notNullable();
    t.string('updated_at', 30).notNullable();
    t.index(['studio_id', 'commission_id', 'position']);
    t.index(['studio_id', 'recipe_id']);
  });
  await knex.schema.createTable('photo_palettes', (t) => {
    t.integer('photo_id').primary().references('photos.id').onDelete('CASCADE');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.text('colours').notNullable(); // JSON [{hex, share}]
    t.string('created_at', 30).notNullable();
  });
}

export async function down(knex: Knex) {
  for (const table of ['photo_palettes', 'schemes', 'recipe_step_paints', 'recipe_steps', 'recipes', 'paints']) {
    await knex.schema.dropTableIfExists(table);
  }
}
