import crypto from 'node:crypto';
import type { PhotoSize, UpdatePhotoInput, UploadPhotosFields } from '../../../shared/schemas/photos';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import type { PageParams } from '../../../shared/schemas/common';
import { pageOf } from '../../lib/page';
import { errors } from '../../lib/errors';
import { contentTypes, extensions, inspectPhoto, processPhoto, type PhotoFormat, type ProcessedPhoto } from '../../lib/images/photos';
import type { Member } from '../../lib/policy';
import type { FileStorage, StagedFile } from '../../lib/storage/storage';
import type { Limiter } from '../../lib/upload';
import type { NoticesService } from '../notices/notices.service';
import { toPhoto, type PhotoRow, type PhotosRepository, type Visibility } from './photos.repository';

export type UploadedFile = { buffer: Buffer };

const fileKey = (storageKey: string, size: PhotoSize, format: PhotoFormat) => `${storageKey}/${size}.${size === 'original' ? extensions[format] : 'webp'}`;
const allSizes = (r: Pick<PhotoRow, 'storage_key' | 'format'>) => (['original', 'large', 'medium', 'thumb'] as const).map((s) => fileKey(r.storage_key, s, r.format));
const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

export function photosService(deps: { db: Db; repo: PhotosRepository; storage: FileStorage; limiter: Limiter; notices: NoticesService; clock: Clock }) {
  const { db, repo, storage, limiter, notices, clock } = deps;
  const now = () => iso(clock.now());
  const notFound = () => errors.notFound('That photo');

  /** The commission as the caller may see it: a client only their own; anything else is 404. */
  async function commissionFor(m: Member, commissionId: number) {
    const c = await repo.commission(m.studioId, commissionId);
    if (!c || (m.role === 'client' && c.client_id !== m.clientId)) throw errors.notFound('That commission');
    return c;
  }
  const visibilityFor = (m: Member, userId: number): Visibility => (m.role === 'client' ? { all: false, userId } : { all: true });

  /** A photo the caller may see, or 404 (also for an unshared photo and another client's). */
  async function visiblePhoto(m: Member, userId: number, photoId: number) {
    const p = await repo.get(m.studioId, photoId);
    if (!p) throw notFound();
    if (m.role === 'client') {
      const c = await repo.commission(m.studioId, p.commission_id);
      const own = p.kind === 'reference' && p.uploaded_by === userId;
      if (!c || c.client_id !== m.clientId || !(Boolean(p.shared) || own)) throw notFound();
    }
    return p;
  }

  /** figureId and stageId must belong to the commission; a stage also fixes the figure. */
  async function placement(studioId: number, commissionId: number, f: UploadPhotosFields) {
    let figureId = f.figureId ?? null;
    if (figureId !== null && !(await repo.figure(studioId, commissionId, figureId))) throw errors.field('figureId', 'That figure is not part of this commission.');
    if (f.stageId === undefined) return { figureId, stageId: null };
    const stage = await repo.stage(studioId, commissionId, f.stageId);
    if (!stage) throw errors.field('stageId', 'That stage is not part of this commission.');
    if (figureId !== null && stage.figure_id !== figureId) throw errors.field('stageId', 'That stage belongs to another figure.');
    figureId = stage.figure_id;
    return { figureId, stageId: stage.id };
  }

  /** Processes one upload (inside the concurrency limit) and writes its files under temporary names. */
  async function processAndStage(file: UploadedFile, storageKey: string) {
    const processed: ProcessedPhoto = await limiter.run(() => processPhoto(file.buffer));
    const staged: StagedFile[] = [];
    try {
      for (const size of Object.keys(processed.files) as PhotoSize[]) {
        staged.push(await storage.stage(fileKey(storageKey, size, processed.format), processed.files[size]));
      }
    } catch (err) {
      await Promise.all(staged.map((s) => s.discard()));
      throw err;
    }
    const bytes = Object.values(processed.files).reduce((n, b) => n + b.length, 0);
    return { storageKey, processed, staged, bytes };
  }

  return {
    commissionFor,

    async list(m: Member, userId: number, commissionId: number, q: PageParams) {
      await commissionFor(m, commissionId);
      const { rows, total } = await repo.list(m.studioId, commissionId, visibilityFor(m, userId), q);
      return pageOf(rows.map(toPhoto), total, q);
    },

    /**
     * All or nothing: every file is checked and processed, its files written under temporary names,
     * then the rows go in within one transaction and the files get their final names just before it
     * commits. Any failure on the way removes whatever was written, so no row and no file is left.
     */
    async upload(m: Member, user: { id: number; name: string }, commissionId: number, fields: UploadPhotosFields, files: UploadedFile[]) {
      const c = await commissionFor(m, commissionId);
      if (m.role === 'client' && fields.kind !== 'reference') throw errors.forbidden('Clients add reference photos only.');
      const where = await placement(m.studioId, commissionId, fields);
      if (!files.length) throw errors.field('photos', 'Add at least one photo.');
      // Header checks first: a wrong file among several fails the upload before any decoding starts.
      for (const f of files) await inspectPhoto(f.buffer);
      // A client's own reference photos are theirs to see; the studio chooses what else to share.
      const shared = m.role === 'client' ? true : fields.shared;

      const settled = await Promise.allSettled(files.map((f) => processAndStage(f, `${m.studioId}/${crypto.randomUUID()}`)));
      const done = settled.flatMap((s) => (s.status === 'fulfilled' ? [s.value] : []));
      const failed = settled.find((s): s is PromiseRejectedResult => s.status === 'rejected');
      const discardAll = () => Promise.all(done.flatMap((d) => d.staged.map((s) => s.discard())));
      if (failed) {
        await discardAll();
        throw failed.reason;
      }

      const at = now();
      let ids: number[];
      try {
        ids = await db.transaction(async (trx) => {
          const out: number[] = [];
          for (const d of done) {
            out.push(
              await repo.insert(
                {
                  studio_id: m.studioId,
                  commission_id: commissionId,
                  figure_id: where.figureId,
                  stage_id: where.stageId,
                  kind: fields.kind,
                  caption: fields.caption ?? null,
                  shared,
                  uploaded_by: user.id,
                  width: d.processed.width,
                  height: d.processed.height,
                  bytes: d.bytes,
                  storage_key: d.storageKey,
                  format: d.processed.format,
                  created_at: at,
                },
                trx,
              ),
            );
          }
          await repo.logActivity(trx, { studioId: m.studioId, commissionId, userId: user.id, action: 'photo.added', detail: { photoIds: out, kind: fields.kind, shared, summary: `added ${plural(out.length, `${fields.kind} photo`)}${shared && m.role !== 'client' ? ', shared with the client' : ''}.` }, at });
          if (shared && m.role !== 'client') {
            await notices.notify(trx, {
              studioId: m.studioId,
              commissionId,
              to: 'client',
              actorId: user.id,
              template: 'notice.photos-shared',
              subject: (x) => `${x.studioName}: new photos of "${x.title}"`,
              lines: [`${user.name} shared ${plural(out.length, 'new photo')} of "${c.title}" with you.`, ...(fields.caption ? [fields.caption] : [])],
            });
          }
          // Last step before the commit: the files take their final names.
          for (const d of done) for (const s of d.staged) await s.commit();
          return out;
        });
      } catch (err) {
        await discardAll();
        throw err;
      }
      notices.kick();
      return (await repo.byIds(m.studioId, ids)).map(toPhoto);
    },

    async update(m: Member, user: { id: number; name: string }, photoId: number, input: UpdatePhotoInput) {
      const p = await visiblePhoto(m, user.id, photoId);
      const patch: { caption?: string | null; shared?: boolean } = {};
      if (input.caption !== undefined) patch.caption = input.caption;
      if (input.shared !== undefined) patch.shared = input.shared;
      const sharingChanged = input.shared !== undefined && input.shared !== Boolean(p.shared);
      if (Object.keys(patch).length) {
        await db.transaction(async (trx) => {
          await repo.update(m.studioId, photoId, patch, trx);
          if (!sharingChanged) return;
          const at = now();
          await repo.logActivity(trx, { studioId: m.studioId, commissionId: p.commission_id, userId: user.id, action: input.shared ? 'photo.shared' : 'photo.unshared', detail: { photoId, summary: input.shared ? 'shared a photo with the client.' : 'stopped sharing a photo with the client.' }, at });
          if (input.shared) {
            const caption = patch.caption !== undefined ? patch.caption : p.caption;
            const title = (await repo.commission(m.studioId, p.commission_id, trx))?.title ?? '';
            await notices.notify(trx, {
              studioId: m.studioId,
              commissionId: p.commission_id,
              to: 'client',
              actorId: user.id,
              template: 'notice.photos-shared',
              subject: (x) => `${x.studioName}: a new photo of "${x.title}"`,
              lines: [`${user.name} shared a photo of "${title}" with you.`, ...(caption ? [caption] : [])],
            });
          }
        });
        if (input.shared) notices.kick();
      }
      return toPhoto((await repo.get(m.studioId, photoId))!);
    },

    /** Row first, files after the commit: a file that fails to go leaves an orphan on disk, never a row without its files. */
    async remove(m: Member, userId: number, photoId: number) {
      const p = await visiblePhoto(m, userId, photoId);
      await db.transaction(async (trx) => {
        await repo.remove(m.studioId, photoId, trx);
        await repo.logActivity(trx, { studioId: m.studioId, commissionId: p.commission_id, userId, action: 'photo.deleted', detail: { photoId, kind: p.kind, summary: 'deleted a photo.' }, at: now() });
      });
      await Promise.all(allSizes(p).map((k) => storage.delete(k)));
    },

    /**
     * At start-up, before anything is uploaded: removes the photo files no row refers to, which a crash leaves
     * between an upload's file commit and its transaction's, or between a delete's commit and its file removal.
     * Only folders shaped like the photo keys (`<studioId>/<uuid>`) are looked at. Returns how many files went.
     */
    async sweepLeftovers() {
      if (!storage.list) return 0;
      const files = await storage.list();
      const known = new Set(await repo.storageKeys());
      let removed = 0;
      for (const key of files) {
        const folder = /^(\d+\/[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})\/[a-z]+\.[a-z]+$/.exec(key)?.[1];
        if (!folder || known.has(folder)) continue;
        await storage.delete(key);
        removed++;
      }
      return removed;
    },

    /** What the file route needs before it opens anything: checks visibility first, so a 304 never leaks. */
    async file(m: Member, userId: number, photoId: number, size: PhotoSize) {
      const p = await visiblePhoto(m, userId, photoId);
      const key = fileKey(p.storage_key, size, p.format);
      // The files of a photo never change after upload, so a tag derived from their key is stable and strong.
      const etag = `"${crypto.createHash('sha256').update(key).digest('base64url').slice(0, 27)}"`;
      const ext = size === 'original' ? extensions[p.format] : 'webp';
      return {
        etag,
        contentType: size === 'original' ? contentTypes[p.format] : 'image/webp',
        filename: `photo-${p.id}-${size}.${ext}`,
        open: () => storage.read(key),
      };
    },
  };
}

export type PhotosService = ReturnType<typeof photosService>;
