import crypto from 'node:crypto';
import type { ListItem } from '../../../shared/schemas/commissions';
import {
  ENQUIRIES_PER_HOUR,
  ENQUIRY_MAX_FIGURES,
  ENQUIRY_MAX_PHOTO_BYTES,
  ENQUIRY_MAX_PHOTOS,
  type EnquiryInput,
  type EnquiryReceived,
  type PublicPageInput,
  type PublicPageSettings,
  type PublicStudio,
} from '../../../shared/schemas/enquiries';
import { addMs, HOUR, iso, type Clock } from '../../lib/clock';
import { errors } from '../../lib/errors';
import type { AttemptScope, PublicStudioRepository, PublicStudioRow } from './public-studio.repository';

/** Posts of the form (valid or not) from one address in an hour, before the body is even read. */
const TRIES_PER_HOUR = 30;
/** The forecast is worked out at most this often per studio for the public page. */
const FORECAST_TTL_MS = 10 * 60_000;

type Actor = { studioId: number; role: 'owner'; clientId: null; userId: number };
type PriceSummary = { currency: string; tiers: { key: string; fromMinor: number }[] };
type Delivery = { date: string | null; queueLength: number; unscheduled: string | null };

const hash = (scope: string, value: string) => crypto.createHash('sha256').update(`${scope}:${value}`).digest('hex');

export function publicStudioService(deps: {
  repo: PublicStudioRepository;
  clock: Clock;
  lists: { tiers(studioId: number): Promise<ListItem[]>; extras(studioId: number): Promise<ListItem[]> };
  /** "From" prices of the price table, when the studio has that feature. */
  prices?: { publicSummary(studioId: number): Promise<PriceSummary> };
  /** The capacity forecast, when the studio has that feature. */
  schedule?: { earliestDelivery(actor: Actor, q: { hours: number }): Promise<Delivery> };
  enquiries: { submit(studio: PublicStudioRow, input: EnquiryInput, files: { buffer: Buffer }[]): Promise<EnquiryReceived> };
}) {
  const { repo, clock } = deps;
  const forecastCache = new Map<number, { at: number; value: Delivery | null }>();

  async function settings(studioId: number): Promise<PublicPageSettings> {
    const [s, p] = await Promise.all([repo.studio(studioId), repo.page(studioId)]);
    if (!s) throw errors.notFound('That studio');
    return {
      enabled: Boolean(p?.enabled),
      slug: s.slug,
      path: `/s/${s.slug}`,
      intro: p?.intro ?? null,
      turnaroundText: p?.turnaround_text ?? null,
      turnaroundSource: p?.turnaround_source ?? 'forecast',
    };
  }

  /** The studio, if its page is switched on; otherwise 404, the same as a slug that does not exist. */
  async function openStudio(slug: string) {
    const s = await repo.studioBySlug(slug.trim().toLowerCase());
    const p = s ? await repo.page(s.id) : undefined;
    if (!s || !p?.enabled) throw errors.notFound('That studio page');
    return { studio: s, page: p };
  }

  /** When new work could start if booked now: a small piece of work placed at the end of the queue. */
  async function forecast(studioId: number): Promise<Delivery | null> {
    if (!deps.schedule) return null;
    const t = clock.now().getTime();
    const cached = forecastCache.get(studioId);
    if (cached && t - cached.at < FORECAST_TTL_MS) return cached.value;
    let value: Delivery | null;
    try {
      const d = await deps.schedule.earliestDelivery({ studioId, role: 'owner', clientId: null, userId: 0 }, { hours: 1 });
      value = d.date && !d.unscheduled ? d : null;
    } catch {
      // A forecast that cannot be worked out (no painters' hours yet) leaves the page with the studio's own text.
      value = null;
    }
    forecastCache.set(studioId, { at: t, value });
    return value;
  }

  async function prices(studioId: number): Promise<PriceSummary | null> {
    if (!deps.prices) return null;
    return deps.prices.publicSummary(studioId);
  }

  async function throttle(scope: AttemptScope, key: string, max: number) {
    const since = iso(addMs(clock.now(), -HOUR));
    if ((await repo.countAttempts(scope, key, since)) < max) return;
    const oldest = await repo.oldestAttempt(scope, key, since);
    const retryMs = oldest ? new Date(oldest).getTime() + HOUR - clock.now().getTime() : HOUR;
    throw errors.throttled(retryMs / 1000);
  }

  return {
    settings,

    async saveSettings(studioId: number, input: PublicPageInput) {
      await repo.savePage(studioId, {
        enabled: input.enabled,
        intro: input.intro ?? null,
        turnaround_text: input.turnaroundText ?? null,
        turnaround_source: input.turnaroundSource,
        updated_at: iso(clock.now()),
      });
      forecastCache.delete(studioId);
      return settings(studioId);
    },

    async page(slug: string): Promise<PublicStudio> {
      const { studio, page } = await openStudio(slug);
      const [tiers, extras, summary] = await Promise.all([deps.lists.tiers(studio.id), deps.lists.extras(studio.id), prices(studio.id)]);
      const from = new Map(summary?.tiers.map((t) => [t.key, t.fromMinor]) ?? []);
      let turnaround: PublicStudio['turnaround'] = null;
      const f = page.turnaround_source === 'forecast' ? await forecast(studio.id) : null;
      if (f?.date) turnaround = { source: 'forecast', startDate: f.date, queueLength: f.queueLength };
      else if (page.turnaround_text) turnaround = { source: 'text', text: page.turnaround_text };
      return {
        name: studio.name,
        slug: studio.slug,
        intro: page.intro ?? studio.about ?? null,
        currency: summary?.currency ?? studio.currency,
        tiers: tiers.map((t) => ({ key: t.key, label: t.label, fromMinor: from.get(t.key) ?? null })),
        extras,
        turnaround,
        limits: { maxPhotos: ENQUIRY_MAX_PHOTOS, maxPhotoBytes: ENQUIRY_MAX_PHOTO_BYTES, maxFigures: ENQUIRY_MAX_FIGURES },
      };
    },

    /**
     * Runs before the upload is read: the page must be on, and one address gets a bounded number of
     * posts an hour whatever they contain, so nobody can make the server parse uploads without end.
     */
    async gate(slug: string, ip: string) {
      const { studio } = await openStudio(slug);
      const key = hash('try', ip);
      await throttle('try', key, TRIES_PER_HOUR);
      await repo.addAttempts([{ scope: 'try', key }], iso(clock.now()));
      return studio;
    },

    /**
     * A checked enquiry: the honeypot answers like a success and keeps nothing; otherwise at most
     * five enquiries an hour from one address and to one e-mail address.
     */
    async submit(studio: PublicStudioRow, ip: string, input: EnquiryInput, files: { buffer: Buffer }[]): Promise<EnquiryReceived> {
      const ipKey = hash('ip', ip);
      const emailKey = hash('email', input.email.toLowerCase());
      await throttle('ip', ipKey, ENQUIRIES_PER_HOUR);
      await throttle('email', emailKey, ENQUIRIES_PER_HOUR);
      if (input.website) {
        await repo.addAttempts([{ scope: 'ip', key: ipKey }, { scope: 'email', key: emailKey }], iso(clock.now()));
        return { received: true, message: `Thank you. ${studio.name} has your enquiry; a confirmation is on its way to ${input.email}.` };
      }
      const received = await deps.enquiries.submit(studio, input, files);
      await repo.addAttempts([{ scope: 'ip', key: ipKey }, { scope: 'email', key: emailKey }], iso(clock.now()));
      return received;
    },

    /** Counters older than a day are no use to any limit. */
    pruneAttempts: () => repo.pruneAttempts(iso(addMs(clock.now(), -24 * HOUR))),
  };
}

export type PublicStudioService = ReturnType<typeof publicStudioService>;
