import type { Knex } from 'knex';

/**
 * Indexes for the owner's list endpoints made cheaper in this step (issue 8, server CPU per answer on the
 * benchmark's database). Knex's portable index calls with names given, so SQLite and PostgreSQL get the same.
 */
const indexes: { table: string; columns: string[]; name: string; why: string }[] = [
  // The accountant's CSV reads issued invoices in pages by (issued_at, id) after the last row of the page
  // before: each page is a range of this index, with no sort of the studio's invoices per page.
  { table: 'invoices', columns: ['studio_id', 'issued_at', 'id'], name: 'invoices_studio_issued', why: 'invoice CSV pages in issue order' },
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
