import { describe, expect, it } from 'vitest';
import { AppError } from '../../server/lib/errors';
import { createLimiter } from '../../server/lib/upload';

// The upload concurrency limit: photos beyond the limit wait their turn instead of decoding at once.
describe('upload concurrency limit', () => {
  const gate = () => {
    let open!: () => void;
    const p = new Promise<void>((r) => (open = r));
    return { p, open };
  };

  it('runs at most N jobs at once, the rest in arrival order', async () => {
    const limiter = createLimiter(2);
    let running = 0;
    let most = 0;
    const order: number[] = [];
    const gates = Array.from({ length: 5 }, gate);
    const jobs = gates.map((g, i) =>
      limiter.run(async () => {
        running++;
        most = Math.max(most, running);
        order.push(i);
        await g.p;
        running--;
        return i;
      }),
    );
    await Promise.resolve();
    expect(limiter.active).toBe(2);
    expect(limiter.waiting).toBe(3);
    for (const g of gates) {
      g.open();
      await new Promise((r) => setTimeout(r, 0));
    }
    expect(await Promise.all(jobs)).toEqual([0, 1, 2, 3, 4]);
    expect(most).toBe(2);
    expect(order).toEqual([0, 1, 2, 3, 4]);
    expect(limiter.active).toBe(0);
  });

  it('a failing job frees its place', async () => {
    const limiter = createLimiter(1);
    await expect(limiter.run(async () => Promise.reject(new Error('broken photo')))).rejects.toThrow('broken photo');
    expect(await limiter.run(async () => 'next')).toBe('next');
    expect(limiter.active).toBe(0);
  });

  it('refuses with 429 when the queue is full', async () => {
    const limiter = createLimiter(1, 1);
    const g = gate();
    const first = limiter.run(() => g.p);
    const second = limiter.run(async () => 'queued');
    const third = limiter.run(async () => 'refused');
    await expect(third).rejects.toBeInstanceOf(AppError);
    await expect(third).rejects.toMatchObject({ status: 429 });
    g.open();
    await first;
    expect(await second).toBe('queued');
  });
});
