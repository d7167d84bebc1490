import crypto from 'node:crypto';
import { localDateOf } from '../../../shared/dates';
import { fromMinor, toMinor } from '../../../shared/money';
import type { Page } from '../../../shared/schemas/common';
import { sizeClassLabels, type CreateCommissionInput, type ListItem, type SizeClass } from '../../../shared/schemas/commissions';
import type {
  AcceptEnquiryInput,
  AcceptEnquiryResult,
  DeclineEnquiryInput,
  Enquiry,
  EnquiryInput,
  EnquiryListQuery,
  EnquiryReceived,
  EnquirySummary,
} from '../../../shared/schemas/enquiries';
import type { PhotoSize } from '../../../shared/schemas/photos';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { AppError, errors } from '../../lib/errors';
import { contentTypes, extensions, inspectPhoto, processPhoto, type PhotoFormat } from '../../lib/images/photos';
import type { Mailer } from '../../lib/mail/mailer';
import { templates } from '../../lib/mail/templates';
import type { FileStorage, StagedFile } from '../../lib/storage/storage';
import type { Limiter } from '../../lib/upload';
import { keptReads, type VersionInZone } from '../../lib/version-cache';
import type { EnquiriesRepository, EnquiryListRow, EnquiryPhotoRow, EnquiryRow } from './enquiries.repository';

type Actor = { studioId: number; role: string; clientId: number | null; userId: number };
type StudioRef = { id: number; name: string; currency: string; timezone: string };

/** The photos feature's file layout, so a reference photo made from an enquiry photo finds its files. */
const fileKey = (storageKey: string, size: PhotoSize, format: PhotoFormat) => `${storageKey}/${size}.${size === 'original' ? extensions[format] : 'webp'}`;
const SIZES = ['original', 'large', 'medium', 'thumb'] as const;
const num = (v: number | string | null | undefined) => Number(v ?? 0);
const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;
const isConflict = (err: unknown): err is AppError => err instanceof AppError && err.status === 409;

/** Enquiries the kept list pages may hold across studios and queries. */
export const ENQUIRY_LIST_CACHE_ROWS = 20_000;

function parseKeys(json: string): string[] {
  try {
    const v = JSON.parse(json);
    return Array.isArray(v) ? v.filter((x): x is string => typeof x === 'string') : [];
  } catch {
    return [];
  }
}

const figureLine = (f: { name: string; quantity: number; size_class?: string; sizeClass?: string }) =>
  `${f.quantity} × ${f.name} (${sizeClassLabels[(f.size_class ?? f.sizeClass) as SizeClass] ?? f.size_class ?? f.sizeClass})`;

export function enquiriesService(deps: {
  db: Db;
  repo: EnquiriesRepository;
  lists: { tiers(studioId: number): Promise<ListItem[]>; extras(studioId: number): Promise<ListItem[]> };
  commissions: { create(actor: Actor, input: CreateCommissionInput): Promise<{ id: number }> };
  invitations: { inviteClient(studioId: number, inviterId: number, clientId: number): Promise<unknown> };
  activity: { record(trx: Db, e: { studioId: number; commissionId: number; userId: number | null; action: string; detail?: Record<string, unknown> }): Promise<unknown> };
  storage: FileStorage;
  limiter: Limiter;
  mailer: Mailer;
  clock: Clock;
  publicUrl: string;
  /** Enquiries the kept list pages may hold (default ENQUIRY_LIST_CACHE_ROWS); 0 turns them off. */
  cacheRows?: number;
}) {
  const { db, repo, storage, limiter, mailer, clock } = deps;
  /**
   * The list's pages are kept per studio, lists version (moved by the enquiries, their figures and photos, and
   * the studio's tiers: migrations/20270208120000-lists-version-quotes-enquiries.ts) and query: reading the
   * same rows again was nearly all of their cost. Nothing on them depends on the clock.
   */
  const keptPages = keptReads<Page<EnquirySummary> & { newCount: number }, VersionInZone>({
    version: (studioId) => repo.listsVersion(studioId),
    maxWeight: deps.cacheRows ?? ENQUIRY_LIST_CACHE_ROWS,
    weigh: (p) => p.items.length + 1,
  });
  const now = () => iso(clock.now());
  const notFound = () => errors.notFound('That enquiry');

  const labelled = (keys: string[], items: ListItem[]) => keys.map((k) => ({ key: k, label: items.find((i) => i.key === k)?.label ?? k }));

  function summaryOf(r: EnquiryListRow, tiers: ListItem[]): EnquirySummary {
    return {
      id: r.id,
      status: r.status,
      name: r.name,
      email: r.email,
      figureCount: num(r.figure_count),
      modelCount: num(r.model_count),
      tier: r.tier ? labelled([r.tier], tiers)[0] : null,
      dueDate: r.due_date,
      photoCount: num(r.photo_count),
      createdAt: r.created_at,
    };
  }

  const photoUrls = (studioId: number, enquiryId: number, photoId: number) =>
    Object.fromEntries(SIZES.map((s) => [s, `/api/studios/${studioId}/enquiries/${enquiryId}/photos/${photoId}/${s}`])) as Record<PhotoSize, string>;

  function declineDraft(r: EnquiryRow, studioName: string, ownerName: string | null) {
    return [
      `Hello ${r.name},`,
      `Thank you for thinking of ${studioName} for your figures. We are not able to take this commission on, and would rather tell you now than keep you waiting.`,
      'We hope you find the right brush for them, and you are welcome to ask us again another time.',
      `With best wishes,\n${ownerName ? `${ownerName}, ` : ''}${studioName}`,
    ].join('\n\n');
  }

  async function view(actor: Actor, id: number): Promise<Enquiry> {
    const r = await repo.get(actor.studioId, id);
    if (!r) throw notFound();
    const [figures, photos, tiers, extras, studio, existing, ownerName] = await Promise.all([
      repo.figures(actor.studioId, id),
      repo.photos(actor.studioId, id),
      deps.lists.tiers(actor.studioId),
      deps.lists.extras(actor.studioId),
      repo.studio(actor.studioId),
      repo.clientByEmail(actor.studioId, r.email),
      repo.userName(actor.userId),
    ]);
    const summary = summaryOf({ ...r, figure_count: figures.length, model_count: figures.reduce((n, f) => n + f.quantity, 0), photo_count: photos.length }, tiers);
    return {
      ...summary,
      figures: figures.map((f) => ({ name: f.name, quantity: f.quantity, sizeClass: f.size_class as SizeClass })),
      extras: labelled(parseKeys(r.extras), extras),
      budgetMinor: r.budget_minor === null ? null : num(r.budget_minor),
      currency: r.currency,
      notes: r.notes,
      photos: photos.map((p) => ({ id: p.id, width: p.width, height: p.height, urls: photoUrls(actor.studioId, id, p.id) })),
      decidedAt: r.decided_at,
      decidedBy: r.decided_by !== null && r.decided_by_name ? { id: r.decided_by, name: r.decided_by_name } : null,
      clientId: r.client_id,
      commissionId: r.commission_id,
      declineMessage: r.decline_message,
      declineDraft: declineDraft(r, studio?.name ?? 'the studio', ownerName),
      existingClient: existing ? { id: existing.id, name: existing.name, hasAccount: existing.user_id !== null } : null,
    };
  }

  /** Checks every photo from its header first, then decodes them (inside the limit) and writes their files under temporary names. */
  async function stagePhotos(studioId: number, files: { buffer: Buffer }[]) {
    for (const f of files) {
      try {
        await inspectPhoto(f.buffer);
      } catch (err) {
        if (err instanceof AppError && !err.fields) err.fields = { photos: err.message };
        throw err;
      }
    }
    const staged: StagedFile[] = [];
    const out: { storageKey: string; format: PhotoFormat; width: number; height: number; bytes: number }[] = [];
    try {
      for (const f of files) {
        const processed = await limiter.run(() => processPhoto(f.buffer));
        const storageKey = `${studioId}/${crypto.randomUUID()}`;
        for (const size of SIZES) staged.push(await storage.stage(fileKey(storageKey, size, processed.format), processed.files[size]));
        out.push({ storageKey, format: processed.format, width: processed.width, height: processed.height, bytes: Object.values(processed.files).reduce((n, b) => n + b.length, 0) });
      }
    } catch (err) {
      await Promise.all(staged.map((s) => s.discard()));
      if (err instanceof AppError && !err.fields) err.fields = { photos: err.message };
      throw err;
    }
    return { photos: out, staged };
  }

  return {
    view,

    /**
     * A visitor's enquiry (already past the honeypot and the rate limits): checked against the studio's
     * own tiers and extras, stored with its photos, acknowledged to the enquirer and announced to the owners.
     */
    async submit(studio: StudioRef, input: EnquiryInput, files: { buffer: Buffer }[]): Promise<EnquiryReceived> {
      const [tiers, extras] = await Promise.all([deps.lists.tiers(studio.id), deps.lists.extras(studio.id)]);
      const fields: Record<string, string> = {};
      if (input.tier && !tiers.some((t) => t.key === input.tier)) fields.tier = 'Choose one of the tiers the studio offers.';
      const badExtra = input.extras.findIndex((k) => !extras.some((x) => x.key === k));
      if (badExtra >= 0) fields[`extras.${badExtra}`] = 'Choose extras from the studio’s list.';
      let budgetMinor: number | null = null;
      if (input.budget) {
        try {
          budgetMinor = toMinor(input.budget, studio.currency);
        } catch (err) {
          fields.budget = err instanceof Error ? err.message : 'Write the budget as a number, such as 250.';
        }
      }
      const today = localDateOf(clock.now().getTime(), studio.timezone);
      if (input.dueDate && input.dueDate < today) fields.dueDate = 'Choose a date from today on.';
      if (Object.keys(fields).length) throw errors.invalid('Some fields need a look.', fields);

      const { photos, staged } = await stagePhotos(studio.id, files);
      const at = now();
      try {
        await db.transaction(async (trx) => {
          const id = await repo.insert(trx, {
            studio_id: studio.id,
            status: 'new',
            name: input.name,
            email: input.email,
            tier: input.tier ?? null,
            extras: JSON.stringify([...new Set(input.extras)]),
            due_date: input.dueDate ?? null,
            budget_minor: budgetMinor,
            currency: studio.currency,
            notes: input.notes ?? null,
            consent_at: at,
            created_at: at,
          });
          await repo.insertFigures(
            trx,
            input.figures.map((f, i) => ({ studio_id: studio.id, enquiry_id: id, position: i + 1, name: f.name, quantity: f.quantity, size_class: f.sizeClass })),
          );
          for (const p of photos) {
            await repo.insertPhoto(trx, { studio_id: studio.id, enquiry_id: id, storage_key: p.storageKey, format: p.format, width: p.width, height: p.height, bytes: p.bytes, created_at: at });
          }
          const tier = input.tier ? tiers.find((t) => t.key === input.tier)?.label : null;
          const list = input.figures.map(figureLine);
          const ack = templates.notice({
            subject: `${studio.name} has your enquiry`,
            lines: [
              `Hello ${input.name},`,
              `Thank you for your enquiry. ${studio.name} has it and will answer you by e-mail. Nothing is booked or charged yet.`,
              `You listed: ${list.join('; ')}.`,
              ...(tier ? [`Wished tier: ${tier}.`] : []),
              ...(input.dueDate ? [`Wished by: ${input.dueDate}.`] : []),
              ...(photos.length ? [`With ${plural(photos.length, 'reference photo')}.`] : []),
              'If you did not send this enquiry, you can ignore this message.',
            ],
          });
          await mailer.enqueue({ ...ack, to: input.email, template: 'enquiry.received', studioId: studio.id }, trx);
          for (const o of await repo.owners(studio.id, trx)) {
            const notice = templates.notice({
              subject: `New enquiry from ${input.name}`,
              lines: [`Hello ${o.name},`, `${input.name} (${input.email}) sent an enquiry through the studio's page: ${list.join('; ')}.`],
              action: { label: 'Open the enquiry', url: `${deps.publicUrl}/studio/${studio.id}/enquiries/${id}` },
            });
            await mailer.enqueue({ ...notice, to: o.email, template: 'enquiry.new', studioId: studio.id }, trx);
          }
          // Last step before the commit: the photo files take their final names.
          for (const s of staged) await s.commit();
          return id;
        });
      } catch (err) {
        await Promise.all(staged.map((s) => s.discard()));
        throw err;
      }
      mailer.kick();
      return { received: true, message: `Thank you. ${studio.name} has your enquiry; a confirmation is on its way to ${input.email}.` };
    },

    list(actor: Actor, q: EnquiryListQuery): Promise<Page<EnquirySummary> & { newCount: number }> {
      const key = JSON.stringify([q.status ?? null, q.q ?? null, q.limit, q.offset]);
      return keptPages(actor.studioId, key, async () => {
        const [{ rows, total }, tiers, newCount] = await Promise.all([repo.list(actor.studioId, q), deps.lists.tiers(actor.studioId), repo.countNew(actor.studioId)]);
        return { items: rows.map((r) => summaryOf(r, tiers)), total, limit: q.limit, offset: q.offset, newCount };
      });
    },

    /** What the photo route needs: the owner's own studio's enquiry photo, or 404. */
    async photoFile(actor: Actor, enquiryId: number, photoId: number, size: PhotoSize) {
      const p: EnquiryPhotoRow | undefined = await repo.photo(actor.studioId, enquiryId, photoId);
      if (!p) throw errors.notFound('That photo');
      const key = fileKey(p.storage_key, size, p.format);
      const ext = size === 'original' ? extensions[p.format] : 'webp';
      return {
        etag: `"${crypto.createHash('sha256').update(key).digest('base64url').slice(0, 27)}"`,
        contentType: size === 'original' ? contentTypes[p.format] : 'image/webp',
        filename: `enquiry-${enquiryId}-photo-${p.id}-${size}.${ext}`,
        open: () => storage.read(key),
      };
    },

    /**
     * Turns the enquiry into a client (matched by e-mail, ignoring case, or created) and a commission in
     * the enquiry state with its figures and photos, then invites the client to the portal unless they
     * already have an account. The enquiry is claimed first, so it can be accepted only once.
     */
    async accept(actor: Actor, id: number, input: AcceptEnquiryInput): Promise<AcceptEnquiryResult> {
      const { studioId } = actor;
      const e = await repo.get(studioId, id);
      if (!e) throw notFound();
      const [figures, tiers, extras] = await Promise.all([repo.figures(studioId, id), deps.lists.tiers(studioId), deps.lists.extras(studioId)]);
      const at = now();
      const { clientId, matched } = await db.transaction(async (trx) => {
        if ((await repo.decide(trx, studioId, id, { status: 'accepted', decided_at: at, decided_by: actor.userId })) !== 1) {
          throw errors.conflict(`This enquiry was already ${e.status === 'declined' ? 'declined' : 'accepted'}.`, 'already_decided');
        }
        const existing = await repo.clientByEmail(studioId, e.email, trx);
        if (existing) return { clientId: existing.id, matched: true };
        const created = await repo.createClient(trx, studioId, { name: e.name, email: e.email, notes: `Came through the studio's page on ${at.slice(0, 10)}.` }, at);
        return { clientId: created, matched: false };
      });

      // A tier the studio has since removed (or no wish at all) falls back to the studio's first tier.
      const tier = tiers.some((t) => t.key === e.tier) ? e.tier! : tiers[0]?.key;
      const wishedExtras = labelled(parseKeys(e.extras), extras);
      const first = figures[0];
      const title = input.title ?? (first ? `${first.name}${figures.length > 1 ? ` and ${plural(figures.length - 1, 'more figure')}` : ''}` : `Enquiry from ${e.name}`).slice(0, 120);
      const brief = [
        `From the enquiry of ${e.name} (${e.email}), ${e.created_at.slice(0, 10)}.`,
        ...(wishedExtras.length ? [`Wished extras: ${wishedExtras.map((x) => x.label).join(', ')}.`] : []),
        ...(e.budget_minor !== null ? [`Budget: ${fromMinor(num(e.budget_minor), e.currency)} ${e.currency}.`] : []),
        ...(e.notes ? ['', e.notes] : []),
      ].join('\n');
      let commissionId: number;
      try {
        const c = await deps.commissions.create(actor, {
          clientId,
          title,
          brief: brief.slice(0, 10000),
          dueDate: e.due_date ?? undefined,
          figures: tier ? figures.map((f) => ({ name: f.name, quantity: f.quantity, sizeClass: f.size_class as SizeClass, tier })) : [],
        });
        commissionId = c.id;
      } catch (err) {
        await repo.undecide(studioId, id);
        throw err;
      }

      const photos = await repo.photos(studioId, id);
      await db.transaction(async (trx) => {
        await repo.link(trx, studioId, id, { client_id: clientId, commission_id: commissionId });
        for (const p of photos) {
          const photoId = await repo.insertReferencePhoto(trx, {
            studio_id: studioId,
            commission_id: commissionId,
            width: p.width,
            height: p.height,
            bytes: p.bytes,
            storage_key: p.storage_key,
            format: p.format,
            created_at: at,
          });
          await repo.linkPhoto(trx, studioId, p.id, photoId);
        }
        await deps.activity.record(trx, {
          studioId,
          commissionId,
          userId: actor.userId,
          action: 'commission.from_enquiry',
          detail: { enquiryId: id, summary: `turned the enquiry of ${e.name} into this commission${photos.length ? ` (with ${plural(photos.length, 'reference photo')})` : ''}.` },
        });
      });

      const client = (await repo.client(studioId, clientId))!;
      let invitation: AcceptEnquiryResult['invitation'];
      if (!input.invite) invitation = { sent: false, note: 'No invitation was sent, as you chose.' };
      else if (client.user_id !== null) invitation = { sent: false, note: `${client.name} already has an account, so no invitation was sent; they see the commission when they sign in.` };
      else {
        try {
          await deps.invitations.inviteClient(studioId, actor.userId, clientId);
          invitation = { sent: true, note: `An invitation to the client portal went to ${client.email}.` };
        } catch (err) {
          if (!isConflict(err)) throw err;
          invitation = { sent: false, note: `No invitation was sent: ${err.message}` };
        }
      }
      return { enquiry: await view(actor, id), commissionId, client: { id: clientId, name: client.name, matched }, invitation };
    },

    /** Sends the owner's (edited) refusal to the enquirer and files the enquiry as declined. */
    async decline(actor: Actor, id: number, input: DeclineEnquiryInput) {
      const e = await repo.get(actor.studioId, id);
      if (!e) throw notFound();
      const studio = await repo.studio(actor.studioId);
      await db.transaction(async (trx) => {
        if ((await repo.decide(trx, actor.studioId, id, { status: 'declined', decided_at: now(), decided_by: actor.userId, decline_message: input.message })) !== 1) {
          throw errors.conflict(`This enquiry was already ${e.status === 'accepted' ? 'accepted' : 'declined'}.`, 'already_decided');
        }
        const mail = templates.notice({ subject: `${studio?.name ?? 'The studio'}: about your enquiry`, lines: input.message.split('\n').map((l) => l.trim()).filter(Boolean) });
        await mailer.enqueue({ ...mail, to: e.email, template: 'enquiry.declined', studioId: actor.studioId }, trx);
      });
      mailer.kick();
      return view(actor, id);
    },
  };
}

export type EnquiriesService = ReturnType<typeof enquiriesService>;
