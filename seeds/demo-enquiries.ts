import crypto from 'node:crypto';
import sharp from 'sharp';
import { DAY, HOUR, iso } from '../server/lib/clock';
import { extensions, processPhoto } from '../server/lib/images/photos';
import { defaultPackingItems } from '../shared/schemas/shipments';
import type { DemoContext } from './demo';

type DemoEnquiry = {
  daysAgo: number;
  name: string;
  email: string;
  tier: string | null;
  extras: string[];
  dueInDays: number | null;
  budget: number | null;
  notes: string | null;
  figures: { name: string; quantity: number; sizeClass: string }[];
  status?: 'declined';
  photo?: [string, string];
};

/** Everyone here is invented (e-mails at demo.test), and so are their figures. */
const enquiries: DemoEnquiry[] = [
  {
    daysAgo: 1,
    name: 'Juniper Ostrowe',
    email: 'juniper.ostrowe@demo.test',
    tier: 'enhanced',
    extras: ['freehand'],
    dueInDays: 70,
    budget: 38000,
    notes: 'A lantern-carrying caravan for a narrative campaign. I would love a little freehand on the wagon canvas.',
    figures: [
      { name: 'Caravan guards', quantity: 6, sizeClass: '28' },
      { name: 'Mule-drawn wagon', quantity: 1, sizeClass: 'large' },
      { name: 'Caravan master', quantity: 1, sizeClass: '32' },
    ],
    photo: ['#7a5c3e', '#d9b26f'],
  },
  {
    daysAgo: 3,
    name: 'Tamsin Greave',
    email: 'tamsin.greave@demo.test',
    tier: 'display',
    extras: ['display-base', 'light-effects'],
    dueInDays: null,
    budget: null,
    notes: 'One centrepiece for the shelf: a moth queen. No rush at all.',
    figures: [{ name: 'Moth queen', quantity: 1, sizeClass: '60' }],
  },
  {
    daysAgo: 5,
    name: 'Rafe Culloden',
    email: 'rafe.culloden@demo.test',
    tier: 'tabletop',
    extras: [],
    dueInDays: 30,
    budget: 25000,
    notes: 'Tournament in five weeks; just need them battle-ready.',
    figures: [
      { name: 'Marsh spearmen', quantity: 20, sizeClass: '25' },
      { name: 'Standard bearer', quantity: 1, sizeClass: '25' },
    ],
  },
  {
    daysAgo: 12,
    name: 'Edda Lintwhite',
    email: 'edda.lintwhite@demo.test',
    tier: null,
    extras: [],
    dueInDays: 6,
    budget: 4000,
    notes: 'Forty figures by next week, please.',
    figures: [{ name: 'Skeleton horde', quantity: 40, sizeClass: '25' }],
    status: 'declined',
  },
];

/**
 * The demo studio's public page at /s/marrowgate, its shipping defaults, a few enquiries in the inbox
 * (one with a reference photo when the demo writes photos), and what arrived of one commission's models.
 */
export async function enquiriesDemo(ctx: DemoContext) {
  const { db, studioId } = ctx;
  const end = ctx.clock.now().getTime();
  const now = iso(ctx.clock.now());
  const studio = await db('studios').where({ id: studioId }).first('slug', 'currency', 'name');

  await db('studio_public_pages').insert({
    studio_id: studioId,
    enabled: true,
    intro: 'Two brushes in a converted bakery. We paint armies for the table and single figures for the shelf, and send photos every week while yours are on the bench.',
    turnaround_text: 'Our queue is usually six to ten weeks.',
    turnaround_source: 'forecast',
    updated_at: now,
  });
  await db('studio_shipping_settings').insert({ studio_id: studioId, auto_close_days: 21, from_country: 'DE', packing_items: JSON.stringify(defaultPackingItems), updated_at: now });

  for (const e of enquiries) {
    const at = iso(new Date(end - e.daysAgo * DAY - 3 * HOUR));
    const [row] = await db('enquiries')
      .insert({
        studio_id: studioId,
        status: e.status ?? 'new',
        name: e.name,
        email: e.email,
        tier: e.tier,
        extras: JSON.stringify(e.extras),
        due_date: e.dueInDays === null ? null : new Date(end + e.dueInDays * DAY).toISOString().slice(0, 10),
        budget_minor: e.budget,
        currency: studio.currency,
        notes: e.notes,
        consent_at: at,
        created_at: at,
        ...(e.status === 'declined'
          ? {
              decided_at: iso(new Date(end - (e.daysAgo - 1) * DAY)),
              decided_by: ctx.users.owner,
              decline_message: `Hello ${e.name},\n\nThank you for thinking of ${studio.name}. Forty figures in a week is more than our two brushes can do well, so we would rather say no now than let you down.\n\nWith best wishes,\nWren`,
            }
          : {}),
      })
      .returning('id');
    const enquiryId = typeof row === 'object' ? (row.id as number) : (row as number);
    await db('enquiry_figures').insert(e.figures.map((f, i) => ({ studio_id: studioId, enquiry_id: enquiryId, position: i + 1, name: f.name, quantity: f.quantity, size_class: f.sizeClass })));
    if (e.photo && ctx.photoStorage) {
      // A stand-in reference photo: two colour fields, processed like any upload.
      const [a, b] = e.photo;
      const left = await sharp({ create: { width: 400, height: 600, channels: 3, background: a } }).png().toBuffer();
      const input = await sharp({ create: { width: 800, height: 600, channels: 3, background: b } }).composite([{ input: left, left: 0, top: 0 }]).jpeg().toBuffer();
      const p = await processPhoto(input);
      const key = `${studioId}/${crypto.randomUUID()}`;
      for (const size of ['original', 'large', 'medium', 'thumb'] as const) {
        const staged = await ctx.photoStorage.stage(`${key}/${size}.${size === 'original' ? extensions[p.format] : 'webp'}`, p.files[size]);
        await staged.commit();
      }
      await db('enquiry_photos').insert({ studio_id: studioId, enquiry_id: enquiryId, storage_key: key, format: p.format, width: p.width, height: p.height, bytes: Object.values(p.files).reduce((n, f) => n + f.length, 0), created_at: at });
    }
  }

  // Priya's warband arrived by post: one goblin short and the troll's club snapped.
  const warband = await db('commissions').where({ studio_id: studioId, title: 'Bog-lantern goblin warband' }).first('id', 'created_at');
  if (warband) {
    await db('models_in').insert({
      studio_id: studioId,
      commission_id: warband.id,
      supplier: 'client_ships',
      expected_on: warband.created_at.slice(0, 10),
      received_on: iso(new Date(new Date(warband.created_at).getTime() + 3 * DAY)).slice(0, 10),
      carrier: 'Fenpost Parcels',
      tracking: 'FP-2291-0457',
      note: 'Box dented on one corner; sprues intact.',
      updated_by: ctx.users.owner,
      created_at: now,
      updated_at: now,
    });
    const figs = await db('figures').where({ studio_id: studioId, commission_id: warband.id }).orderBy('position').select('id', 'name', 'quantity');
    for (const f of figs) {
      const shortOne = f.quantity > 1;
      const broken = /troll/i.test(f.name);
      await db('models_in_figures').insert({
        studio_id: studioId,
        commission_id: warband.id,
        figure_id: f.id,
        received: shortOne ? f.quantity - 1 : f.quantity,
        damaged: broken,
        note: broken ? 'club snapped at the wrist' : shortOne ? 'one missing from the bag' : null,
      });
    }
  }
}
