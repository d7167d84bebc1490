/**
 * Load at a set rate, for latency at a given load: `connections` keep-alive connections, opened before the run,
 * and requests arriving at random (a Poisson stream at `rate` a second, seeded, so each run offers the same
 * arrivals) whether or not earlier ones were answered. A request that arrives while every connection is busy
 * waits for one, and its latency counts from when it arrived, not from when a connection took it: a
 * server that falls behind shows it in the tail instead of slowing the sender down (no coordinated omission).
 *
 * autocannon's own rate option sends each connection's share of a second in one burst at the top of the
 * second, all connections at once, which measures a saturated server forty times a minute; hence this.
 */
import http from 'node:http';
import { seededRandom } from '../../../shared/palette';

export type PacedResult = { offered: number; sent: number; answered: number; rps: number; p50: number; p99: number; max: number; errors: number; non2xx: number };

/** Nearest-rank percentile of sorted values. */
function percentile(sorted: number[], q: number) {
  return sorted.length ? sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))] : Number.NaN;
}

function get(agent: http.Agent, url: URL, headers: Record<string, string>) {
  return new Promise<number>((resolve, reject) => {
    const req = http.get(url, { agent, headers }, (res) => {
      res.on('data', () => {});
      res.on('end', () => resolve(res.statusCode ?? 0));
      res.on('error', reject);
    });
    req.on('error', reject);
    req.setTimeout(10_000, () => req.destroy(new Error('timed out')));
  });
}

export async function paced(target: string, opts: { rate: number; seconds: number; connections: number; headers?: Record<string, string>; seed?: number }): Promise<PacedResult> {
  const url = new URL(target);
  const headers = opts.headers ?? {};
  // fifo: hand each request to the connection idle longest, so all of them carry the load
  const agent = new http.Agent({ keepAlive: true, maxSockets: opts.connections, maxFreeSockets: opts.connections, scheduling: 'fifo' });
  try {
    // open every connection first (one request on each, all at once), so the run measures open connections
    await Promise.all(Array.from({ length: opts.connections }, () => get(agent, url, headers)));
    const random = seededRandom(opts.seed ?? 20261202); // the same arrivals every run
    const arrivals: number[] = [];
    for (let t = 0; ; ) {
      t += (-Math.log(1 - random()) / opts.rate) * 1000;
      if (t >= opts.seconds * 1000) break;
      arrivals.push(t);
    }
    const latencies: number[] = [];
    let errors = 0;
    let non2xx = 0;
    const start = performance.now();
    const pending: Promise<void>[] = [];
    await new Promise<void>((done) => {
      let next = 0;
      const tick = () => {
        const now = performance.now() - start;
        for (; next < arrivals.length && arrivals[next] <= now; next++) {
          const due = arrivals[next];
          pending.push(
            get(agent, url, headers).then(
              (status) => {
                latencies.push(performance.now() - start - due);
                if (status < 200 || status >= 300) non2xx++;
              },
              () => void errors++,
            ),
          );
        }
        if (next < arrivals.length) setTimeout(tick, Math.max(0, arrivals[next] - (performance.now() - start)));
        else done();
      };
      tick();
    });
    await Promise.all(pending);
    const took = (performance.now() - start) / 1000;
    latencies.sort((a, b) => a - b);
    return {
      offered: opts.rate,
      sent: arrivals.length,
      answered: latencies.length,
      rps: latencies.length / took,
      p50: Math.round(percentile(latencies, 0.5)),
      p99: Math.round(percentile(latencies, 0.99)),
      max: Math.round(latencies.at(-1) ?? Number.NaN),
      errors,
      non2xx,
    };
  } finally {
    agent.destroy();
  }
}
