import Database from 'better-sqlite3';
import bcrypt from 'bcryptjs';
import knexFactory from 'knex';
import path from 'node:path';
import { backfillCommissionTotals } from '../../../migrations/20270120120000-commission-totals';
import { backfillFigureTotalsSql } from '../../../migrations/20270202120000-figure-totals';
import { quoteFigures } from '../../../shared/pricing';
import { defaultPriceTable } from '../../../shared/schemas/price-table';

export type BenchSize = { studios: number; commissions: number; figuresPerCommission: number; stagesPerFigure: number; clientsPerStudio: number };
export const benchSize: BenchSize = { studios: 50, commissions: 10_000, figuresPerCommission: 10, stagesPerFigure: 10, clientsPerStudio: 20 };

/**
 * The commission totals' triggers (migrations/20270120120000-commission-totals.ts) update the commission
 * once per figure and per stage inserted: 1,100,000 updates, about two thirds more time to generate. They
 * are set aside while the tables fill (inside the same transaction) and the totals summed once at the end
 * by the migration's own backfill, which is exact. Returns what puts them back.
 */
function totalsSetAside(db: Database.Database) {
  // The schedule version's triggers (migrations/20270121120000-schedule-version.ts) would bump the studio
  // row once per row inserted; a freshly generated studio needs no version but its first. The figure
  // totals' triggers (migrations/20270202120000-figure-totals.ts) would recompute a figure from its stages
  // once per stage inserted; their backfill, the same SQL the triggers run, sets every figure at the end.
  // The books version's (migrations/20270205120000-books-version.ts) would bump it per invoice, payment and
  // accepted quote, the lists version's (migrations/20270207120000-lists-version.ts, 20270208120000) per paint,
  // recipe, step, invoice, quote and enquiry, and the thread version's (migrations/20270209120000-thread-version.ts)
  // the commission per comment, activity row and time entry.
  const triggers = db
    .prepare(
      "select name, sql from sqlite_master where type = 'trigger' and (name glob 'commission_totals_*' or name glob 'schedule_version_*' or name glob 'figure_totals_*' or name glob 'books_version_*' or name glob 'lists_version_*' or name glob 'thread_version_*')",
    )
    .all() as { name: string; sql: string }[];
  for (const t of triggers) db.exec(`drop trigger ${t.name}`);
  return () => {
    const knex = knexFactory({ client: 'better-sqlite3', useNullAsDefault: true }); // only builds the SQL
    db.exec(backfillCommissionTotals(knex).toString());
    db.exec(backfillFigureTotalsSql);
    for (const t of triggers) db.exec(t.sql);
  };
}

/**
 * Fills an already-migrated DATA_DIR with a large invented data set, fast (one transaction, prepared
 * statements, no fsync): studios × (owner, painters, clients) × commissions × figures × stages, and beside
 * them what every list endpoint reads: quotes, invoices and payments, comments, photo rows (no files),
 * approvals, activity, time, a paint rack, recipes, enquiries, pending invitations and working hours.
 * Studio 1's owner is bench-owner-1@bench.test, its first client bench-client-1-1@bench.test (password "bench password").
 */
export function generate(dataDir: string, size: BenchSize = benchSize) {
  const db = new Database(path.join(dataDir, 'sablework.sqlite'));
  // A throwaway file: no journal while it fills (the server turns WAL back on when it opens it).
  db.pragma('journal_mode = OFF');
  db.pragma('synchronous = OFF');
  db.pragma('locking_mode = EXCLUSIVE');
  db.pragma('temp_store = MEMORY');
  db.pragma('cache_size = -400000');
  const now = new Date('2026-11-02T09:00:00Z').toISOString();
  const at = (days: number) => new Date(Date.parse(now) - days * 86_400_000).toISOString();
  const hash = bcrypt.hashSync('bench password', 4);
  const stageKeys = ['prep', 'assembly', 'prime', 'basecoat', 'shade', 'layer', 'glaze', 'details', 'basing', 'varnish'];
  const statuses = ['enquiry', 'quoted', 'booked', 'on_bench', 'on_bench', 'booked', 'ready_to_ship', 'shipped', 'closed', 'on_bench'];
  // One priced quote for the shape every generated commission has (figures of 1 to 5 models, 28 mm tabletop).
  const table = defaultPriceTable('EUR');
  const figures = Array.from({ length: size.figuresPerCommission }, (_, f) => ({ name: `Figure ${f + 1}`, quantity: 1 + (f % 5), sizeClass: '28' as const, tier: 'tabletop', extras: [] }));
  const result = quoteFigures({ priceTable: table, figures, today: '2026-10-01', dueDate: null });
  const quoteJson = { input: JSON.stringify({ figures, extraLines: [], dueDate: null }), table: JSON.stringify(table), result: JSON.stringify(result) };
  const linesJson = JSON.stringify([{ description: 'Deposit', quantity: 1, unitMinor: result.deposit.amount, amountMinor: result.deposit.amount, taxBp: 0 }]);

  const ins = (sql: string) => db.prepare(sql);
  const insUser = ins('insert into users (email, name, password_hash, email_notices, created_at, updated_at) values (?, ?, ?, 1, ?, ?)');
  const insStudio = ins("insert into studios (name, slug, currency, timezone, created_at) values (?, ?, 'EUR', 'Europe/Berlin', ?)");
  const insMember = ins('insert into memberships (studio_id, user_id, role, created_at) values (?, ?, ?, ?)');
  const insHours = ins("insert into capacity_hours (studio_id, user_id, weekday, start_time, end_time, updated_at) values (?, ?, ?, '09:00', '17:00', ?)");
  const insInvitation = ins("insert into invitations (studio_id, email, role, token_hash, invited_by, expires_at, created_at) values (?, ?, 'painter', ?, ?, '2099-01-01T00:00:00.000Z', ?)");
  const insClient = ins('insert into clients (studio_id, user_id, name, email, created_at, updated_at) values (?, ?, ?, ?, ?, ?)');
  const insCommission = ins(
    "insert into commissions (studio_id, client_id, title, brief, due_date, priority, status, queue_position, created_at, updated_at) values (?, ?, ?, 'Generated for the benchmark.', ?, ?, ?, ?, ?, ?)",
  );
  const insFigure = ins(
    "insert into figures (studio_id, commission_id, name, quantity, size_class, tier, extras, sub_assemblies, painter_id, position, created_at, updated_at) values (?, ?, ?, ?, '28', 'tabletop', '[]', '[]', ?, ?, ?, ?)",
  );
  const insStage = ins(
    "insert into stages (studio_id, commission_id, figure_id, template_key, name, position, status, estimate_minutes, wait_minutes, hazards, done_by, done_at, updated_at) values (?, ?, ?, ?, ?, ?, ?, 30, 0, '[]', ?, ?, ?)",
  );
  const insTime = ins("insert into time_entries (studio_id, commission_id, figure_id, stage_id, user_id, source, started_at, ended_at, minutes, created_at, updated_at) values (?, ?, ?, ?, ?, 'manual', ?, ?, 25, ?, ?)");
  const insQuote = ins(
    "insert into quotes (studio_id, commission_id, client_id, version, status, input_json, price_table_json, result_json, currency, total, deposit, balance, quote_date, valid_until, show_hours, terms, sent_at, decided_at, created_by, created_at, updated_at) values (?, ?, ?, 1, ?, ?, ?, ?, 'EUR', ?, ?, ?, '2026-10-01', '2099-12-31', 0, '', ?, ?, ?, ?, ?)",
  );
  const insInvoice = ins(
    "insert into invoices (studio_id, commission_id, client_id, quote_id, kind, status, number, currency, lines_json, tax_inclusive, tax_label, subtotal, tax, total, paid, issued_at, due_date, created_by, created_at, updated_at) values (?, ?, ?, ?, ?, ?, ?, 'EUR', ?, 1, 'VAT', ?, 0, ?, ?, ?, ?, ?, ?, ?)",
  );
  const insPayment = ins("insert into invoice_payments (studio_id, invoice_id, method, amount, received_at, recorded_by, created_at) values (?, ?, 'bank', ?, ?, ?, ?)");
  const insComment = ins('insert into comments (studio_id, commission_id, user_id, body, created_at) values (?, ?, ?, ?, ?)');
  const insPhoto = ins("insert into photos (studio_id, commission_id, kind, caption, shared, uploaded_by, width, height, bytes, storage_key, created_at) values (?, ?, 'progress', ?, ?, ?, 1600, 1200, 250000, ?, ?)");
  const insApproval = ins("insert into approvals (studio_id, commission_id, subject, status, requested_by, requested_at) values (?, ?, 'scheme', ?, ?, ?)");
  const insActivity = ins('insert into activity (studio_id, commission_id, user_id, action, detail, at) values (?, ?, ?, ?, ?, ?)');
  const insPaint = ins("insert into paints (studio_id, name, maker, type, finish, hex, stock, low_stock_threshold, match_key, created_at, updated_at) values (?, ?, 'Bench Colour Works', ?, 'matte', ?, ?, 2, ?, ?, ?)");
  const insRecipe = ins('insert into recipes (studio_id, name, description, created_by, created_at, updated_at) values (?, ?, ?, ?, ?, ?)');
  const insStep = ins('insert into recipe_steps (studio_id, recipe_id, position, technique) values (?, ?, ?, ?)');
  const insStepPaint = ins('insert into recipe_step_paints (studio_id, step_id, paint_id, position, parts) values (?, ?, ?, 0, 1)');
  const insEnquiry = ins("insert into enquiries (studio_id, status, name, email, extras, currency, notes, consent_at, created_at) values (?, 'new', ?, ?, '[]', 'EUR', 'Generated for the benchmark.', ?, ?)");
  const insEnquiryFigure = ins("insert into enquiry_figures (studio_id, enquiry_id, position, name, quantity, size_class) values (?, ?, 1, 'Wished figure', 3, '28')");
  const id = (r: Database.RunResult) => Number(r.lastInsertRowid);
  const paintTypes = ['base', 'layer', 'wash', 'glaze', 'metallic', 'ink'];
  const techniques = ['basecoat', 'layer', 'glaze'];

  const perStudio = Math.floor(size.commissions / size.studios);
  db.transaction(() => {
    const restoreTotals = totalsSetAside(db);
    for (let s = 1; s <= size.studios; s++) {
      const studioId = id(insStudio.run(`Bench Studio ${s}`, `bench-${s}`, now));
      const owner = id(insUser.run(`bench-owner-${s}@bench.test`, `Owner ${s}`, hash, now, now));
      insMember.run(studioId, owner, 'owner', now);
      const painters: number[] = [];
      for (let p = 1; p <= 5; p++) {
        const u = id(insUser.run(`bench-painter-${s}-${p}@bench.test`, `Painter ${s}-${p}`, hash, now, now));
        insMember.run(studioId, u, 'painter', now);
        painters.push(u);
      }
      for (const u of [owner, ...painters]) for (let d = 1; d <= 5; d++) insHours.run(studioId, u, d, now);
      for (let i = 1; i <= 10; i++) insInvitation.run(studioId, `bench-invited-${s}-${i}@bench.test`, `${String(s).padStart(4, '0')}${String(i).padStart(4, '0')}`.padEnd(64, 'b'), owner, now);
      const clients: number[] = [];
      for (let c = 1; c <= size.clientsPerStudio; c++) {
        const email = `bench-client-${s}-${c}@bench.test`;
        const u = id(insUser.run(email, `Client ${s}-${c}`, hash, now, now));
        insMember.run(studioId, u, 'client', now);
        clients.push(id(insClient.run(studioId, u, `Client ${s}-${c}`, email, now, now)));
      }
      const paints: number[] = [];
      for (let p = 0; p < 300; p++) {
        const name = `Bench paint ${String(p).padStart(3, '0')}`;
        const hex = `#${((p * 2654435761) >>> 8).toString(16).padStart(6, '0').slice(-6)}`;
        paints.push(id(insPaint.run(studioId, name, paintTypes[p % paintTypes.length], hex, p % 4, `${name.toLowerCase()}|bench colour works`, now, now)));
      }
      for (let r = 0; r < 100; r++) {
        const recipe = id(insRecipe.run(studioId, `Bench recipe ${String(r).padStart(3, '0')}`, 'Generated for the benchmark.', owner, now, now));
        for (let k = 0; k < 3; k++) insStepPaint.run(studioId, id(insStep.run(studioId, recipe, k, techniques[k])), paints[(r * 3 + k) % paints.length]);
      }
      for (let e = 0; e < 200; e++) insEnquiryFigure.run(studioId, id(insEnquiry.run(studioId, `Visitor ${s}-${e}`, `bench-visitor-${s}-${e}@bench.test`, at(e % 90), at(e % 90))));

      let invoiceNo = 0;
      for (let k = 0; k < perStudio; k++) {
        const status = statuses[k % statuses.length];
        const due = `2027-${String((k % 12) + 1).padStart(2, '0')}-15`;
        const created = at(perStudio - k);
        // Ten commissions in a row per client, so each client has one of every status.
        const clientId = clients[Math.floor(k / statuses.length) % clients.length];
        const cid = id(insCommission.run(studioId, clientId, `Commission ${s}-${k}`, due, k % 7 === 0 ? 'high' : 'normal', status, k, created, created));
        for (let f = 0; f < size.figuresPerCommission; f++) {
          const painter = painters[(k + f) % painters.length];
          const fid = id(insFigure.run(studioId, cid, `Figure ${f + 1}`, 1 + (f % 5), painter, f, created, created));
          const doneUpTo = (k + f) % (size.stagesPerFigure + 1);
          for (let g = 0; g < size.stagesPerFigure; g++) {
            const done = g < doneUpTo;
            const key = stageKeys[g % stageKeys.length];
            const stage = id(insStage.run(studioId, cid, fid, key, key, g, done ? 'done' : 'todo', done ? painter : null, done ? created : null, created));
            if (done && f < 2) insTime.run(studioId, cid, fid, stage, painter, created, created, created, created);
          }
        }
        if (status !== 'enquiry') {
          const accepted = status !== 'quoted';
          const quote = id(
            insQuote.run(studioId, cid, clientId, accepted ? 'accepted' : 'sent', quoteJson.input, quoteJson.table, quoteJson.result, result.total, result.deposit.amount, result.balance, created, accepted ? created : null, owner, created, created),
          );
          if (accepted) {
            const deposit = result.deposit.amount;
            const dep = id(insInvoice.run(studioId, cid, clientId, quote, 'deposit', 'paid', `B${s}-${++invoiceNo}`, linesJson, deposit, deposit, deposit, created, due, owner, created, created));
            insPayment.run(studioId, dep, deposit, created, owner, created);
            insApproval.run(studioId, cid, k % 2 ? 'approved' : 'requested', owner, created);
          }
          if (['ready_to_ship', 'shipped', 'closed'].includes(status)) {
            const balance = result.balance;
            const paid = status === 'ready_to_ship' ? 0 : balance;
            const bal = id(insInvoice.run(studioId, cid, clientId, quote, 'balance', paid ? 'paid' : 'open', `B${s}-${++invoiceNo}`, linesJson, balance, balance, paid, created, due, owner, created, created));
            if (paid) insPayment.run(studioId, bal, paid, created, owner, created);
          }
        }
        for (let c = 0; c < 3; c++) insComment.run(studioId, cid, c % 2 ? owner : null, `Generated comment ${c + 1}.`, created);
        for (let p = 0; p < 2; p++) insPhoto.run(studioId, cid, `Progress ${p + 1}`, p % 2, owner, `bench/${s}/${cid}-${p}`, created);
        for (let a = 0; a < 3; a++) insActivity.run(studioId, cid, owner, 'commission.updated', '{"changes":{}}', created);
      }
    }
    restoreTotals();
  })();
  db.pragma('journal_mode = WAL');
  db.close();
}
