import type { Db } from '../../lib/db';

export type CachedColour = { hex: string; share: number };

export function paletteRepository(db: Db) {
  return {
    photo: (studioId: number, photoId: number) =>
      db('photos').where({ studio_id: studioId, id: photoId }).first('id', 'commission_id', 'kind') as Promise<{ id: number; commission_id: number; kind: string } | undefined>,
    async cached(studioId: number, photoId: number): Promise<CachedColour[] | null> {
      const row = await db('photo_palettes').where({ studio_id: studioId, photo_id: photoId }).first('colours');
      return row ? (JSON.parse(row.colours) as CachedColour[]) : null;
    },
    /** The same photo always gives the same palette (fixed seed), so a second writer changes nothing. */
    save: (studioId: number, photoId: number, colours: CachedColour[], now: string) =>
      db('photo_palettes').insert({ photo_id: photoId, studio_id: studioId, colours: JSON.stringify(colours), created_at: now }).onConflict('photo_id').ignore(),
  };
}

export type PaletteRepository = ReturnType<typeof paletteRepository>;
