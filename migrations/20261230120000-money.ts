import type { Knex } from 'knex';

// Quotes, invoices and payments. Money columns are integers in the currency's minor units (ISO 4217
// digits); JSON columns hold the engine's input and result as the API shows them.
export async function up(knex: Knex) {
  // One price table per studio (shared/schemas/price-table.ts); a studio without a row quotes from the defaults.
  await knex.schema.createTable('price_tables', (t) => {
    t.integer('studio_id').primary().references('studios.id').onDelete('CASCADE');
    t.text('table_json').notNullable();
    t.integer('updated_by').references('users.id').onDelete('SET NULL');
    t.string('updated_at', 30).notNullable();
  });

  await knex.schema.createTable('quotes', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('commission_id').notNullable().references('commissions.id').onDelete('CASCADE');
    t.integer('client_id').notNullable().references('clients.id');
    t.integer('version').notNullable();
    t.string('status', 20).notNullable(); // draft | sent | accepted | changes_requested | declined | expired | superseded
    t.text('input_json').notNullable(); // figures, extra lines, due date (the engine input without the table)
    t.text('price_table_json').notNullable(); // the table the result was priced with
    t.text('result_json').notNullable(); // shared/pricing.ts QuoteResult
    t.string('currency', 3).notNullable();
    t.bigInteger('total').notNullable();
    t.bigInteger('deposit').notNullable();
    t.bigInteger('balance').notNullable();
    t.string('quote_date', 10).notNullable(); // the engine's "today"
    t.string('valid_until', 10).notNullable();
    t.boolean('show_hours').notNullable().defaultTo(false);
    t.text('terms').notNullable().defaultTo('');
    t.string('sent_at', 30);
    t.string('decided_at', 30);
    t.integer('decided_by').references('users.id').onDelete('SET NULL');
    t.string('accepted_name', 120);
    t.string('accepted_ip', 64);
    t.text('decision_comment');
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.string('created_at', 30).notNullable();
    t.string('updated_at', 30).notNullable();
    t.unique(['studio_id', 'commission_id', 'version']);
    t.index(['studio_id', 'status']);
  });

  // The next invoice number per studio and year; updated in the transaction that issues the invoice.
  await knex.schema.createTable('invoice_counters', (t) => {
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('year').notNullable();
    t.integer('last').notNullable().defaultTo(0);
    t.primary(['studio_id', 'year']);
  });

  await knex.schema.createTable('invoices', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('commission_id').notNullable().references('commissions.id').onDelete('CASCADE');
    t.integer('client_id').notNullable().references('clients.id');
    t.integer('quote_id').references('quotes.id').onDelete('SET NULL');
    t.integer('credit_for').references('invoices.id').onDelete('SET NULL');
    t.string('kind', 16).notNullable(); // deposit | progress | balance | custom | credit_note
    t.string('status', 16).notNullable(); // draft | open | partly_paid | paid | void | refunded
    t.string('number', 20); // null while a draft
    t.string('currency', 3).notNullable();
    t.text('lines_json').notNullable();
    t.boolean('tax_inclusive').notNullable();
    t.string('tax_label', 30).notNullable();
    t.string('tax_id', 60).notNullable().defaultTo('');
    t.bigInteger('subtotal').notNullable();
    t.bigInteger('tax').notNullable();
    t.bigInteger('total').notNullable();
    t.bigInteger('paid').notNullable().defaultTo(0); // received, net of refunds
    t.bigInteger('refunded').notNullable().defaultTo(0);
    t.bigInteger('credited').notNullable().defaultTo(0); // credit notes set against it
    t.string('note', 500);
    t.string('issued_at', 30);
    t.string('due_date', 10);
    t.string('voided_at', 30);
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.string('created_at', 30).notNullable();
    t.string('updated_at', 30).notNullable();
    t.unique(['studio_id', 'number']);
    t.index(['studio_id', 'commission_id']);
    t.index(['studio_id', 'client_id']);
    t.index(['status', 'due_date']);
  });

  await knex.schema.createTable('invoice_payments', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('invoice_id').notNullable().references('invoices.id').onDelete('CASCADE');
    t.string('method', 8).notNullable(); // card | bank | cash | other
    t.bigInteger('amount').notNullable();
    t.bigInteger('refunded').notNullable().defaultTo(0);
    t.string('received_at', 30).notNullable();
    t.string('reference', 200);
    t.integer('checkout_id');
    t.string('payment_intent_id', 255);
    t.integer('recorded_by').references('users.id').onDelete('SET NULL');
    t.string('created_at', 30).notNullable();
    t.index(['studio_id', 'invoice_id']);
    t.index(['studio_id', 'received_at']);
  });

  await knex.schema.createTable('invoice_refunds', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('invoice_id').notNullable().references('invoices.id').onDelete('CASCADE');
    t.integer('payment_id').notNullable().references('invoice_payments.id').onDelete('CASCADE');
    t.integer('credit_note_id').references('invoices.id').onDelete('SET NULL');
    t.bigInteger('amount').notNullable();
    t.string('provider_refund_id', 255);
    t.string('reason', 500);
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.string('created_at', 30).notNullable();
    t.index(['studio_id', 'invoice_id']);
  });

  // Checkouts the app created: the event must match the session id, amount and currency stored here.
  await knex.schema.createTable('checkouts', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('invoice_id').notNullable().references('invoices.id').onDelete('CASCADE');
    t.string('session_id', 255).notNullable().unique();
    t.string('url', 2000).notNullable();
    t.bigInteger('amount').notNullable(); // what the service will charge, in our minor units
    t.string('currency', 3).notNullable();
    t.string('status', 12).notNullable(); // open | paid | flagged
    t.string('flag_reason', 500);
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.string('created_at', 30).notNullable();
    t.string('completed_at', 30);
    t.index(['studio_id', 'invoice_id']);
  });

  // Every verified payment event, stored by its id: a repeated delivery finds its id here and changes nothing.
  await knex.schema.createTable('payment_events', (t) => {
    t.string('id', 255).primary();
    t.string('type', 100).notNullable();
    t.integer('studio_id').references('studios.id').onDelete('SET NULL');
    t.integer('invoice_id').references('invoices.id').onDelete('SET NULL');
    t.string('session_id', 255);
    t.string('outcome', 12).notNullable(); // paid | flagged | ignored
    t.string('reason', 500);
    t.text('payload').notNullable();
    t.string('received_at', 30).notNullable();
    t.index(['studio_id', 'invoice_id']);
  });

  // One row per reminder sent, so the job sends each reminder once however often it runs.
  await knex.schema.createTable('invoice_reminders', (t) => {
    t.integer('invoice_id').notNullable().references('invoices.id').onDelete('CASCADE');
    t.integer('number').notNullable();
    t.string('sent_at', 30).notNullable();
    t.primary(['invoice_id', 'number']);
  });
}

export async function down(knex: Knex) {
  for (const table of ['invoice_reminders', 'payment_events', 'checkouts', 'invoice_refunds', 'invoice_payments', 'invoices', 'invoice_counters', 'quotes', 'price_tables']) {
    await knex.schema.dropTableIfExists(table);
  }
}
