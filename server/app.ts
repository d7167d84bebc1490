import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import express, { type ErrorRequestHandler, type RequestHandler } from 'express';
import session from 'express-session';
import helmet from 'helmet';
import { Passport } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import pino from 'pino';
import type { Config } from './config';
import { DEMO_PASSWORD } from './config';
import { migrate, openDb } from './lib/db';
import { AppError, errors } from './lib/errors';
import { createMailer } from './lib/mail/mailer';
import { allowFactory, type AuthUser } from './lib/policy';
import { listRoutes, routeTable } from './lib/routes';
import { requestLog, requestSerializer } from './lib/request-log';
import { createSessionStore } from './lib/session-store';
import { accountRef, LOGGED_REFUSALS, REDACTED, requester } from './lib/security-log';
import { safeEqual } from './lib/tokens';
import { startMailCapture } from './fakes/mail-capture';
import { startPaymentsFake } from './fakes/payments-fake';
import { createPayments } from './lib/payments/index';
import { authRepository, toUser } from './features/auth/auth.repository';
import { authRoutes } from './features/auth/auth.routes';
import { authService } from './features/auth/auth.service';
import { clientsRepository } from './features/clients/clients.repository';
import { clientsRoutes } from './features/clients/clients.routes';
import { clientsService } from './features/clients/clients.service';
import { devMailRouter } from './features/dev-mail/dev-mail.routes';
import { invitationsRepository } from './features/invitations/invitations.repository';
import { invitationsService } from './features/invitations/invitations.service';
import { metaRoutes } from './features/meta/meta.routes';
import { studiosRepository } from './features/studios/studios.repository';
import { studiosRoutes } from './features/studios/studios.routes';
import { studiosService } from './features/studios/studios.service';
import { approvalsRepository } from './features/approvals/approvals.repository';
import { approvalsRoutes } from './features/approvals/approvals.routes';
import { approvalsService } from './features/approvals/approvals.service';
import { commentsRepository } from './features/comments/comments.repository';
import { commentsRoutes } from './features/comments/comments.routes';
import { commentsService } from './features/comments/comments.service';
import { noticesRepository } from './features/notices/notices.repository';
import { noticesService } from './features/notices/notices.service';
import { photosRepository } from './features/photos/photos.repository';
import { photosRoutes } from './features/photos/photos.routes';
import { photosService } from './features/photos/photos.service';
import { tuneSharpForUploads } from './lib/images/photos';
import { localDiskStorage } from './lib/storage/local-disk';
import { createLimiter } from './lib/upload';
import { activityRepository } from './features/activity/activity.repository';
import { activityService } from './features/activity/activity.service';
import { boardRepository } from './features/board/board.repository';
import { boardRoutes } from './features/board/board.routes';
import { boardService } from './features/board/board.service';
import { commissionsRepository } from './features/commissions/commissions.repository';
import { commissionsRoutes } from './features/commissions/commissions.routes';
import { commissionsService } from './features/commissions/commissions.service';
import { figuresRepository } from './features/figures/figures.repository';
import { figuresRoutes } from './features/figures/figures.routes';
import { figuresService } from './features/figures/figures.service';
import { studioSetupRepository } from './features/studio-setup/studio-setup.repository';
import { studioSetupRoutes } from './features/studio-setup/studio-setup.routes';
import { studioSetupService } from './features/studio-setup/studio-setup.service';
import { timeRepository } from './features/time/time.repository';
import { timeRoutes } from './features/time/time.routes';
import { timeService } from './features/time/time.service';
import { capacityRepository } from './features/capacity/capacity.repository';
import { capacityRoutes } from './features/capacity/capacity.routes';
import { capacityService } from './features/capacity/capacity.service';
import { scheduleRepository } from './features/schedule/schedule.repository';
import { scheduleRoutes } from './features/schedule/schedule.routes';
import { scheduleService } from './features/schedule/schedule.service';
import { calendarFeedRepository } from './features/calendar-feed/calendar-feed.repository';
import { calendarFeedRoutes } from './features/calendar-feed/calendar-feed.routes';
import { calendarFeedService } from './features/calendar-feed/calendar-feed.service';
import { reportsRepository } from './features/reports/reports.repository';
import { reportsRoutes } from './features/reports/reports.routes';
import { reportsService } from './features/reports/reports.service';
import { dashboardRepository } from './features/dashboard/dashboard.repository';
import { dashboardRoutes } from './features/dashboard/dashboard.routes';
import { dashboardService } from './features/dashboard/dashboard.service';
import { paintsRepository } from './features/paints/paints.repository';
import { paintsRoutes } from './features/paints/paints.routes';
import { paintsService } from './features/paints/paints.service';
import { paletteRepository } from './features/palette/palette.repository';
import { paletteRoutes } from './features/palette/palette.routes';
import { paletteService } from './features/palette/palette.service';
import { recipesRepository } from './features/recipes/recipes.repository';
import { recipesRoutes } from './features/recipes/recipes.routes';
import { recipesService } from './features/recipes/recipes.service';
import { schemesRepository } from './features/schemes/schemes.repository';
import { schemesRoutes } from './features/schemes/schemes.routes';
import { schemesService } from './features/schemes/schemes.service';
import { priceTableRepository } from './features/price-table/price-table.repository';
import { priceTableRoutes } from './features/price-table/price-table.routes';
import { priceTableService } from './features/price-table/price-table.service';
import { quotesRepository } from './features/quotes/quotes.repository';
import { quotesRoutes } from './features/quotes/quotes.routes';
import { quotesService } from './features/quotes/quotes.service';
import { invoicesRepository } from './features/invoices/invoices.repository';
import { invoicesRoutes } from './features/invoices/invoices.routes';
import { invoicesService } from './features/invoices/invoices.service';
import { paymentEventsRepository } from './features/payments-webhook/payments-webhook.repository';
import { paymentsWebhookRoutes } from './features/payments-webhook/payments-webhook.routes';
import { paymentsWebhookService } from './features/payments-webhook/payments-webhook.service';
import { moneyRepository } from './features/money/money.repository';
import { moneyRoutes } from './features/money/money.routes';
import { moneyService } from './features/money/money.service';
import { enquiriesRepository } from './features/enquiries/enquiries.repository';
import { enquiriesRoutes } from './features/enquiries/enquiries.routes';
import { enquiriesService } from './features/enquiries/enquiries.service';
import { modelsInRepository } from './features/models-in/models-in.repository';
import { modelsInRoutes } from './features/models-in/models-in.routes';
import { modelsInService } from './features/models-in/models-in.service';
import { publicStudioRepository } from './features/public-studio/public-studio.repository';
import { publicStudioRoutes } from './features/public-studio/public-studio.routes';
import { publicStudioService } from './features/public-studio/public-studio.service';
import { shipmentsRepository } from './features/shipments/shipments.repository';
import { shipmentsRoutes } from './features/shipments/shipments.routes';
import { shipmentsService } from './features/shipments/shipments.service';
import { privacyRepository } from './features/privacy/privacy.repository';
import { privacyRoutes } from './features/privacy/privacy.routes';
import { privacyService } from './features/privacy/privacy.service';
import { loginInput } from '../shared/schemas/auth';
import { seedDemo } from '../seeds/demo';

const distDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../dist');
const UNSAFE = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
/** The one route without CSRF: the payment service signs its events instead. */
const CSRF_EXEMPT = new Set(['/api/webhooks/payments']);

export async function createApp(config: Config) {
  // Secrets never reach the log: redacted where they could appear, and requests are logged by method and path only.
  const logOptions = { level: config.logLevel, redact: { paths: REDACTED, censor: '[hidden]' }, serializers: { req: requestSerializer, err: pino.stdSerializers.err } };
  const log = config.logDestination ? pino(logOptions, config.logDestination) : pino(logOptions);
  const db = openDb(config);
  // A worker of several starts after its primary ran them: workers starting together would also race for
  // Knex's migration lock, and the loser would stop before it served.
  if (!config.worker) await migrate(db);

  // A worker of several (config.worker) uses the primary's capture inbox and payment fake instead of its own.
  const link = config.worker;
  const capture = config.smtpUrl || link ? null : await startMailCapture({ db, clock: config.clock, port: config.mailCapturePort, log });
  const capturePort = capture?.port ?? link?.mailCapturePort;
  const mailer = createMailer({
    db,
    clock: config.clock,
    smtp: config.smtpUrl ?? { host: '127.0.0.1', port: capturePort! },
    from: config.mailFrom,
    log,
  });

  // STRIPE_WEBHOOK_SECRET without a key: the fake signs with it, so events signed before a restart still verify after it.
  const paymentsFake = config.stripeSecretKey || link?.paymentsFake ? null : await startPaymentsFake({ port: config.paymentsFakePort, clock: config.clock, log, webhookSecret: config.stripeWebhookSecret });
  const fake = paymentsFake ?? link?.paymentsFake;
  const payments = createPayments({
    secretKey: config.stripeSecretKey ?? fake!.secretKey,
    webhookSecret: config.stripeWebhookSecret ?? fake!.webhookSecret,
    fake: fake ? { host: fake.host, port: fake.port } : undefined,
    clock: config.clock,
  });

  // Repositories and services, wired by hand: one place shows what depends on what.
  const authRepo = authRepository(db);
  const studiosRepo = studiosRepository(db);
  const clientsRepo = clientsRepository(db);
  const studios = studiosService({ db, repo: studiosRepo, clock: config.clock });
  const auth = authService({ db, repo: authRepo, studios, mailer, clock: config.clock, bcryptRounds: config.bcryptRounds, publicUrl: config.publicUrl });
  const clients = clientsService({ db, repo: clientsRepo, clock: config.clock });
  // Commissions on the bench: studio defaults (seeded for every new studio), activity log, figures/stages, time, board.
  const setup = studioSetupService({ db, repo: studioSetupRepository(db) });
  studios.onStudioCreated((studioId, trx) => setup.seedDefaults(studioId, trx));
  // The commission's activity, comments and a stage's time are kept under commissions.thread_version (listsCacheRows; 0 off).
  const activity = activityService({ repo: activityRepository(db), clock: config.clock, cacheRows: config.listsCacheRows });
  const figures = figuresService({ db, repo: figuresRepository(db), setup, activity, clock: config.clock });
  const commissions = commissionsService({ db, repo: commissionsRepository(db), figures, activity, clock: config.clock, listCacheRows: config.commissionListCacheRows });
  const time = timeService({ db, repo: timeRepository(db), figures, activity, clock: config.clock, cacheRows: config.listsCacheRows });
  const board = boardService({ repo: boardRepository(db), setup, clock: config.clock, cacheRows: config.boardCacheRows });
  // The calendar: painters' hours and days off, the queue and its forecast, the per-person calendar feeds.
  const capacity = capacityService({ db, repo: capacityRepository(db), clock: config.clock });
  const schedule = scheduleService({ db, repo: scheduleRepository(db), capacity, clock: config.clock, cacheStages: config.forecastCacheStages });
  const calendarFeed = calendarFeedService({ db, repo: calendarFeedRepository(db), schedule, clock: config.clock, publicUrl: config.publicUrl });
  const invitations = invitationsService({
    db,
    repo: invitationsRepository(db),
    users: authRepo,
    auth,
    studios: studiosRepo,
    clients: clientsRepo,
    mailer,
    clock: config.clock,
    publicUrl: config.publicUrl,
  });

  // Photos, the comment thread and approvals, with e-mail notices both ways. Files live under DATA_DIR/photos
  // and are served only through the photo route; at most two photos are decoded at once.
  tuneSharpForUploads();
  const storage = localDiskStorage(path.join(config.dataDir, 'photos'));
  const notices = noticesService({ repo: noticesRepository(db), mailer, publicUrl: config.publicUrl });
  const photos = photosService({ db, repo: photosRepository(db), storage, limiter: createLimiter(2), notices, clock: config.clock });
  // Before anything is uploaded: the temp files (swept as the store opened) and files without a row that a crash left.
  // Not in a worker of several: another worker's upload may be between its file and its row (the primary sweeps).
  const leftovers = link ? 0 : await photos.sweepLeftovers();
  if (storage.sweptTempFiles || leftovers) log.warn(`removed ${storage.sweptTempFiles} unfinished and ${leftovers} unreferenced photo files left by an interrupted run`);
  const comments = commentsService({ db, repo: commentsRepository(db), notices, clock: config.clock, cacheRows: config.listsCacheRows });
  const approvals = approvalsService({
    db,
    repo: approvalsRepository(db),
    notices,
    clock: config.clock,
    // An approved "finished" moves the commission on through the lifecycle's own rules and log.
    finishCommission: (actor, commissionId) => commissions.transition(actor, commissionId, { to: 'ready_to_ship', reason: undefined }),
  });

  // Paint rack, recipes, schemes and reference-photo palettes (photo bytes come through the photos service).
  // The rack, the recipe list and the invoices are kept in memory under the lists version (listsCacheRows; 0 off).
  const paints = paintsService({ db, repo: paintsRepository(db), clock: config.clock, cacheRows: config.listsCacheRows });
  const recipes = recipesService({ repo: recipesRepository(db), paints, clock: config.clock, cacheRows: config.listsCacheRows });
  const schemes = schemesService({ repo: schemesRepository(db), recipes, paints, clock: config.clock });
  const palette = paletteService({ repo: paletteRepository(db), photos, paints, limiter: createLimiter(2), clock: config.clock });

  // Money: the price table, quotes priced by the shared engine, invoices with their numbers and payments,
  // checkouts and verified events of the payment service, the owner's money view.
  const priceTables = priceTableService({ db, repo: priceTableRepository(db), clock: config.clock });
  const quotesRepo = quotesRepository(db);
  const invoices = invoicesService({
    db,
    repo: invoicesRepository(db),
    payments,
    mailer,
    clock: config.clock,
    publicUrl: config.publicUrl,
    cacheRows: config.listsCacheRows,
    priceTable: (studioId, trx) => priceTables.get(studioId, trx),
    acceptedQuote: (studioId, commissionId, trx) => quotesRepo.accepted(studioId, commissionId, trx),
    // The deposit's confirmed payment books the commission and puts it at the end of the queue.
    bookCommission: async (trx, by, commissionId) => {
      await commissions.bookIfQuoted(trx, by, commissionId);
    },
    cancelCommission: (actor, commissionId, reason) => commissions.transition(actor, commissionId, { to: 'cancelled', reason }),
  });
  // The balance invoice goes out when the commission is ready to ship (the client approved the finished work).
  commissions.onStatusChange((trx, change) => invoices.onCommissionStatus(trx, change));
  const quotes = quotesService({
    db,
    repo: quotesRepo,
    priceTables,
    invoices,
    activity,
    mailer,
    clock: config.clock,
    publicUrl: config.publicUrl,
    figuresOf: async (studioId, commissionId, trx) => (await figures.views(studioId, { commissionIds: [commissionId] }, false, trx)).figures,
    setStageEstimates: (trx, studioId, figureId, minutes) => figures.setStageEstimates(trx, studioId, figureId, minutes),
    moveCommission: (trx, by, commissionId, to) => commissions.transitionIn(trx, by, commissionId, to),
    cacheRows: config.listsCacheRows,
  });
  const webhook = paymentsWebhookService({ db, repo: paymentEventsRepository(db), payments, invoices, clock: config.clock });
  // The money view, the quote list (above) and the enquiry list (below) are kept too (listsCacheRows; 0 off).
  const money = moneyService({ repo: moneyRepository(db), priceTables, clock: config.clock, cacheRows: config.listsCacheRows });
  // The books (actuals against estimates, earnings net of costs) and each role's home page.
  // The books and the owner's home are kept in memory under the books version (booksCacheRows; 0 off).
  const reports = reportsService({ repo: reportsRepository(db), priceTables, clock: config.clock, cacheRows: config.booksCacheRows });
  const dashboard = dashboardService({ repo: dashboardRepository(db), schedule, reports, clock: config.clock, cacheRows: config.booksCacheRows });

  // Both ends of a commission: the public page and its enquiries (one photo decoded at a time for visitors),
  // the models received, packing and shipping. The move to shipped waits for the balance, however it is asked for.
  const enquiries = enquiriesService({ db, repo: enquiriesRepository(db), lists: setup, commissions, invitations, activity, storage, limiter: createLimiter(1, 10), mailer, clock: config.clock, publicUrl: config.publicUrl, cacheRows: config.listsCacheRows });
  const publicStudio = publicStudioService({ repo: publicStudioRepository(db), clock: config.clock, lists: setup, prices: priceTables, schedule, enquiries });
  const modelsIn = modelsInService({ db, repo: modelsInRepository(db), activity, mailer, clock: config.clock, publicUrl: config.publicUrl });
  const shipments = shipmentsService({ db, repo: shipmentsRepository(db), commissions, activity, mailer, clock: config.clock, publicUrl: config.publicUrl });
  commissions.guardStatusChange((trx, change) => shipments.shippedGuard(trx, change));
  // A client's data: the export (ZIP with photos) and the erase that keeps only what invoices need, anonymised.
  const privacy = privacyService({ db, repo: privacyRepository(db), storage, clock: config.clock, log });

  if (config.demo && !link && !(await db('studios').first('id'))) {
    await seedDemo(db, { clock: config.clock, hash: auth.hash, studios, photoStorage: storage });
    log.info('demo scenario loaded');
  }

  const passport = new Passport();
  passport.use(
    new LocalStrategy({ usernameField: 'email', passReqToCallback: true }, (req, _email, _password, done) => {
      auth.verifyLogin(loginInput.parse(req.body), req.ip ?? 'unknown').then((u) => done(null, u), done);
    }),
  );
  // The session keeps the user id and the person's session epoch at sign-in; a password reset raises the epoch,
  // which signs out every older session (older sessions that kept only the id count as epoch 0).
  passport.serializeUser((u, done) => {
    authRepo.findUserById((u as AuthUser).id).then((row) => (row ? done(null, { id: row.id, epoch: row.session_epoch ?? 0 }) : done(new Error('signed-in user vanished'))), done);
  });
  passport.deserializeUser((kept: number | { id: number; epoch: number }, done) => {
    const { id, epoch } = typeof kept === 'number' ? { id: kept, epoch: 0 } : kept;
    authRepo.sessionUser(id).then((u) => done(null, u && (u.session_epoch ?? 0) === epoch ? toUser(u) : false), done);
  });

  const app = express();
  app.disable('x-powered-by');
  // No ETag made from every body: API answers are no-store, so no browser asks again with it, and hashing each
  // answer costs time on every request. The answers that are cached (photos, the calendar feed) set their own.
  app.set('etag', false);
  app.set('trust proxy', config.trustProxy ? 1 : false);
  app.use(requestLog(log, { eachRequest: config.logLevel === 'debug' || config.logLevel === 'trace' }));
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          'default-src': ["'self'"],
          'script-src': ["'self'"],
          'style-src': ["'self'", "'unsafe-inline'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          'font-src': ["'self'", 'data:'],
          'connect-src': ["'self'"],
          'frame-ancestors': ["'none'"],
          'form-action': ["'self'"],
          'object-src': ["'none'"],
          'upgrade-insecure-requests': null,
        },
      },
      crossOriginEmbedderPolicy: false,
      // the same answer as the CSP's frame-ancestors 'none', for browsers that only read this header
      frameguard: { action: 'deny' },
      strictTransportSecurity: config.publicUrl.startsWith('https:'),
    }),
  );

  const store = createSessionStore(db, { cleanupInterval: config.runJobs ? 15 * 60_000 : 0 });
  // On an https address the cookie takes the __Host- prefix: browsers then keep it only if it is Secure, for this
  // host alone and the whole path, so no other site or subdomain can set or overwrite it.
  const sessionCookie = config.publicUrl.startsWith('https:') ? '__Host-sablework.sid' : 'sablework.sid';
  const sessionMiddleware = session({
    name: sessionCookie,
    secret: config.sessionSecret,
    store,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    cookie: { httpOnly: true, sameSite: 'lax', secure: sessionCookie.startsWith('__Host-') ? true : config.trustProxy ? 'auto' : false, maxAge: 14 * 24 * 3600_000 },
  });

  const csrf: RequestHandler = (req, _res, next) => {
    // mounted under /api, so req.path lacks the prefix the exempt list is written with
    if (!UNSAFE.has(req.method) || CSRF_EXEMPT.has(req.baseUrl + req.path)) return next();
    const sent = req.get('x-csrf-token');
    const expected = req.session?.csrf;
    if (!sent || !expected || !safeEqual(sent, expected)) throw errors.csrf();
    next();
  };

  // The API router holds every route with its full path, so the route list is read from one place.
  const apiRouter = express.Router();
  const r = routeTable(apiRouter);
  const allow = allowFactory(db);
  const meta = { demo: config.demo, devMail: capturePort !== undefined, ...(config.demo ? { demoPassword: DEMO_PASSWORD } : {}) };
  metaRoutes(r, { meta });
  authRoutes(r, { auth, invitations, passport: passport as never, sessionCookie });
  studiosRoutes(r, { allow, studios, invitations });
  clientsRoutes(r, { allow, clients, invitations });
  commissionsRoutes(r, { allow, commissions });
  figuresRoutes(r, { allow, figures });
  timeRoutes(r, { allow, time });
  boardRoutes(r, { allow, board });
  studioSetupRoutes(r, { allow, setup });
  photosRoutes(r, { allow, photos });
  commentsRoutes(r, { allow, comments });
  approvalsRoutes(r, { allow, approvals });
  priceTableRoutes(r, { allow, priceTables });
  quotesRoutes(r, { allow, quotes });
  invoicesRoutes(r, { allow, invoices });
  moneyRoutes(r, { allow, money });
  paymentsWebhookRoutes(r, { webhook });
  capacityRoutes(r, { allow, capacity });
  scheduleRoutes(r, { allow, schedule });
  calendarFeedRoutes(r, { allow, calendarFeed });
  reportsRoutes(r, { allow, reports });
  dashboardRoutes(r, { allow, dashboard });
  paintsRoutes(r, { allow, paints });
  recipesRoutes(r, { allow, recipes });
  schemesRoutes(r, { allow, schemes });
  paletteRoutes(r, { allow, palette });
  publicStudioRoutes(r, { allow, publicStudio });
  enquiriesRoutes(r, { allow, enquiries });
  modelsInRoutes(r, { allow, modelsIn });
  shipmentsRoutes(r, { allow, shipments });
  privacyRoutes(r, { allow, privacy });

  // API answers hold people's data: browsers and proxies keep no copy, unless a route says otherwise (photos, feeds).
  app.use('/api', (_req, res, next) => {
    res.set('Cache-Control', 'no-store');
    next();
  });
  // The payment webhook needs the exact bytes for its signature check, so it is parsed raw, before JSON.
  app.use('/api/webhooks/payments', express.raw({ type: () => true, limit: '1mb' }));
  app.use('/api', express.json({ limit: '1mb' }), sessionMiddleware, passport.initialize(), passport.session(), csrf, apiRouter);
  app.use('/api', (_req, _res, next) => next(errors.notFound('That API route')));
  if (capturePort !== undefined) app.use('/dev/mail', devMailRouter(db));

  if (config.serveClient && fs.existsSync(path.join(distDir, 'index.html'))) {
    app.use(express.static(distDir, { index: false, maxAge: '1h' }));
    app.get(/^\/(?!api\/|dev\/).*/, (_req, res) => res.sendFile(path.join(distDir, 'index.html')));
  }

  const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
    let e: AppError;
    if (err instanceof AppError) e = err;
    else if (err?.type === 'entity.parse.failed') e = errors.invalid('The request body is not valid JSON.');
    else if (err?.type === 'entity.too.large') e = errors.tooLarge('The request body is too large.');
    else if (err?.status === 400 || err?.statusCode === 400) e = errors.invalid('The request could not be read.');
    else {
      req.log.error({ err, req }, 'unexpected error');
      const id = String(req.id);
      res.status(500).json({ error: { code: 'internal', message: `Something went wrong on our side. If it keeps happening, quote request ${id}.`, requestId: id } });
      return;
    }
    const refusal = (err as { refusal?: string }).refusal;
    if (LOGGED_REFUSALS.has(e.code) || refusal) {
      const account = e.code === 'invalid_credentials' || e.code === 'throttled' ? accountRef(req.body?.email) : undefined;
      req.log.warn({ event: 'security.refused', code: e.code, status: e.status, refusal, account, ...requester(req) }, `refused: ${refusal ?? e.code}`);
    }
    if (e.headers) res.set(e.headers);
    res.status(e.status).json({ error: { code: e.code, message: e.message, ...(e.fields ? { fields: e.fields } : {}), ...e.extra } });
  };
  app.use(errorHandler);

  // Background work: timers in a running server; tests call the jobs directly after moving the clock.
  const jobs = {
    deliverMail: () => mailer.deliverDue(),
    pruneLoginFailures: () => auth.pruneFailures(),
    /** closes commissions still "shipped" their studio's number of days after the parcel left (idempotent) */
    autoCloseShipped: () => shipments.autoCloseShipped(),
    prunePublicAttempts: () => publicStudio.pruneAttempts(),
    /** e-mails each overdue invoice's next reminder once (idempotent) */
    sendInvoiceReminders: () => invoices.sendReminders(),
    /** sent quotes past their validity become expired */
    expireQuotes: () => quotes.expireDue(),
  };
  const timers: NodeJS.Timeout[] = [];
  if (config.runJobs) {
    timers.push(setInterval(() => mailer.kick(), 15_000).unref());
    timers.push(setInterval(() => void jobs.pruneLoginFailures().catch(() => undefined), 3600_000).unref());
    timers.push(setInterval(() => void jobs.autoCloseShipped().then(() => jobs.prunePublicAttempts()).catch((err) => log.error({ err }, 'shipping jobs failed')), 3600_000).unref());
    timers.push(setInterval(() => void jobs.expireQuotes().then(() => jobs.sendInvoiceReminders()).catch((err) => log.error({ err }, 'money jobs failed')), 3600_000).unref());
    mailer.kick();
  }

  return {
    app,
    db,
    config,
    log,
    mailer,
    jobs,
    mailCapturePort: capture?.port ?? null,
    payments,
    paymentsFake,
    routes: () => listRoutes(apiRouter),
    async close() {
      timers.forEach(clearInterval);
      if (store.nextDbCleanup) clearTimeout(store.nextDbCleanup);
      mailer.close();
      await capture?.close();
      await paymentsFake?.close();
      await db.destroy();
    },
  };
}

export type SableworkApp = Awaited<ReturnType<typeof createApp>>;
