import { DAY, HOUR, type Clock } from '../server/lib/clock';
import { activityRepository } from '../server/features/activity/activity.repository';
import { activityService } from '../server/features/activity/activity.service';
import { commissionsRepository } from '../server/features/commissions/commissions.repository';
import { commissionsService } from '../server/features/commissions/commissions.service';
import { figuresRepository } from '../server/features/figures/figures.repository';
import { figuresService, type Actor } from '../server/features/figures/figures.service';
import { studioSetupRepository } from '../server/features/studio-setup/studio-setup.repository';
import { studioSetupService } from '../server/features/studio-setup/studio-setup.service';
import { timeRepository } from '../server/features/time/time.repository';
import { timeService } from '../server/features/time/time.service';
import type { CommissionStatus } from '../shared/commission-lifecycle';
import type { FigureInput } from '../shared/schemas/commissions';
import type { DemoContext } from './demo';

const MINUTE = 60_000;

/**
 * The demo studio's commissions: every state of the lifecycle, figures part-way through their stages,
 * time logged on the done stages, one timer still running and one figure drying after priming.
 * Everything is invented. The story runs through the real services on a clock of its own that walks
 * forward from six weeks ago to the demo's "now", so the activity log reads like a real one.
 */
export async function commissionsDemo(ctx: DemoContext) {
  const { db, studioId, users, clients } = ctx;
  const end = ctx.clock.now().getTime();
  let t = end - 42 * DAY;
  const clock: Clock = { now: () => new Date(t) };
  /** Sets the story's clock to `days` before the end (each commission's own story runs forward). */
  const on = (days: number, hours = 0) => {
    t = end - days * DAY + hours * HOUR;
  };
  const pass = (minutes: number) => {
    t += minutes * MINUTE;
  };

  const setup = studioSetupService({ db, repo: studioSetupRepository(db) });
  const activity = activityService({ repo: activityRepository(db), clock });
  const figures = figuresService({ db, repo: figuresRepository(db), setup, activity, clock });
  const commissions = commissionsService({ db, repo: commissionsRepository(db), figures, activity, clock });
  const time = timeService({ db, repo: timeRepository(db), figures, activity, clock });

  const owner: Actor = { studioId, role: 'owner', clientId: null, userId: users.owner };
  const painter: Actor = { studioId, role: 'painter', clientId: null, userId: users.painter };
  const asClient = (clientId: number, userId: number): Actor => ({ studioId, role: 'client', clientId, userId });

  const create = (clientId: number, title: string, brief: string, figs: FigureInput[], extra: { dueInDays?: number; priority?: 'low' | 'normal' | 'high' } = {}) =>
    commissions.create(owner, {
      clientId,
      title,
      brief,
      figures: figs,
      priority: extra.priority,
      dueDate: extra.dueInDays === undefined ? undefined : new Date(end + extra.dueInDays * DAY).toISOString().slice(0, 10),
    });
  const move = async (id: number, ...to: CommissionStatus[]) => {
    for (const s of to) {
      pass(20);
      await commissions.transition(owner, id, { to: s, reason: s === 'cancelled' ? 'The client found the models miscast and will order them again.' : undefined });
    }
  };
  /**
   * Works a figure until its first `count` stages are done: time logged (a batch goes a little faster
   * than the estimate), then marked done; `skip` stage keys are skipped instead.
   */
  const work = async (who: Actor, figureId: number, count: number, opts: { pace?: number; skip?: string[]; timer?: boolean } = {}) => {
    const f = await figures.view(studioId, figureId);
    for (const s of f.stages.slice(0, count)) {
      if (s.status === 'done' || s.status === 'skipped') continue;
      if (opts.skip?.includes(s.key)) {
        await figures.updateStage(who, s.id, { status: 'skipped' });
        continue;
      }
      const hours = Math.min(24, Math.max(0.1, Math.round(s.estimateHours * (opts.pace ?? 0.9) * 4) / 4));
      if (opts.timer) {
        await time.start(who, s.id);
        pass(Math.round(hours * 60));
        await time.stop(who);
      } else {
        pass(Math.round(hours * 60));
        await time.addManual(who, s.id, { hours, note: undefined });
      }
      await figures.updateStage(who, s.id, { status: 'done' });
      pass(30);
    }
  };

  // 1. Priya's goblin warband: on the bench, the batch in basecoat with the timer running.
  on(40);
  const warband = await create(
    clients.client,
    'Bog-lantern goblin warband',
    'A warband for the table: twelve goblins, their shaman and a fen troll. Lanterns should read from across the table.',
    [
      { name: 'Bog-lantern goblins', quantity: 12, sizeClass: '25', tier: 'tabletop', extras: ['magnetising'], subAssemblies: [], painterId: users.painter },
      {
        name: 'Mire shaman',
        quantity: 1,
        sizeClass: '32',
        tier: 'enhanced',
        extras: ['freehand', 'light-effects'],
        subAssemblies: ['staff lantern'],
        lightSource: 'The lantern in the left hand: warm light from below left.',
        painterId: users.painter,
      },
      { name: 'Fen troll', quantity: 1, sizeClass: 'large', footprint: '60 × 90 mm', tier: 'display', extras: ['assembly'], subAssemblies: ['troll', 'lantern pole', 'base'], lightSource: 'From the lantern pole, above right.', painterId: users.owner },
    ],
    { dueInDays: 35, priority: 'high' },
  );
  on(39);
  await commissions.setSchemeNotes(asClient(clients.client, users.client), warband.id, {
    schemeNotes: 'Muted moss greens and warm bone; the lanterns a sickly teal glow. No bright reds, please.',
  });
  await move(warband.id, 'quoted');
  on(36);
  await move(warband.id, 'booked');
  on(20);
  await move(warband.id, 'on_bench');
  const [goblins, shaman, troll] = warband.figures;
  on(19);
  await work(painter, goblins.id, 3, { pace: 0.8, timer: true });
  on(15);
  await work(painter, shaman.id, 6);
  on(10);
  await work(owner, troll.id, 2);

  // 2. Otto's tournament militia: booked, due soon, not started.
  on(30);
  const militia = await create(
    clients.client2,
    'Saltmarsh militia for the spring tournament',
    'Twenty spearmen and a banner bearer, painted to a clean tabletop standard. Needed before the tournament.',
    [
      { name: 'Saltmarsh spearmen', quantity: 20, sizeClass: '28', tier: 'tabletop', extras: [], subAssemblies: [], painterId: users.painter },
      { name: 'Tidecaller banner bearer', quantity: 1, sizeClass: '28', tier: 'tabletop', extras: ['freehand'], subAssemblies: ['banner'], painterId: users.painter },
    ],
    { dueInDays: 21 },
  );
  await move(militia.id, 'quoted');
  on(27);
  await move(militia.id, 'booked');

  // 3. Otto's war-sledge: every stage done (no weathering wanted), ready to ship.
  on(34);
  const sledge = await create(
    clients.client2,
    'Driftwood war-sledge',
    'One large sledge model with its crew, magnetised so the crew can be swapped.',
    [{ name: 'Driftwood war-sledge', quantity: 1, sizeClass: 'large', footprint: '180 × 110 mm', tier: 'enhanced', extras: ['magnetising'], subAssemblies: ['sledge', 'crew', 'sail'], painterId: users.painter }],
    { dueInDays: 3 },
  );
  await move(sledge.id, 'quoted', 'booked');
  on(25);
  await move(sledge.id, 'on_bench');
  await work(painter, sledge.figures[0].id, 11, { pace: 1.1, skip: ['weathering'] });
  on(4);
  await move(sledge.id, 'ready_to_ship');

  // 4. Otto's gull riders: put on hold from the bench at the client's request.
  on(28);
  const riders = await create(
    clients.client2,
    'Gull-rider skirmishers',
    'Five riders on gulls; riders and mounts painted apart so the light stays consistent.',
    [
      {
        name: 'Gull riders',
        quantity: 5,
        sizeClass: '40',
        tier: 'tabletop',
        extras: ['magnetising'],
        subAssemblies: ['rider', 'gull', 'base'],
        lightSource: 'Sky light from straight above; keep riders and gulls the same.',
        painterId: users.painter,
      },
    ],
  );
  await move(riders.id, 'quoted', 'booked');
  on(18);
  await move(riders.id, 'on_bench');
  await work(painter, riders.figures[0].id, 4);
  on(12);
  await move(riders.id, 'on_hold');

  // 5. Priya's enquiry; 6. Mara's quoted bust.
  on(6);
  await create(clients.client, 'Heron-knight of the Reedmarch', 'A single display piece for the shelf; open to ideas for the base.', [
    { name: 'Heron-knight', quantity: 1, sizeClass: '40', tier: 'display', extras: ['display-base', 'nmm'], subAssemblies: ['knight', 'heron mount'] },
  ]);
  on(9);
  const bust = await create(clients.walkIn, 'Lichen golem bust', 'A bust for a painting competition entry.', [
    { name: 'Lichen golem bust', quantity: 1, sizeClass: 'large', footprint: '70 × 70 mm plinth', tier: 'display', extras: ['display-base'], subAssemblies: [] },
  ]);
  await move(bust.id, 'quoted');

  // 7. Priya's hermit: shipped and closed. 8. Mara's moth swarm: cancelled before work began.
  on(42);
  const hermit = await create(clients.client, 'Candlewick hermit', 'A small gift piece.', [
    { name: 'Candlewick hermit', quantity: 1, sizeClass: '28', tier: 'enhanced', extras: ['light-effects'], subAssemblies: [], lightSource: 'The candle on the staff, warm, from above left.', painterId: users.owner },
  ]);
  await move(hermit.id, 'quoted', 'booked', 'on_bench');
  await work(owner, hermit.figures[0].id, 11, { skip: ['assembly'] });
  await move(hermit.id, 'ready_to_ship', 'shipped');
  on(36);
  await move(hermit.id, 'closed');
  on(14);
  const moths = await create(clients.walkIn, 'Ash-moth swarm', 'Eight flying moths on clear stands.', [
    { name: 'Ash-moths', quantity: 8, sizeClass: '25', tier: 'tabletop', extras: [], subAssemblies: [] },
  ]);
  await move(moths.id, 'cancelled');

  // Today: the troll was primed an hour ago and is drying; the painter's timer runs on the goblins' basecoat.
  on(0, -1.5);
  await work(owner, troll.id, 3);
  t = Math.max(t, end - 25 * MINUTE);
  const basecoat = (await figures.view(studioId, goblins.id)).stages.find((s) => s.key === 'basecoat');
  if (basecoat && t < end) await time.start(painter, basecoat.id);
}
