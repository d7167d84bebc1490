import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { ChevronLeft, Plus, Sparkles } from 'lucide-react';
import { ButtonLink } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock, Spinner } from '../../../components/ui/spinner';
import { Swatch } from '../../../components/ui/swatch';
import { isApiError } from '../../../lib/api-client';
import { useStudioScope } from '../../../lib/studio-scope';
import { usePalette, usePoint } from '../api/get-palette';
import { MatchList } from '../components/match-list';
import { PhotoPicker } from '../components/photo-picker';
import type { PaintMatchView } from '../../../../shared/schemas/paints';

const pct = (share: number) => `${Math.round(share * 100)} %`;

function recipeLink(studioId: number, photoId: number, hex: string, matches: PaintMatchView[]) {
  const q = new URLSearchParams({ colour: hex, photo: String(photoId) });
  if (matches[0]) q.set('paint', String(matches[0].paint.id));
  return `/studio/${studioId}/paints/recipes/new?${q.toString()}`;
}

function ColourActions({ photoId, hex, matches }: { photoId: number; hex: string; matches: PaintMatchView[] }) {
  const { studioId } = useStudioScope();
  return (
    <div className="flex flex-wrap gap-2">
      <ButtonLink to={recipeLink(studioId, photoId, hex, matches)} size="sm" aria-label={`Start a recipe from this colour, ${hex}`}>
        <Sparkles aria-hidden="true" className="size-4" />
        Start a recipe from this colour
      </ButtonLink>
      {(!matches[0] || matches[0].band === 'far') && (
        <ButtonLink to={`/studio/${studioId}/paints/new?hex=${encodeURIComponent(hex)}`} size="sm" variant="secondary" aria-label={`Add a paint in this colour, ${hex}`}>
          <Plus aria-hidden="true" className="size-4" />
          Add a paint in this colour
        </ButtonLink>
      )}
    </div>
  );
}

/** A reference photo's main colours and the rack's nearest paints; a click anywhere on it finds that point's. */
export function PaletteViewRoute() {
  const { studioId } = useStudioScope();
  const photoId = Number(useParams().photoId);
  const valid = Number.isInteger(photoId) && photoId > 0;
  const palette = usePalette(studioId, photoId, valid);
  const [picked, setPicked] = useState<{ x: number; y: number } | null>(null);
  const point = usePoint(studioId, photoId, picked);

  if (!valid || isApiError(palette.error, 404)) {
    return (
      <>
        <PageTitle title="Reference photo not found" />
        <ErrorNote>This is not a reference photo of the studio, or it has been removed.</ErrorNote>
      </>
    );
  }

  return (
    <>
      {palette.data && (
        <Link to={`/studio/${studioId}/commissions/${palette.data.commissionId}`} className="mb-3 inline-flex items-center gap-1 text-sm">
          <ChevronLeft aria-hidden="true" className="size-4" />
          Back to the commission
        </Link>
      )}
      <PageTitle title="Colours of a reference photo" description="The photo's main colours and the nearest paints on the rack, by CIEDE2000 (ΔE00): below 2 very close, below 5 close." />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="flex flex-col gap-3">
          <PhotoPicker src={`/api/studios/${studioId}/photos/${photoId}/large`} alt="The client's reference photo" picked={picked} onPick={setPicked} />
          <Card title="The colour you picked" className="p-4">
            {!picked ? (
              <p className="text-sm text-sable-600">Click any point of the photo to find the paints nearest to it.</p>
            ) : point.isPending ? (
              <Spinner label="Reading the colour…" />
            ) : point.error ? (
              <ErrorNote>{point.error.message}</ErrorNote>
            ) : (
              <div className="flex flex-col gap-3" aria-live="polite">
                <p className="flex items-center gap-2 text-sm">
                  <Swatch hex={point.data.hex} label={`Picked colour ${point.data.hex}`} />
                  <span className="font-mono">{point.data.hex}</span>
                  <span className="text-sable-600">
                    at {Math.round(point.data.x * 100)} % across, {Math.round(point.data.y * 100)} % down
                  </span>
                </p>
                <MatchList matches={point.data.matches} colourLabel={point.data.hex} />
                <ColourActions photoId={photoId} hex={point.data.hex} matches={point.data.matches} />
              </div>
            )}
          </Card>
        </div>
        <section aria-labelledby="main-colours" className="flex flex-col gap-3">
          <h2 id="main-colours" className="text-lg font-semibold">
            Main colours
          </h2>
          {palette.isPending ? (
            <LoadingBlock label="Finding the photo's colours…" />
          ) : palette.error ? (
            <ErrorNote title="The colours could not be read">{palette.error.message}</ErrorNote>
          ) : (
            <ol className="flex flex-col gap-3">
              {palette.data.colours.map((c, i) => (
                <li key={c.hex} className="rounded-card border border-primer-300 bg-bone-50 p-3">
                  <div className="mb-2 flex items-center gap-3">
                    <Swatch size="lg" hex={c.hex} label={`Colour ${i + 1}, ${c.hex}`} />
                    <div>
                      <p className="font-mono text-sm">{c.hex}</p>
                      <p className="text-xs text-sable-600">
                        <span className="figures">{pct(c.share)}</span> of the photo
                      </p>
                      <div className="mt-1 h-1.5 w-32 overflow-hidden rounded-full bg-primer-300" aria-hidden="true">
                        <div className="h-full bg-sable-600" style={{ width: `${Math.max(2, c.share * 100)}%` }} />
                      </div>
                    </div>
                  </div>
                  <MatchList matches={c.matches} colourLabel={c.hex} />
                  <div className="mt-2">
                    <ColourActions photoId={photoId} hex={c.hex} matches={c.matches} />
                  </div>
                </li>
              ))}
            </ol>
          )}
          <Note className="text-xs">These matches are for the studio: the client sees their photo and the scheme&rsquo;s colours, never the rack.</Note>
        </section>
      </div>
    </>
  );
}
