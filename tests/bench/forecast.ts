// npm run bench:forecast — times the capacity forecast on a large invented studio.
// 300 commissions × 10 figures × 11 stages, 4 painters with different hours and days off, in a zone with
// daylight-saving changes. Aim: under 150 ms; doubling the queue should about double the time.
import { forecast, type CommissionWork, type ForecastInput, type PainterCapacity } from '../../shared/schedule';
import { addDays } from '../../shared/dates';
// mulberry32, fixed seeds: every run books the same queue
import { seededRandom as rng } from '../../shared/palette';

const AIM_MS = 150;
const WARMUP = 3;
const RUNS = 15;

const START = '2026-03-02'; // a Monday; the queue runs across several clock changes in Berlin

function painters(rand: () => number): PainterCapacity[] {
  const daysOff = (n: number) =>
    Array.from({ length: n }, () => addDays(START, Math.floor(rand() * 365 * 4))).sort();
  const span = (start: string, end: string) => [{ start, end }];
  return [
    {
      id: 'p1',
      hours: Object.fromEntries(
        [1, 2, 3, 4, 5].map((d) => [d, [{ start: '09:00', end: '12:30' }, { start: '13:30', end: '17:30' }]]),
      ),
      daysOff: daysOff(80),
    },
    { id: 'p2', hours: Object.fromEntries([2, 3, 4, 5, 6].map((d) => [d, span('10:00', '16:00')])), daysOff: daysOff(60) },
    {
      id: 'p3',
      hours: { 1: span('18:00', '22:00'), 3: span('18:00', '22:00'), 5: span('18:00', '22:00'), 6: span('09:00', '13:00') },
      daysOff: daysOff(40),
    },
    { id: 'p4', hours: Object.fromEntries([1, 2, 3, 4].map((d) => [d, span('08:00', '14:00')])), daysOff: daysOff(50) },
  ];
}

// [stage, min h, max h, wait after h]
const STAGES: Array<[string, number, number, number]> = [
  ['prep', 0.1, 0.4, 0],
  ['assembly', 0, 0.5, 1],
  ['prime', 0.1, 0.2, 12],
  ['basecoat', 0.3, 1, 0],
  ['shade', 0.1, 0.3, 1],
  ['layer', 0.5, 2, 0],
  ['glaze', 0.2, 0.6, 0.5],
  ['details', 0.3, 1, 0],
  ['basing', 0.2, 0.6, 4],
  ['weathering', 0, 0.4, 0],
  ['varnish', 0.1, 0.2, 24],
];

function queue(rand: () => number, commissions: number, offset = 0): CommissionWork[] {
  const ids = ['p1', 'p2', 'p3', 'p4'];
  return Array.from({ length: commissions }, (_, ci) => {
    const c = ci + offset;
    return {
      id: `c${c}`,
      dueDate: addDays(START, 14 + Math.floor(c * 2.5)),
      figures: Array.from({ length: 10 }, (_, fi) => ({
        id: `c${c}-f${fi}`,
        painterId: rand() < 0.3 ? null : ids[Math.floor(rand() * ids.length)],
        stages: STAGES.map(([name, lo, hi, wait], si) => ({
          id: `c${c}-f${fi}-${name}`,
          // the first few commissions are already on the bench: early stages done
          remainingHours: c < 5 && si < 3 ? 0 : Math.round((lo + rand() * (hi - lo)) * 60) / 60,
          waitHoursAfter: wait,
        })),
      })),
    };
  });
}

type Result = ReturnType<typeof forecast>;
interface Timing {
  median: number;
  min: number;
  cold: number;
  result: Result;
}

// Runs the inputs alternately, so load from other work on the machine falls on each about equally.
function timeAll(inputs: ForecastInput[]): Timing[] {
  const cold: number[] = [];
  const results: Result[] = [];
  for (const input of inputs) {
    const t0 = performance.now();
    results.push(forecast(input));
    cold.push(performance.now() - t0);
  }
  for (let i = 0; i < WARMUP; i++) for (const input of inputs) forecast(input);
  const times: number[][] = inputs.map(() => []);
  for (let i = 0; i < RUNS; i++) {
    inputs.forEach((input, k) => {
      const t0 = performance.now();
      results[k] = forecast(input);
      times[k].push(performance.now() - t0);
    });
  }
  return times.map((t, k) => {
    t.sort((a, b) => a - b);
    return { median: t[Math.floor(t.length / 2)], min: t[0], cold: cold[k], result: results[k] };
  });
}

function describe(label: string, input: ForecastInput, r: Timing): void {
  const cs = r.result.commissions;
  const blocks = cs.reduce((n, c) => n + c.figures.reduce((m, f) => m + f.blocks.length, 0), 0);
  const unscheduled = cs.filter((c) => c.finish === null).length;
  const stages = input.queue.reduce((n, c) => n + c.figures.reduce((m, f) => m + f.stages.length, 0), 0);
  console.log(
    `${label}: ${cs.length} commissions, ${stages} stages, ${blocks} work blocks, ` +
      `last finish ${cs[cs.length - 1].finishDate}, late ${cs.filter((c) => c.late).length}, unscheduled ${unscheduled}`,
  );
  console.log(
    `  median of ${RUNS} runs after ${WARMUP} warm-up: ${r.median.toFixed(1)} ms ` +
      `(fastest ${r.min.toFixed(1)} ms; first, cold call ${r.cold.toFixed(1)} ms)`,
  );
  if (unscheduled > 0) throw new Error('bench data should all fit in the horizon');
}

const rand = rng(20260302);
const team = painters(rand);
const base: ForecastInput = {
  timeZone: 'Europe/Berlin',
  now: '2026-03-02T07:30:00Z',
  painters: team,
  closedDays: ['2026-04-03', '2026-04-06', '2026-05-01', '2026-12-25', '2026-12-26', '2027-01-01'],
  queue: queue(rand, 300),
};
const doubled: ForecastInput = { ...base, queue: [...base.queue, ...queue(rng(7), 300, 300)] };

const [one, two] = timeAll([base, doubled]);
describe('300 × 10 × 11', base, one);
console.log(`  aim: < ${AIM_MS} ms — ${one.median < AIM_MS ? 'met' : 'NOT met'}`);
describe('600 × 10 × 11', doubled, two);
console.log(
  `  ratio doubled / single: ${(two.median / one.median).toFixed(2)} by median, ` +
    `${(two.min / one.min).toFixed(2)} by fastest (should stay near 2)`,
);
