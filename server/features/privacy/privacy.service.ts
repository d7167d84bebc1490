import type { Writable } from 'node:stream';
import { ZipArchive } from 'archiver';
import type { Logger } from 'pino';
import { commissionStatusLabels, isCommissionStatus } from '../../../shared/commission-lifecycle';
import { formatMoney } from '../../../shared/money';
import { sameName, type ClientPrivacy, type EraseBlocker, type EraseClientInput, type EraseResult } from '../../../shared/schemas/privacy';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import { extensions, type PhotoFormat } from '../../lib/images/photos';
import type { FileStorage } from '../../lib/storage/storage';
import type { ClientRow, PrivacyRepository, Scope } from './privacy.repository';
import { clientTables, type ClientTable } from './privacy.tables';
import { scrubber, scrubJson, scrubNullable, type Scrub } from './scrub';

/** Text in activity details that may say anything about the client: cleared on a kept commission. */
const FREE_TEXT = new Set(['title', 'brief', 'reason', 'note', 'comment', 'caption', 'message', 'schemeNotes', 'text', 'body']);
/** Columns that hold JSON text; the export shows them parsed. */
const JSON_COLUMNS = new Set(['detail', 'extras', 'sub_assemblies', 'hazards', 'checklist', 'colours', 'packing_items']);
/** Tables the erase deletes outright, in this order (after the enquiries and photos). */
const DELETED_WITH_COMMISSION: ClientTable[] = ['comments', 'approvals', 'schemes', 'models_in_figures', 'models_in', 'shipments', 'quotes'];
const SIZES = ['original', 'large', 'medium', 'thumb'] as const;

export const placeholderName = (clientId: number) => `Erased client ${clientId}`;

const camel = (s: string) => s.replace(/_([a-z0-9])/g, (_, c: string) => c.toUpperCase());
function forExport(row: Record<string, unknown>) {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(row)) {
    let value = v;
    if (typeof v === 'string' && (k.endsWith('_json') || JSON_COLUMNS.has(k))) {
      try {
        value = JSON.parse(v);
      } catch {
        value = v;
      }
    }
    out[camel(k)] = value;
  }
  return out;
}

const fileKey = (storageKey: string, size: (typeof SIZES)[number], format: string) => `${storageKey}/${size}.${size === 'original' ? extensions[format as PhotoFormat] : 'webp'}`;

const README = (studio: string, client: string, at: string) => `All data ${studio} keeps about ${client} in Sablework
Exported ${at} (UTC).

data.json
  Every record about this client, one list per kind of record, in JSON (a plain text format most
  tools can open). "client" is the client record, "account" their sign-in account (without the
  password). The lists hold their commissions with figures, stages and logged hours, comments,
  approvals, scheme entries and the recipes and paints they use, quotes, invoices and credit notes
  with payments and refunds, shipments, models received, enquiries sent from their e-mail
  addresses, invitations, the e-mails the studio sent them (subject and date), and the activity
  log of their commissions.
  Records point at each other by id: a figure's "commissionId" is the "id" of its commission.
  Amounts are whole minor units of the currency (cents for EUR): 12345 means 123.45.
  "people" names the studio members the records mention.

photos/
  The full-size original of every photo of their commissions and of every photo sent with an
  enquiry. Each photo's record in data.json names its file under "file".

Left out on purpose: passwords and sign-in secrets, the studio's price table and internal
notes about paints, and the raw messages of the payment service.
`;

export type PrivacyHooks = {
  /** Called after each step of the erase, inside its transaction: tests throw here to prove a failed erase changes nothing. */
  afterStep?: (step: string) => void | Promise<void>;
};

export function privacyService(deps: { db: Db; repo: PrivacyRepository; storage: FileStorage; clock: Clock; log?: Logger; hooks?: PrivacyHooks }) {
  const { db, repo, storage, clock, log, hooks } = deps;
  const now = () => iso(clock.now());

  async function clientOr404(studioId: number, clientId: number, trx: Db = db): Promise<ClientRow> {
    const c = await repo.client(studioId, clientId, trx);
    if (!c) throw errors.notFound('That client');
    return c;
  }

  /** What stands in the way of an erase, in the owner's words. */
  async function blockers(trx: Db, s: Scope): Promise<EraseBlocker[]> {
    const out: EraseBlocker[] = [];
    for (const i of await repo.unpaidInvoices(trx, s)) {
      const credit = i.kind === 'credit_note';
      const open = Number(i.total) - Number(i.paid) - Number(i.credited);
      out.push({
        kind: 'invoice',
        id: i.id,
        label: `${credit ? 'Credit note' : 'Invoice'} ${i.number}`,
        reason: credit
          ? `${formatMoney(Math.abs(open), i.currency)} is still to be paid back. Pay it out first.`
          : `${formatMoney(open, i.currency)} is still to pay. Record the payment, or void or credit the invoice first.`,
        overridable: false,
      });
    }
    for (const c of await repo.openCommissions(trx, s)) {
      const status = isCommissionStatus(c.status) ? commissionStatusLabels[c.status] : c.status;
      const invoiced = Number(c.issued) > 0;
      out.push({
        kind: 'commission',
        id: c.id,
        label: `“${c.title}”`,
        reason: invoiced
          ? `${status}, with invoices. Finish it (closed or delivered) or cancel it first.`
          : `${status}, no invoices yet. Erasing would delete it with everything else.`,
        overridable: !invoiced,
      });
    }
    return out;
  }

  return {
    async summary(studioId: number, clientId: number): Promise<ClientPrivacy> {
      return db.transaction(async (trx) => {
        const c = await clientOr404(studioId, clientId, trx);
        const s = await repo.scope(trx, c);
        return { clientId, name: c.name, erasedAt: c.erased_at, blockers: c.erased_at ? [] : await blockers(trx, s), counts: await repo.counts(trx, s) };
      });
    },

    /**
     * The client's data as a ZIP: data.json, README.txt and photos/. The records are read in one
     * transaction (a consistent picture); the files stream afterwards, one open at a time.
     */
    async exportArchive(studioId: number, clientId: number) {
      const at = now();
      const snapshot = await db.transaction(async (trx) => {
        const c = await clientOr404(studioId, clientId, trx);
        const s = await repo.scope(trx, c);
        const rows = await repo.exportRows(trx, s);
        return { c, rows, studio: await repo.studio(studioId, trx), people: await repo.people(trx, studioId, Object.values(rows)), files: await repo.files(trx, s) };
      });
      const { c, rows, studio, files } = snapshot;

      // One file per stored photo; an enquiry photo that became a commission photo shares its file.
      const entries: { key: string; path: string }[] = [];
      const pathOfKey = new Map<string, string>();
      const add = (storageKey: string, format: string, path: string) => {
        if (!pathOfKey.has(storageKey)) {
          pathOfKey.set(storageKey, path);
          entries.push({ key: fileKey(storageKey, 'original', format), path });
        }
        return pathOfKey.get(storageKey)!;
      };
      const ext = (format: string) => extensions[format as PhotoFormat] ?? 'bin';
      const photoFile = new Map(files.photos.map((p) => [p.id, add(p.storage_key, p.format, `photos/commission-${p.commission_id}/photo-${p.id}.${ext(p.format)}`)]));
      const enquiryFile = new Map(files.enquiryPhotos.map((p) => [p.id, add(p.storage_key, p.format, `photos/enquiry-${p.enquiry_id}/photo-${p.id}.${ext(p.format)}`)]));

      const lists: Record<string, unknown[]> = {};
      for (const table of Object.keys(clientTables) as ClientTable[]) {
        const list = rows[table];
        if (!list || table === 'clients' || table === 'users') continue;
        lists[camel(table)] = list.map((r) => {
          const out = forExport(r);
          if (table === 'photos') out.file = photoFile.get(r.id as number) ?? null;
          if (table === 'enquiry_photos') out.file = enquiryFile.get(r.id as number) ?? null;
          return out;
        });
      }
      const safeName = c.name.replace(/[^A-Za-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 40).toLowerCase() || 'client';

      return {
        filename: `${safeName}-${c.id}-data-${at.slice(0, 10)}.zip`,
        /** Streams the ZIP into `out`; rejects (after destroying `out`) when a file cannot be read. */
        async pipeTo(out: Writable) {
          const zip = new ZipArchive({ zlib: { level: 6 } });
          const failed = new Promise<never>((_, reject) => zip.on('error', reject));
          failed.catch(() => undefined);
          zip.pipe(out);
          const missing: string[] = [];
          const written: string[] = [];
          try {
            for (const e of entries) {
              const file = await storage.read(e.key);
              if (!file) {
                missing.push(e.path);
                continue;
              }
              // One file at a time: wait until the archive has taken this one before opening the next.
              const taken = new Promise<void>((resolve) => zip.once('entry', () => resolve()));
              zip.append(file.stream, { name: e.path });
              await Promise.race([taken, failed]);
              written.push(e.path);
            }
            const data = {
              about: `Everything ${studio.name} keeps about this client in Sablework. README.txt explains the files.`,
              format: 'sablework-client-export/1',
              exportedAt: at,
              studio: { id: studio.id, name: studio.name },
              client: rows.clients?.[0] ? forExport(rows.clients[0]) : null,
              account: rows.users?.[0] ? forExport(rows.users[0]) : null,
              people: snapshot.people,
              files: written,
              missingFiles: missing,
              ...lists,
            };
            zip.append(JSON.stringify(data, null, 2), { name: 'data.json' });
            zip.append(README(studio.name, c.name, at.replace('T', ' ').slice(0, 16)), { name: 'README.txt' });
            await Promise.race([zip.finalize(), failed]);
          } catch (err) {
            zip.abort();
            out.destroy(err as Error);
            throw err;
          }
          log?.info({ studioId, clientId, files: written.length, missing: missing.length }, 'client data exported');
        },
      };
    },

    /**
     * Erases the client's personal data in one transaction, keeping only what issued invoices need,
     * anonymised (see privacy.tables.ts for the what and why). Photo files go after the commit, so a
     * failed erase leaves every file in place; a second erase of the same client changes nothing.
     */
    async erase(actor: { studioId: number; userId: number }, clientId: number, input: EraseClientInput): Promise<EraseResult> {
      const first = await clientOr404(actor.studioId, clientId);
      const placeholder = placeholderName(clientId);
      const unchanged = (c: ClientRow): EraseResult => ({ clientId, placeholder, erasedAt: c.erased_at!, alreadyErased: true, account: 'none', deleted: {}, kept: { commissions: 0, invoices: 0 }, photoFiles: 0 });
      if (first.erased_at) return unchanged(first);
      if (!sameName(input.confirmName, first.name)) {
        throw errors.field('confirmName', `Type the client's name exactly as it is shown (${first.name}) to confirm.`);
      }

      const at = now();
      const deleted: Record<string, number> = {};
      let fileKeys: string[] = [];
      const outcome = await db.transaction(async (trx) => {
        const c = await clientOr404(actor.studioId, clientId, trx);
        if (c.erased_at) return { already: c as ClientRow };
        const s = await repo.scope(trx, c);
        const blocking = await blockers(trx, s);
        const hard = blocking.filter((b) => !b.overridable);
        if (hard.length || (blocking.length && !input.deleteOpenCommissions)) {
          const first = hard[0] ?? blocking[0];
          const more = blocking.length > 1 ? ` (and ${blocking.length - 1} more)` : '';
          const message = hard.length
            ? `This client still has open work: ${first.label}: ${first.reason}${more}`
            : `This client has open commissions: ${first.label}: ${first.reason}${more} Tick "Also delete open commissions" to go ahead.`;
          throw errors.conflict(message, 'open_work', { blockers: blocking });
        }

        const step = async (name: string, fn: () => Promise<unknown>) => {
          const n = await fn();
          if (typeof n === 'number') deleted[name] = n;
          await hooks?.afterStep?.(name);
        };
        const scrub: Scrub = scrubber([...s.names, ...s.emails], placeholder);
        const files = await repo.files(trx, s);
        fileKeys = [...new Set([...files.photos, ...files.enquiryPhotos].flatMap((p) => SIZES.map((size) => fileKey(p.storage_key, size, p.format))))];
        const kept = await repo.keptCommissionIds(trx, s);
        const role = s.userId ? await repo.membershipRole(trx, s) : null;
        // The account goes when it is only this studio's client; a member in another role keeps theirs.
        const accountGoes = s.userId !== null && (role === 'client' || role === null) && (await repo.membershipsElsewhere(trx, s)) === 0;

        await step('recipes', () => scrubRows(trx, s, 'recipes', ['name', 'description'], scrub));
        await step('draft invoices', () => repo.deleteDraftInvoices(trx, s));
        await step('enquiries', () => repo.deleteRows(trx, s, 'enquiries'));
        await step('photos', () => repo.deleteRows(trx, s, 'photos'));
        for (const table of DELETED_WITH_COMMISSION) await step(table, () => repo.deleteRows(trx, s, table));
        await step('commissions', () => repo.deleteCommissionsExcept(trx, s, kept));
        await step('kept commissions', async () => {
          await repo.clearKeptCommissions(trx, s, at);
          await scrubRows(trx, s, 'commissions', ['title'], scrub);
          await scrubRows(trx, s, 'figures', ['name', 'footprint', 'light_source'], scrub);
          await repo.clearTimeNotes(trx, s);
          if (s.userId) await repo.unlinkActivityAuthor(trx, s, s.userId);
          for (const r of await repo.rowsOf(trx, s, 'activity', ['id', 'detail'])) {
            const detail = scrubJson(r.detail as string, scrub, FREE_TEXT);
            if (detail !== r.detail) await repo.updateRow(trx, 'activity', r.id as number, { detail });
          }
        });
        await step('kept invoices', async () => {
          for (const r of await repo.rowsOf(trx, s, 'invoices', ['id', 'note', 'lines_json'])) {
            const patch = { note: scrubNullable(scrub, r.note as string | null), lines_json: scrubJson(r.lines_json as string, scrub) };
            if (patch.note !== r.note || patch.lines_json !== r.lines_json) await repo.updateRow(trx, 'invoices', r.id as number, patch);
          }
          await scrubRows(trx, s, 'invoice_payments', ['reference'], scrub);
          await scrubRows(trx, s, 'invoice_refunds', ['reason'], scrub);
          for (const r of await repo.rowsOf(trx, s, 'payment_events', ['id', 'payload'])) {
            const payload = scrubJson(r.payload as string, scrub);
            if (payload !== r.payload) await repo.updatePaymentEvent(trx, r.id as string, payload!);
          }
        });
        await step('invitations', () => repo.deleteRows(trx, s, 'invitations'));
        await step('outbox', async () => {
          const n = await repo.deleteMailsTo(trx, s, accountGoes || !s.userId);
          for (const r of await repo.mailsMentioning(trx, s, [...s.names, ...s.emails])) {
            const patch = { subject: scrub(r.subject as string), text: scrub(r.text as string), html: scrub(r.html as string) };
            if (patch.subject !== r.subject || patch.text !== r.text || patch.html !== r.html) await repo.updateRow(trx, 'outbox', r.id as number, patch);
          }
          return n;
        });
        await step('calendar_feeds', () => repo.deleteRows(trx, s, 'calendar_feeds'));
        let account: EraseResult['account'] = 'none';
        await step('account', async () => {
          if (!s.userId) return repo.deleteRows(trx, s, 'login_failures');
          if (role === 'client') await repo.deleteRows(trx, s, 'memberships');
          if (!accountGoes) {
            account = 'kept';
            return 0;
          }
          await repo.deleteRows(trx, s, 'login_failures');
          await repo.endSessions(trx, s.userId);
          if ((await repo.timeEntriesOfUser(trx, s.userId)) > 0) {
            account = 'anonymised';
            await repo.anonymiseUser(trx, s.userId, at);
            return 0;
          }
          account = 'deleted';
          return repo.deleteUser(trx, s.userId);
        });
        await step('client', async () => {
          await repo.anonymiseClient(trx, s, placeholder, at);
          await repo.logErased(trx, s, actor.userId, at);
        });
        const invoices = Number((await repo.rowsOf(trx, s, 'invoices', ['id'])).length);
        return { account, kept: { commissions: kept.length, invoices } };
      });
      if ('already' in outcome && outcome.already) return unchanged(outcome.already);

      // After the commit: a file that fails to go stays as an orphan on disk, never a record without its file.
      let photoFiles = 0;
      for (const key of fileKeys) {
        try {
          await storage.delete(key);
          photoFiles++;
        } catch (err) {
          log?.warn({ err, key }, 'an erased photo file could not be removed');
        }
      }
      return { clientId, placeholder, erasedAt: at, alreadyErased: false, account: outcome.account, deleted, kept: outcome.kept, photoFiles };
    },
  };

  async function scrubRows(trx: Db, s: Scope, table: ClientTable, columns: string[], scrub: Scrub) {
    let changed = 0;
    for (const r of await repo.rowsOf(trx, s, table, ['id', ...columns])) {
      const patch: Record<string, unknown> = {};
      for (const col of columns) {
        const v = scrubNullable(scrub, r[col] as string | null);
        if (v !== r[col]) patch[col] = v;
      }
      if (Object.keys(patch).length) {
        await repo.updateRow(trx, table, r.id as number, patch);
        changed++;
      }
    }
    return changed;
  }
}

export type PrivacyService = ReturnType<typeof privacyService>;
