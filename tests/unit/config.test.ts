import os from 'node:os';
import { describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';

describe('start-up settings from the environment', () => {
  it('serves from one process unless WORKERS asks for more; "auto" is one per core', () => {
    expect(loadConfig({}).workers).toBe(1);
    expect(loadConfig({ WORKERS: '3' }).workers).toBe(3);
    expect(loadConfig({ WORKERS: 'auto' }).workers).toBe(os.availableParallelism());
  });

  it('refuses a WORKERS that is not a whole number from 1 to 64, or "auto", naming the variable', () => {
    for (const bad of ['0', '65', '2.5', 'two', '-1']) expect(() => loadConfig({ WORKERS: bad }), bad).toThrow(/environment is not valid[\s\S]*WORKERS/);
  });

  it('refuses a payment key without its webhook secret', () => {
    expect(() => loadConfig({ STRIPE_SECRET_KEY: 'sk_test_x' })).toThrow(/STRIPE_WEBHOOK_SECRET is not/);
  });
});
