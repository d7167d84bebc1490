import Database from 'better-sqlite3';
import bcrypt from 'bcryptjs';
import path from 'node:path';

/**
 * Fills an already-migrated DATA_DIR with a large invented data set, fast (one transaction,
 * prepared statements): studios × (owner, painter, clients) × commissions × figures × stages.
 * Studio 1's owner is bench-owner-1@bench.test, its first client bench-client-1-1@bench.test (password "bench password").
 */
export function generate(dataDir: string, size = { studios: 50, commissions: 10_000, figuresPerCommission: 10, stagesPerFigure: 10, clientsPerStudio: 20 }) {
  const db = new Database(path.join(dataDir, 'sablework.sqlite'));
  db.pragma('journal_mode = WAL');
  db.pragma('synchronous = OFF');
  const now = new Date('2026-11-02T09:00:00Z').toISOString();
  const hash = bcrypt.hashSync('bench password', 4);
  const stageKeys = ['prep', 'assembly', 'prime', 'basecoat', 'shade', 'layer', 'glaze', 'details', 'basing', 'varnish'];
  const statuses = ['enquiry', 'quoted', 'booked', 'on_bench', 'on_bench', 'booked', 'ready_to_ship', 'shipped', 'closed', 'on_bench'];
  const insUser = db.prepare('insert into users (email, name, password_hash, email_notices, created_at, updated_at) values (?, ?, ?, 1, ?, ?)');
  const insStudio = db.prepare("insert into studios (name, slug, currency, timezone, created_at) values (?, ?, 'EUR', 'Europe/Berlin', ?)");
  const insMember = db.prepare('insert into memberships (studio_id, user_id, role, created_at) values (?, ?, ?, ?)');
  const insClient = db.prepare('insert into clients (studio_id, user_id, name, email, created_at, updated_at) values (?, ?, ?, ?, ?, ?)');
  const insCommission = db.prepare(
    "insert into commissions (studio_id, client_id, title, brief, due_date, priority, status, queue_position, created_at, updated_at) values (?, ?, ?, 'Generated for the benchmark.', ?, 'normal', ?, ?, ?, ?)",
  );
  const insFigure = db.prepare(
    "insert into figures (studio_id, commission_id, name, quantity, size_class, tier, extras, sub_assemblies, painter_id, position, created_at, updated_at) values (?, ?, ?, ?, '28', 'tabletop', '[]', '[]', ?, ?, ?, ?)",
  );
  const insStage = db.prepare(
    "insert into stages (studio_id, commission_id, figure_id, template_key, name, position, status, estimate_minutes, wait_minutes, hazards, updated_at) values (?, ?, ?, ?, ?, ?, ?, 30, 0, '[]', ?)",
  );
  const perStudio = Math.floor(size.commissions / size.studios);
  db.transaction(() => {
    for (let s = 1; s <= size.studios; s++) {
      const studioId = Number(insStudio.run(`Bench Studio ${s}`, `bench-${s}`, now).lastInsertRowid);
      const owner = Number(insUser.run(`bench-owner-${s}@bench.test`, `Owner ${s}`, hash, now, now).lastInsertRowid);
      const painter = Number(insUser.run(`bench-painter-${s}@bench.test`, `Painter ${s}`, hash, now, now).lastInsertRowid);
      insMember.run(studioId, owner, 'owner', now);
      insMember.run(studioId, painter, 'painter', now);
      const clients: number[] = [];
      for (let c = 1; c <= size.clientsPerStudio; c++) {
        const email = `bench-client-${s}-${c}@bench.test`;
        const u = Number(insUser.run(email, `Client ${s}-${c}`, hash, now, now).lastInsertRowid);
        insMember.run(studioId, u, 'client', now);
        clients.push(Number(insClient.run(studioId, u, `Client ${s}-${c}`, email, now, now).lastInsertRowid));
      }
      for (let k = 0; k < perStudio; k++) {
        const status = statuses[k % statuses.length];
        const due = `2027-${String((k % 12) + 1).padStart(2, '0')}-15`;
        const cid = Number(insCommission.run(studioId, clients[k % clients.length], `Commission ${s}-${k}`, due, status, k, now, now).lastInsertRowid);
        for (let f = 0; f < size.figuresPerCommission; f++) {
          const fid = Number(insFigure.run(studioId, cid, `Figure ${f + 1}`, 1 + (f % 5), painter, f, now, now).lastInsertRowid);
          const doneUpTo = (k + f) % (size.stagesPerFigure + 1);
          for (let g = 0; g < size.stagesPerFigure; g++) {
            insStage.run(studioId, cid, fid, stageKeys[g % stageKeys.length], stageKeys[g % stageKeys.length], g, g < doneUpTo ? 'done' : 'todo', now);
          }
        }
      }
    }
  })();
  db.close();
}
