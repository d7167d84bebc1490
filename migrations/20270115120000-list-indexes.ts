import type { Knex } from 'knex';

/**
 * Indexes for the list endpoints' filters and sorts (issue 8: every list within 50 ms at p99 on a
 * database of 1,000,000 stages). Each list reads one studio, so each index starts with studio_id; the
 * plans were checked with EXPLAIN QUERY PLAN on the benchmark's generated database (tests/bench/load.ts).
 * Only Knex's portable index calls, with names given, so SQLite and PostgreSQL get the same indexes.
 */
const indexes: { table: string; columns: string[]; name: string; why: string }[] = [
  // The commission list, newest first (owner, and the client portal's own commissions).
  { table: 'commissions', columns: ['studio_id', 'created_at', 'id'], name: 'commissions_studio_created', why: 'commission list order' },
  { table: 'commissions', columns: ['studio_id', 'client_id', 'created_at'], name: 'commissions_studio_client_created', why: "a client's commissions, newest first" },
  // Done/total and hours per commission of a page, summed from the index alone (no table reads).
  {
    table: 'stages',
    columns: ['studio_id', 'commission_id', 'status', 'estimate_minutes'],
    name: 'stages_studio_commission_totals',
    why: 'stage totals of a page of commissions',
  },
  // Figure count and model count per commission of a page, from the index alone.
  { table: 'figures', columns: ['studio_id', 'commission_id', 'quantity'], name: 'figures_studio_commission_quantity', why: 'figure totals of a page of commissions' },
  // Quotes and invoices lists, newest first; a client's own.
  { table: 'quotes', columns: ['studio_id', 'created_at', 'id'], name: 'quotes_studio_created', why: 'quote list order' },
  { table: 'quotes', columns: ['studio_id', 'client_id', 'created_at'], name: 'quotes_studio_client_created', why: "a client's quotes" },
  { table: 'invoices', columns: ['studio_id', 'created_at', 'id'], name: 'invoices_studio_created', why: 'invoice list order' },
  { table: 'invoices', columns: ['studio_id', 'status'], name: 'invoices_studio_status', why: 'unpaid invoices for the books and the dashboard' },
  // The enquiry list without a status filter, newest first.
  { table: 'enquiries', columns: ['studio_id', 'created_at'], name: 'enquiries_studio_created', why: 'enquiry list order' },
  // The client list shows when each client was last invited (a subquery per row of the page).
  { table: 'invitations', columns: ['client_id', 'created_at'], name: 'invitations_client_created', why: "a client's last invitation" },
  // A stage's time, oldest first; approvals of a commission in the order asked.
  { table: 'time_entries', columns: ['studio_id', 'stage_id', 'started_at'], name: 'time_entries_studio_stage_started', why: "a stage's time list" },
  { table: 'approvals', columns: ['studio_id', 'commission_id', 'requested_at'], name: 'approvals_studio_commission_requested', why: 'approval list order' },
];

export async function up(knex: Knex) {
  for (const i of indexes) {
    await knex.schema.alterTable(i.table, (t) => {
      t.index(i.columns, i.name);
    });
  }
}

export async function down(knex: Knex) {
  for (const i of [...indexes].reverse()) {
    await knex.schema.alterTable(i.table, (t) => {
      t.dropIndex(i.columns, i.name);
    });
  }
}
