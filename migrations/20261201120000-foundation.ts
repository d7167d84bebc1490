import type { Knex } from 'knex';

// Times are ISO 8601 UTC strings written by the app's clock: the same on SQLite and PostgreSQL,
// comparable as text, and moved by tests.
export async function up(knex: Knex) {
  await knex.schema.createTable('users', (t) => {
    t.increments('id');
    t.string('email', 254).notNullable().unique();
    t.string('name', 120).notNullable();
    t.string('password_hash', 100).notNullable();
    t.boolean('email_notices').notNullable().defaultTo(true);
    t.string('created_at', 30).notNullable();
    t.string('updated_at', 30).notNullable();
  });
  await knex.schema.createTable('studios', (t) => {
    t.increments('id');
    t.string('name', 80).notNullable();
    t.string('slug', 48).notNullable().unique();
    t.string('currency', 3).notNullable();
    t.string('timezone', 64).notNullable();
    t.text('about');
    t.string('created_at', 30).notNullable();
  });
  await knex.schema.createTable('memberships', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('user_id').notNullable().references('users.id').onDelete('CASCADE');
    t.string('role', 16).notNullable();
    t.string('created_at', 30).notNullable();
    t.unique(['studio_id', 'user_id']);
    t.index(['user_id']);
  });
  await knex.schema.createTable('clients', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.integer('user_id').references('users.id').onDelete('SET NULL');
    t.string('name', 120).notNullable();
    t.string('email', 254);
    t.string('phone', 40);
    t.string('address_line1', 200);
    t.string('address_line2', 200);
    t.string('address_city', 100);
    t.string('address_region', 100);
    t.string('address_postal_code', 20);
    t.string('address_country', 2);
    t.text('notes');
    t.string('created_at', 30).notNullable();
    t.string('updated_at', 30).notNullable();
    t.unique(['studio_id', 'email']);
    t.unique(['studio_id', 'user_id']);
    t.index(['studio_id', 'name']);
  });
  await knex.schema.createTable('invitations', (t) => {
    t.increments('id');
    t.integer('studio_id').notNullable().references('studios.id').onDelete('CASCADE');
    t.string('email', 254).notNullable();
    t.string('role', 16).notNullable();
    t.integer('client_id').references('clients.id').onDelete('CASCADE');
    t.string('token_hash', 64).notNullable().unique();
    t.integer('invited_by').references('users.id').onDelete('SET NULL');
    t.string('expires_at', 30).notNullable();
    t.string('accepted_at', 30);
    t.string('revoked_at', 30);
    t.string('created_at', 30).notNullable();
    t.index(['studio_id', 'accepted_at']);
  });
  await knex.schema.createTable('password_resets', (t) => {
    t.increments('id');
    t.integer('user_id').notNullable().references('users.id').onDelete('CASCADE');
    t.string('token_hash', 64).notNullable().unique();
    t.string('expires_at', 30).notNullable();
    t.string('used_at', 30);
    t.string('created_at', 30).notNullable();
  });
  await knex.schema.createTable('login_failures', (t) => {
    t.increments('id');
    t.string('key', 400).notNullable();
    t.string('at', 30).notNullable();
    t.index(['key', 'at']);
  });
  await knex.schema.createTable('sessions', (t) => {
    t.string('sid', 255).primary();
    t.json('sess').notNullable();
    t.timestamp('expired', { useTz: true }).notNullable().index();
  });
  await knex.schema.createTable('outbox', (t) => {
    t.increments('id');
    t.integer('studio_id').references('studios.id').onDelete('SET NULL');
    t.string('to', 254).notNullable();
    t.string('subject', 300).notNullable();
    t.text('text').notNullable();
    t.text('html').notNullable();
    t.string('template', 60).notNullable();
    t.string('status', 12).notNullable().defaultTo('pending');
    t.integer('attempts').notNullable().defaultTo(0);
    t.string('next_attempt_at', 30).notNullable();
    t.text('last_error');
    t.string('sent_at', 30);
    t.string('created_at', 30).notNullable();
    t.index(['status', 'next_attempt_at']);
  });
  await knex.schema.createTable('captured_mail', (t) => {
    t.increments('id');
    t.string('message_id', 300);
    t.string('from', 300);
    t.string('to', 1000);
    t.string('subject', 300);
    t.text('text');
    t.text('html');
    t.text('headers');
    t.string('received_at', 30).notNullable();
  });
  await knex.schema.createTable('captured_mail_attachments', (t) => {
    t.increments('id');
    t.integer('mail_id').notNullable().references('captured_mail.id').onDelete('CASCADE');
    t.string('filename', 300);
    t.string('content_type', 120);
    t.integer('size').notNullable();
    t.binary('content');
  });
}

export async function down(knex: Knex) {
  for (const table of [
    'captured_mail_attachments',
    'captured_mail',
    'outbox',
    'sessions',
    'login_failures',
    'password_resets',
    'invitations',
    'clients',
    'memberships',
    'studios',
    'users',
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
}
