import type { PhotoPalette, PointColour } from '../../../shared/schemas/paints';
import type { PhotoSize } from '../../../shared/schemas/photos';
import { iso, type Clock } from '../../lib/clock';
import { errors } from '../../lib/errors';
import { colourAt, extractPalette } from '../../lib/images/palette';
import type { Member } from '../../lib/policy';
import type { Limiter } from '../../lib/upload';
import type { PaintsService } from '../paints/paints.service';
import type { PaletteRepository } from './palette.repository';

/** How the photos feature hands out a photo's bytes (it checks who may see the photo). */
type PhotoFiles = {
  file(m: Member, userId: number, photoId: number, size: PhotoSize): Promise<{ open(): Promise<{ stream: NodeJS.ReadableStream } | null> }>;
};

const round4 = (n: number) => Math.round(n * 10_000) / 10_000;

/**
 * A reference photo's dominant colours and the rack's nearest paints to them, and to any point of it.
 * The palette is cached per photo (its files never change); the matches are made fresh, as the rack changes.
 */
export function paletteService(deps: { repo: PaletteRepository; photos: PhotoFiles; paints: Pick<PaintsService, 'rack'>; limiter: Limiter; clock: Clock }) {
  const { repo, photos, paints, limiter, clock } = deps;

  async function referencePhoto(m: Member, photoId: number) {
    const p = await repo.photo(m.studioId, photoId);
    if (!p || p.kind !== 'reference') throw errors.notFound('That reference photo');
    return p;
  }

  /** The stored original, read through the photos feature's storage (which checks access again). */
  async function original(m: Member, userId: number, photoId: number): Promise<Buffer> {
    const f = await photos.file(m, userId, photoId, 'original');
    const file = await f.open();
    if (!file) throw errors.notFound('That photo file');
    const chunks: Buffer[] = [];
    for await (const chunk of file.stream) chunks.push(Buffer.isBuffer(chunk) ? chunk : Buffer.from(chunk as string));
    return Buffer.concat(chunks);
  }

  return {
    async palette(m: Member, userId: number, photoId: number): Promise<PhotoPalette> {
      const p = await referencePhoto(m, photoId);
      let colours = await repo.cached(m.studioId, photoId);
      if (!colours) {
        const bytes = await original(m, userId, photoId);
        const found = await limiter.run(() => extractPalette(bytes));
        colours = found.map((c) => ({ hex: c.hex, share: round4(c.share) }));
        await repo.save(m.studioId, photoId, colours, iso(clock.now()));
      }
      const rack = await paints.rack(m.studioId);
      return { photoId, commissionId: p.commission_id, colours: colours.map((c) => ({ ...c, matches: rack.nearest(c.hex, 3) })) };
    },

    async point(m: Member, userId: number, photoId: number, x: number, y: number): Promise<PointColour> {
      await referencePhoto(m, photoId);
      const bytes = await original(m, userId, photoId);
      const hex = await limiter.run(() => colourAt(bytes, x, y));
      const rack = await paints.rack(m.studioId);
      return { hex, x, y, matches: rack.nearest(hex, 3) };
    },
  };
}

export type PaletteService = ReturnType<typeof paletteService>;
