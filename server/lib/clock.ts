/** Every expiry and scheduled job reads time from here, so tests move time instead of waiting. */
export type Clock = { now(): Date };

export const systemClock: Clock = { now: () => new Date() };

/** A clock tests can move: `clock.advance(60 * 60_000)`. */
export function manualClock(start: Date | string = '2026-03-02T09:00:00.000Z') {
  let t = new Date(start).getTime();
  return {
    now: () => new Date(t),
    advance(ms: number) {
      t += ms;
    },
    set(d: Date | string) {
      t = new Date(d).getTime();
    },
  };
}

export const iso = (d: Date) => d.toISOString();
export const addMs = (d: Date, ms: number) => new Date(d.getTime() + ms);
export const HOUR = 60 * 60_000;
export const DAY = 24 * HOUR;
