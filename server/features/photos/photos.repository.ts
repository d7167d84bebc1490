import type { Photo, PhotoKind, PhotoSize } from '../../../shared/schemas/photos';
import { photoSizes } from '../../../shared/schemas/photos';
import type { Db } from '../../lib/db';
import type { PageParams } from '../../../shared/schemas/common';
import { pageRows } from '../../lib/page';
import type { PhotoFormat } from '../../lib/images/photos';

export type PhotoRow = {
  id: number;
  studio_id: number;
  commission_id: number;
  figure_id: number | null;
  stage_id: number | null;
  kind: PhotoKind;
  caption: string | null;
  shared: boolean | number;
  uploaded_by: number | null;
  uploader_name?: string | null;
  width: number;
  height: number;
  bytes: number;
  storage_key: string;
  format: PhotoFormat;
  created_at: string;
};

export type NewPhoto = Omit<PhotoRow, 'id' | 'uploader_name' | 'shared'> & { shared: boolean };

export function toPhoto(r: PhotoRow): Photo {
  const base = `/api/studios/${r.studio_id}/photos/${r.id}`;
  return {
    id: r.id,
    commissionId: r.commission_id,
    figureId: r.figure_id,
    stageId: r.stage_id,
    kind: r.kind,
    caption: r.caption,
    shared: Boolean(r.shared),
    width: r.width,
    height: r.height,
    uploadedBy: r.uploaded_by !== null && r.uploader_name ? { id: r.uploaded_by, name: r.uploader_name } : null,
    createdAt: r.created_at,
    urls: Object.fromEntries(photoSizes.map((s) => [s, `${base}/${s}`])) as Record<PhotoSize, string>,
  };
}

/** What a client may see: photos shared with them, and the reference photos they added themselves. */
export type Visibility = { all: true } | { all: false; userId: number };

export function photosRepository(db: Db) {
  const base = (studioId: number, trx: Db = db) =>
    trx('photos as p').leftJoin('users as u', 'u.id', 'p.uploaded_by').where('p.studio_id', studioId).select('p.*', 'u.name as uploader_name');
  const visible = (qb: ReturnType<typeof base>, v: Visibility) =>
    v.all ? qb : qb.where((w) => w.where('p.shared', true).orWhere((o) => o.where({ 'p.kind': 'reference', 'p.uploaded_by': v.userId })));
  return {
    commission: (studioId: number, commissionId: number, trx: Db = db) =>
      trx('commissions').where({ studio_id: studioId, id: commissionId }).first('id', 'client_id', 'title') as Promise<{ id: number; client_id: number; title: string } | undefined>,
    figure: (studioId: number, commissionId: number, figureId: number) =>
      db('figures').where({ studio_id: studioId, commission_id: commissionId, id: figureId }).first('id') as Promise<{ id: number } | undefined>,
    stage: (studioId: number, commissionId: number, stageId: number) =>
      db('stages').where({ studio_id: studioId, commission_id: commissionId, id: stageId }).first('id', 'figure_id') as Promise<{ id: number; figure_id: number } | undefined>,
    async insert(row: NewPhoto, trx: Db) {
      const [r] = await trx('photos').insert(row).returning('id');
      return typeof r === 'object' ? (r.id as number) : (r as number);
    },
    byIds: (studioId: number, ids: number[]) =>
      base(studioId).whereIn('p.id', ids).orderBy('p.id').then((rows) => rows as PhotoRow[]),
    /** One page of the photos the viewer may see, oldest first. */
    list: (studioId: number, commissionId: number, v: Visibility, q: PageParams) =>
      pageRows<PhotoRow>(visible(base(studioId).where('p.commission_id', commissionId), v).orderBy([{ column: 'p.created_at' }, { column: 'p.id' }]), q),
    get: (studioId: number, id: number, trx: Db = db) =>
      base(studioId, trx)
        .where('p.id', id)
        .first()
        .then((r) => r as PhotoRow | undefined),
    update: (studioId: number, id: number, patch: { caption?: string | null; shared?: boolean }, trx: Db) =>
      trx('photos').where({ studio_id: studioId, id }).update(patch),
    remove: (studioId: number, id: number, trx: Db) => trx('photos').where({ studio_id: studioId, id }).delete(),
    /** Every storage key a row refers to, in all studios: photos and the enquiry photos that share their layout. */
    async storageKeys() {
      const [photos, enquiryPhotos] = await Promise.all([db('photos').pluck('storage_key'), db('enquiry_photos').pluck('storage_key')]);
      return [...photos, ...enquiryPhotos] as string[];
    },
    logActivity: (trx: Db, a: { studioId: number; commissionId: number; userId: number; action: string; detail: object; at: string }) =>
      trx('activity').insert({ studio_id: a.studioId, commission_id: a.commissionId, user_id: a.userId, action: a.action, detail: JSON.stringify(a.detail), at: a.at }),
  };
}

export type PhotosRepository = ReturnType<typeof photosRepository>;
