import sharp from 'sharp';
import { DAY, HOUR, type Clock } from '../server/lib/clock';
import type { Member } from '../server/lib/policy';
import { createLimiter } from '../server/lib/upload';
import { approvalsRepository } from '../server/features/approvals/approvals.repository';
import { approvalsService } from '../server/features/approvals/approvals.service';
import { commentsRepository } from '../server/features/comments/comments.repository';
import { commentsService } from '../server/features/comments/comments.service';
import type { NoticesService } from '../server/features/notices/notices.service';
import { photosRepository } from '../server/features/photos/photos.repository';
import { photosService } from '../server/features/photos/photos.service';
import type { PhotoKind } from '../shared/schemas/photos';
import type { DemoContext } from './demo';

/** A painted-figure-like picture drawn by code: a backdrop, a base, a body, a head and a glow. Not a photograph. */
async function scene(p: { backdrop: [string, string]; base: string; body: string; trim: string; glow?: string; bare?: boolean; turn?: number }) {
  const paint = p.bare ? '#8d8d8a' : p.body; // as received: grey plastic
  // Drawn on a 1600 × 1200 canvas, rendered at 1024 × 768: enough for the gallery, quick to seed.
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="1024" height="768" viewBox="0 0 1600 1200">
    <defs>
      <linearGradient id="bg" x1="0" y1="0" x2="0" y2="1"><stop offset="0" stop-color="${p.backdrop[0]}"/><stop offset="1" stop-color="${p.backdrop[1]}"/></linearGradient>
      <radialGradient id="body" cx="0.35" cy="0.3" r="0.9"><stop offset="0" stop-color="#ffffff" stop-opacity="0.35"/><stop offset="0.5" stop-color="${paint}"/><stop offset="1" stop-color="#000000" stop-opacity="0.6"/></radialGradient>
      <radialGradient id="glow" cx="0.5" cy="0.5" r="0.5"><stop offset="0" stop-color="${p.glow ?? '#000'}" stop-opacity="0.9"/><stop offset="1" stop-color="${p.glow ?? '#000'}" stop-opacity="0"/></radialGradient>
    </defs>
    <rect width="100%" height="100%" fill="url(#bg)"/>
    <g transform="rotate(${p.turn ?? 0} 800 700)">
      <ellipse cx="800" cy="1010" rx="330" ry="70" fill="${p.bare ? '#5f5f5c' : p.base}"/>
      <path d="M560 1000 Q600 560 800 520 Q1000 560 1040 1000 Z" fill="url(#body)"/>
      <circle cx="800" cy="430" r="120" fill="url(#body)"/>
      <path d="M600 760 Q800 700 1000 760" stroke="${p.bare ? '#777' : p.trim}" stroke-width="28" fill="none"/>
      ${p.glow && !p.bare ? '<circle cx="1080" cy="640" r="170" fill="url(#glow)"/><circle cx="1080" cy="640" r="34" fill="#f4fbe8"/>' : ''}
    </g>
  </svg>`;
  return sharp(Buffer.from(svg)).jpeg({ quality: 88 }).toBuffer();
}

const quiet: NoticesService = { notify: async () => 0, kick: () => undefined, commissionUrl: () => '' };

/**
 * Photos, comments and approvals on the demo commissions (see demo-commissions.ts): condition photos as
 * the models arrived, the client's reference photo, progress photos (some shared), the scheme approved
 * after one round of changes, a test figure waiting for the client, the finished sledge approved, and a
 * short thread on each. No e-mails are queued for the story.
 */
export async function photosDemo(ctx: DemoContext) {
  const { db, studioId, users, clients } = ctx;
  if (!ctx.photoStorage) return;
  const end = ctx.clock.now().getTime();
  let t = end;
  const clock: Clock = { now: () => new Date(t) };
  const on = (days: number, hours = 0) => {
    t = end - days * DAY + hours * HOUR;
  };

  const photos = photosService({ db, repo: photosRepository(db), storage: ctx.photoStorage, limiter: createLimiter(1), notices: quiet, clock });
  const comments = commentsService({ db, repo: commentsRepository(db), notices: quiet, clock });
  // The finished sledge is already ready to ship in the story, so no move is asked of the lifecycle.
  const approvals = approvalsService({ db, repo: approvalsRepository(db), notices: quiet, clock, finishCommission: async () => undefined });

  const names = Object.fromEntries((await db('users').whereIn('id', Object.values(users)).select('id', 'name')).map((u) => [u.id, u.name as string]));
  const person = (id: number) => ({ id, name: names[id] });
  const team = (role: 'owner' | 'painter'): Member => ({ studioId, role, clientId: null });
  const client = (clientId: number): Member => ({ studioId, role: 'client', clientId });
  const find = (title: string) => db('commissions').where({ studio_id: studioId, title }).first('id');
  const figureOf = (commissionId: number, name: string) => db('figures').where({ studio_id: studioId, commission_id: commissionId, name }).first('id');
  const stageOf = (figureId: number, key: string) => db('stages').where({ studio_id: studioId, figure_id: figureId, template_key: key }).first('id');
  const add = async (m: Member, who: number, commissionId: number, kind: PhotoKind, pictures: Buffer[], extra: { caption?: string; shared?: boolean; figureId?: number; stageId?: number } = {}) =>
    photos.upload(m, person(who), commissionId, { kind, caption: extra.caption, shared: extra.shared ?? false, figureId: extra.figureId, stageId: extra.stageId }, pictures.map((buffer) => ({ buffer })));

  const goblin = { backdrop: ['#3b4a3f', '#171d18'] as [string, string], base: '#4a3b2c', body: '#5f7a3a', trim: '#d9ccb0', glow: '#7fe0c8' };

  // Priya's goblin warband, on the bench.
  const warband = await find('Bog-lantern goblin warband');
  if (warband) {
    const goblins = await figureOf(warband.id, 'Bog-lantern goblins');
    const shaman = await figureOf(warband.id, 'Mire shaman');
    on(37);
    await add(team('owner'), users.owner, warband.id, 'condition', [await scene({ ...goblin, bare: true })], {
      caption: 'The box as it arrived: sprues complete, one lantern bent.',
    });
    on(38, 2);
    await add(client(clients.client), users.client, warband.id, 'reference', [await scene({ backdrop: ['#6d7f5a', '#2f3a26'], base: '#3d3326', body: '#7d8f4e', trim: '#e6dcc2', glow: '#88e6d0' })], {
      caption: 'The moss and bone I have in mind.',
    });
    on(38, 4);
    await comments.create(client(clients.client), person(users.client), warband.id, { body: 'I added a reference photo. Could the lanterns glow a little sickly, more teal than yellow?' });
    on(38, 6);
    await comments.create(team('painter'), person(users.painter), warband.id, { body: 'Teal it is. I will paint one goblin as a test figure before the batch.' });
    on(17);
    const scheme = await approvals.request(team('painter'), person(users.painter), warband.id, { subject: 'scheme', note: 'Moss greens, warm bone, teal lantern glow; see the progress photos.' });
    if (goblins) {
      const basecoat = await stageOf(goblins.id, 'basecoat');
      await add(team('painter'), users.painter, warband.id, 'progress', [await scene(goblin)], {
        caption: 'Basecoats on the first six goblins.',
        shared: true,
        figureId: goblins.id,
        stageId: basecoat?.id,
      });
    }
    on(16);
    await approvals.requestChanges(client(clients.client), person(users.client), scheme.id, { comment: 'Lovely greens; the bone reads a bit yellow. Warmer and paler, please.' });
    on(14);
    const again = await approvals.request(team('painter'), person(users.painter), warband.id, { subject: 'scheme', note: 'Bone warmed and lifted.' });
    on(13, 3);
    await approvals.approve(client(clients.client), person(users.client), again.id, { comment: 'Perfect, go ahead.' });
    on(8);
    if (shaman) {
      await add(team('painter'), users.painter, warband.id, 'progress', [await scene({ ...goblin, body: '#4f6b45', trim: '#cfc4a6', turn: -4 })], {
        caption: 'The shaman with his lantern lit.',
        shared: true,
        figureId: shaman.id,
      });
      // Not shared yet: the painter keeps a work-in-progress shot to himself.
      await add(team('painter'), users.painter, warband.id, 'progress', [await scene({ ...goblin, body: '#56703f', glow: undefined })], { caption: 'Glaze test, not for the client yet.', figureId: shaman.id });
    }
    on(2);
    await approvals.request(team('painter'), person(users.painter), warband.id, { subject: 'test-figure', note: 'The first finished goblin, before I paint the other eleven.' });
  }

  // Otto's war-sledge, ready to ship: the finished work approved, a packing photo for the studio.
  const sledge = await find('Driftwood war-sledge');
  if (sledge) {
    const driftwood = { backdrop: ['#8fa3b3', '#3e4c57'] as [string, string], base: '#6b5a45', body: '#8a6f4e', trim: '#b9c7cf' };
    on(5);
    await add(team('painter'), users.painter, sledge.id, 'progress', [await scene(driftwood), await scene({ ...driftwood, turn: 10 })], {
      caption: 'Finished: sledge, crew and sail.',
      shared: true,
    });
    const finished = await approvals.request(team('owner'), person(users.owner), sledge.id, { subject: 'finished', note: 'All done; the crew lifts off the magnets.' });
    on(4, 2);
    await approvals.approve(client(clients.client2), person(users.client2), finished.id, { comment: 'Superb. Ship it!' });
    on(3);
    await add(team('owner'), users.owner, sledge.id, 'packing', [await scene({ ...driftwood, backdrop: ['#d8cfc0', '#a89a85'] })], { caption: 'Wrapped on steel sheet in foam.' });
  }

  // Otto's gull riders, on hold.
  const riders = await find('Gull-rider skirmishers');
  if (riders) {
    on(12, 1);
    await comments.create(client(clients.client2), person(users.client2), riders.id, { body: 'The tournament moved to spring, so please pause the riders for now.' });
    on(12, 3);
    await comments.create(team('owner'), person(users.owner), riders.id, { body: 'Paused. Your place in the queue is kept; tell us when to go on.' });
  }
}
