import os from 'node:os';
import path from 'node:path';
import type { DestinationStream } from 'pino';
import { z } from 'zod';
import { systemClock, type Clock } from './lib/clock';

const bool = z
  .enum(['true', 'false', '1', '0', ''])
  .optional()
  .transform((v) => v === 'true' || v === '1');

/** Environment variables, parsed once at start-up; `.env.example` documents each. */
const envSchema = z.object({
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().default('127.0.0.1'),
  DATA_DIR: z.string().default('./data'),
  DATABASE_URL: z.string().optional(),
  PUBLIC_URL: z.string().url().optional(),
  SESSION_SECRET: z.string().min(16, 'SESSION_SECRET must be at least 16 characters').optional(),
  TRUST_PROXY: bool,
  SMTP_URL: z.string().optional(),
  MAIL_FROM: z.string().default('Sablework <no-reply@sablework.local>'),
  MAIL_CAPTURE_PORT: z.coerce.number().int().min(0).max(65535).default(0),
  DEMO: z.enum(['true', 'false', '1', '0', '']).optional(),
  BCRYPT_ROUNDS: z.coerce.number().int().min(4).max(15).default(12),
  STRIPE_SECRET_KEY: z.string().optional(),
  STRIPE_WEBHOOK_SECRET: z.string().optional(),
  PAYMENTS_FAKE_PORT: z.coerce.number().int().min(0).max(65535).default(0),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  WORKERS: z
    .union([z.literal('auto'), z.coerce.number().int('WORKERS must be a whole number or "auto"').min(1).max(64)])
    .default(1),
});

/**
 * What a worker process (WORKERS > 1) gets from the primary, which alone runs the migrations, the demo seed,
 * the background jobs and the start-up sweep of photo leftovers, and (when SMTP_URL or the payment keys are
 * unset) the local mail capture and payment fake that every worker then talks to.
 */
export type WorkerLink = {
  /** The primary's local mail capture (SMTP on 127.0.0.1), when it runs one: the worker shows /dev/mail too. */
  mailCapturePort?: number;
  /** The primary's local payment fake, when it runs one. */
  paymentsFake?: { host: string; port: number; secretKey: string; webhookSecret: string };
};

export type Config = {
  port: number;
  host: string;
  dataDir: string;
  databaseUrl?: string;
  /** The address people open, used in e-mailed links. */
  publicUrl: string;
  sessionSecret: string;
  trustProxy: boolean;
  /** When unset, a local capture SMTP server is started and `/dev/mail` shows what it caught. */
  smtpUrl?: string;
  mailFrom: string;
  mailCapturePort: number;
  /** Load the demo scenario into an empty database and show demo hints. */
  demo: boolean;
  /** The payment service's secret key; unset, a local fake of the service starts with its own checkout page. */
  stripeSecretKey?: string;
  stripeWebhookSecret?: string;
  paymentsFakePort: number;
  bcryptRounds: number;
  logLevel: string;
  /** Where log lines go (standard output when unset); tests collect them. */
  logDestination?: DestinationStream;
  clock: Clock;
  /** Serve the built client from dist/ (off in API tests). */
  serveClient: boolean;
  /** Run background jobs on timers (tests call them directly instead). */
  runJobs: boolean;
  /** Stages the in-memory forecast cache may hold across studios (default 200,000, about 60 MB); 0 turns it off. */
  forecastCacheStages?: number;
  /** Rows (figures) the in-memory bench board cache may hold across studios and queries (default 50,000); 0 turns it off. */
  boardCacheRows?: number;
  /** Rows (commissions) the in-memory commission list cache may hold across studios and queries (default 20,000); 0 turns it off. */
  commissionListCacheRows?: number;
  /** Rows the in-memory books cache (earnings, actuals, the owner's home) may hold per store (default 20,000); 0 turns it off. */
  booksCacheRows?: number;
  /** Rows the in-memory caches of the paint rack, the recipe list and the invoices (list and CSV pages) may hold, each (default 20,000); 0 turns them off. */
  listsCacheRows?: number;
  /** Processes serving HTTP on the port (WORKERS; "auto": one per core). 1: this process serves it alone. */
  workers: number;
  /** Set in a worker process of several (server/lib/workers.ts): what the primary runs for it. */
  worker?: WorkerLink;
};

export const DEMO_PASSWORD = 'paint-the-bench';

export function loadConfig(env: NodeJS.ProcessEnv = process.env, overrides: Partial<Config> = {}): Config {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`).join('\n');
    throw new Error(`Sablework cannot start: the environment is not valid.\n${lines}`);
  }
  const e = parsed.data;
  if (e.STRIPE_SECRET_KEY && !e.STRIPE_WEBHOOK_SECRET) {
    throw new Error('Sablework cannot start: STRIPE_SECRET_KEY is set but STRIPE_WEBHOOK_SECRET is not. Set both, or neither to use the local payment fake.');
  }
  const port = e.PORT;
  return {
    port,
    host: e.HOST,
    dataDir: path.resolve(e.DATA_DIR),
    databaseUrl: e.DATABASE_URL,
    publicUrl: (e.PUBLIC_URL ?? `http://localhost:${port}`).replace(/\/$/, ''),
    sessionSecret: e.SESSION_SECRET ?? 'local-development-secret-change-me',
    trustProxy: e.TRUST_PROXY,
    smtpUrl: e.SMTP_URL || undefined,
    mailFrom: e.MAIL_FROM,
    mailCapturePort: e.MAIL_CAPTURE_PORT,
    demo: e.DEMO === undefined || e.DEMO === '' ? !e.SMTP_URL : e.DEMO === 'true' || e.DEMO === '1',
    stripeSecretKey: e.STRIPE_SECRET_KEY || undefined,
    stripeWebhookSecret: e.STRIPE_WEBHOOK_SECRET || undefined,
    paymentsFakePort: e.PAYMENTS_FAKE_PORT,
    bcryptRounds: e.BCRYPT_ROUNDS,
    logLevel: e.LOG_LEVEL,
    workers: e.WORKERS === 'auto' ? os.availableParallelism() : e.WORKERS,
    clock: systemClock,
    serveClient: true,
    runJobs: true,
    ...overrides,
  };
}
