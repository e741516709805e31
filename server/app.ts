// Builds the Express app (exported for supertest); server/index.ts starts it.
import { existsSync } from 'node:fs';
import { resolve, sep } from 'node:path';
import compression from 'compression';
import express, { type Request } from 'express';
import session from 'express-session';
import connectSessionSequelize from 'connect-session-sequelize';
import { csrfSync } from 'csrf-sync';
import helmet from 'helmet';
import type { Sequelize } from 'sequelize';
import type { Config } from './config';
import { PartFile, ReportPhoto, Session, WantedPhoto } from './db/models';
import { apiNotFound, errorHandler } from './errors';
import { absoluteSessionLifetime } from './middleware/auth';
import { adminRoutes } from './modules/admin/routes';
import { createPassport } from './modules/auth/passport';
import { authRoutes } from './modules/auth/routes';
import { createAuthService } from './modules/auth/service';
import { createTokenService } from './modules/auth/tokens';
import { healthRoutes } from './modules/health/routes';
import { createJobClaims } from './modules/jobs/claims';
import { createJobRunner } from './modules/jobs/runner';
import { createDatabaseWatch } from './modules/health/watch';
import { closeCheckPool } from './modules/files/inspect';
import { PhotoJobs } from './modules/files/photo-jobs';
import { PhotoQueue } from './modules/files/photo-queue';
import { RenderJobs } from './modules/files/render-jobs';
import { createStorage } from './modules/files/storage-from-config';
import { multerErrors } from './modules/files/upload';
import { partsRoutes } from './modules/parts/routes';
import { createPartsService } from './modules/parts/service';
import { vocabRoutes } from './modules/vocab/routes';
import type { Mailer } from './modules/mail/outbox';
import { devMailboxRoutes, mailAdminRoutes } from './modules/mail/routes';
import { evidenceModerationRoutes, flagRoutes, partEvidenceRoutes, profileRoutes } from './modules/evidence/routes';
import { createEvidenceService } from './modules/evidence/service';
import { noticesRoutes } from './modules/notices/routes';
import { createAlerts, tellParentAuthor } from './modules/notices/alerts';
import { kitRecallRoutes } from './modules/recalls/routes';
import { createRecallService } from './modules/recalls/service';
import { estimateRoutes, kitRoutes, priceRoutes, printerRoutes } from './modules/planning/routes';
import { SliceQueue } from './modules/planning/slice-queue';
import { createPlanningService } from './modules/planning/service';
import { partHistoryRoutes } from './modules/review/history-routes';
import { reviewRoutes } from './modules/review/routes';
import { createReviewService } from './modules/review/service';
import { searchRoutes } from './modules/search/routes';
import { createSearchService } from './modules/search/service';
import { buildSearchRoutes } from './modules/search/build-route';
import { buildRoutes } from './modules/builds/routes';
import { calibrationRoutes, madeKitRoutes, makeRoutes } from './modules/make/routes';
import { createMakeService } from './modules/make/service';
import { wantedRoutes } from './modules/wanted/routes';
import { createPayments } from './modules/payments/client';
import { paymentWebhookRoutes, printRequestRoutes } from './modules/print-requests/routes';
import { createPrintRequestsService } from './modules/print-requests/service';
import { statementRoutes } from './modules/planning/statement-routes';
import { createWantedService } from './modules/wanted/service';
import { crewRoutes, invitationRoutes } from './modules/crews/routes';
import { createCrewsService } from './modules/crews/service';

export const SESSION_COOKIE = 'rigshelf.sid';

export interface AppContext {
  config: Config;
  sequelize: Sequelize;
  /** The outbox (server/modules/mail/outbox.ts); its owner starts and closes it. */
  mailer: Mailer;
}

export function createApp({ config, sequelize, mailer }: AppContext) {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', config.TRUST_PROXY ? 1 : false);

  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // Served over plain HTTP on loopback in development: upgrading would break it.
          upgradeInsecureRequests: config.isProduction ? [] : null,
          imgSrc: ["'self'", 'data:', 'blob:'],
          workerSrc: ["'self'", 'blob:'],
        },
      },
    }),
  );
  // gzip or brotli, whichever the browser takes, for JSON and the client's files alike
  app.use(compression());
  const database = createDatabaseWatch(sequelize);
  app.use('/api/health', healthRoutes(sequelize, { check: database.check }));
  app.use('/api', database.gate());
  // raw bytes for the signature check, no session or CSRF: the payments service calls it
  app.use(
    '/api/payments/webhook',
    paymentWebhookRoutes(() => printRequests),
  );
  app.use(express.json({ limit: '1mb' }));

  const SequelizeStore = connectSessionSequelize(session.Store);
  const store = new SequelizeStore({
    db: sequelize,
    table: Session.name,
    checkExpirationInterval: 15 * 60_000,
    extendDefaultFields: (defaults: { data: string; expires: Date }, data: { passport?: { user?: number } }) => ({
      data: defaults.data,
      expires: defaults.expires,
      userId: data.passport?.user ?? null,
    }),
  });
  // A rolling session is touched after its answer's headers and first bytes went out, and the rest
  // of the answer waited for it: a touch the database refused (its node going away) cut the answer
  // off, and an instance killed meanwhile left it half sent. The touch only moves the expiry on, so
  // the answer finishes at once and the touch is written beside it (a failed one is logged; the
  // member's next request moves the expiry on again).
  const touch = store.touch.bind(store);
  store.touch = (sid, data, callback) => {
    touch(sid, data, (err?: unknown) => {
      if (err) console.error(`rigshelf: a session's expiry could not be moved on (${err instanceof Error ? err.message : String(err)})`);
    });
    callback?.(undefined);
  };
  app.use(
    '/api',
    session({
      name: SESSION_COOKIE,
      secret: config.SESSION_SECRET,
      store,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      cookie: {
        httpOnly: true,
        sameSite: 'lax',
        secure: 'auto',
        maxAge: config.SESSION_MAX_AGE_HOURS * 3600_000,
      },
    }),
  );

  const { storage, dirs } = createStorage(config);
  // background work is claimed through the database, so several instances share it (modules/jobs)
  const claims = createJobClaims(sequelize, { instanceId: config.INSTANCE_ID, leaseS: config.JOB_LEASE_S });
  const photos = new PhotoJobs(storage, new PhotoQueue(), claims);
  // a new picture can be a part's cover in search results, which the index stores
  const renders = config.MODEL_PICTURES ? new RenderJobs({ storage, onReady: () => search.scheduleRebuild(), claims }) : undefined;
  const search = createSearchService({
    sequelize,
    indexFile: config.SEARCH_INDEX_FILE,
    dbHosts: config.DB_HOSTS,
    ranking: (partIds) => evidence.rankFigures(partIds),
  });
  // a decision that puts a part on the shelf, replaces its published revision or retires it changes search
  const alerts = createAlerts({ mail: mailer, publicUrl: config.PUBLIC_URL });
  const recalls = createRecallService();
  const wanted = createWantedService({ sequelize, storage, photos, mail: mailer, publicUrl: config.PUBLIC_URL, alerts });
  const review = createReviewService({
    sequelize,
    mail: mailer,
    publicUrl: config.PUBLIC_URL,
    onDecided: () => search.scheduleRebuild(),
    onPublished: (part, t) => wanted.partPublished(part, t),
    onDecision: async (part, action, info, t) => {
      await recalls.reviewDecision(part, action, info, t);
      if (action === 'approve') await tellParentAuthor(alerts, part, info.previousRevisionId, t);
    },
  });
  const parts = createPartsService({
    sequelize,
    storage,
    sweepMinAgeMs: config.STORAGE_SWEEP_MIN_AGE_S * 1000,
    photos,
    renders,
    onSubmitted: review.submitted,
    onEdited: review.edited,
    onRecovered: (rows) => wanted.resume(rows),
    onVisibilityChanged: () => search.scheduleRebuild(),
  });
  const evidence = createEvidenceService({ sequelize, storage, photos, onChanged: () => search.rankingChanged(), alerts, recalls });
  const crews = createCrewsService({ sequelize, mail: mailer, publicUrl: config.PUBLIC_URL });
  const slicer = new SliceQueue();
  const planning = createPlanningService({ sequelize, evidence, storage, slicer, alerts });
  const make = createMakeService();
  const payments = createPayments(config);
  const printRequests = createPrintRequestsService({ sequelize, mail: mailer, publicUrl: config.PUBLIC_URL, planning, payments });

  const jobs = createJobRunner({
    sequelize,
    claims,
    busy: () => photos.busy + (renders?.busy ?? 0),
    async takePhotos(table, ids) {
      if (table === 'part_files') parts.takeOver(await PartFile.findAll({ where: { id: ids } }));
      else if (table === 'wanted_photos') wanted.resume(await WantedPhoto.findAll({ where: { id: ids } }));
      else for (const row of await ReportPhoto.findAll({ where: { id: ids } })) photos.clean(row, () => ReportPhoto.findByPk(row.id));
    },
    takeRenders: renders ? async (ids) => parts.takeOver(await PartFile.findAll({ where: { id: ids } })) : undefined,
    sharedChores: [
      async () => {
        const due = await printRequests.resumeRefunds();
        if (due) console.log(`rigshelf: ${due} due refund(s) tried again`);
      },
    ],
  });

  const tokens = createTokenService({ config, mailer });
  const auth = createAuthService(config, tokens);
  const passport = createPassport(auth);
  app.use('/api', passport.initialize());
  app.use('/api', passport.session());
  app.use('/api', absoluteSessionLifetime(config.SESSION_ABSOLUTE_HOURS));

  const { csrfSynchronisedProtection, generateToken } = csrfSync({
    getTokenFromRequest: (req: Request) => req.get('x-csrf-token'),
    errorConfig: {
      statusCode: 403,
      code: 'csrf_invalid',
      message: 'The form expired or came from elsewhere (missing or wrong X-CSRF-Token). Reload the page and try again.',
    },
  });
  app.use('/api', csrfSynchronisedProtection);

  app.use('/api/auth', authRoutes({ config, auth, passport, csrfToken: generateToken, tokens, sequelize }));
  app.use('/api/admin/mail', mailAdminRoutes(mailer));
  app.use('/api/admin', adminRoutes({ onBodiesChanged: () => search.scheduleRebuild() }));
  // the fake's mailbox exists only in development; elsewhere it is an unknown path (404)
  if (!config.isProduction && mailer.fake) app.use('/api/dev', devMailboxRoutes(mailer.fake));
  app.use('/api/vocab', vocabRoutes());
  app.use('/api/parts', partHistoryRoutes(review));
  app.use('/api/parts', partsRoutes(parts, storage));
  app.use('/api/parts', partEvidenceRoutes(evidence, storage));
  app.use('/api/ratings', flagRoutes(evidence, 'rating'));
  app.use('/api/reports', flagRoutes(evidence, 'report'));
  app.use('/api/users', profileRoutes(evidence));
  app.use('/api/review', evidenceModerationRoutes(evidence));
  app.use('/api/review', reviewRoutes(review));
  app.use('/api/notices', noticesRoutes(alerts));
  app.use('/api/search', buildSearchRoutes(search));
  app.use('/api/search', searchRoutes(search));
  app.use('/api/builds', buildRoutes());
  app.use('/api/wanted', wantedRoutes(wanted, storage));
  app.use('/api/estimate', estimateRoutes(planning));
  app.use('/api/make', makeRoutes(make));
  app.use('/api/printers', calibrationRoutes(make));
  app.use('/api/printers', printerRoutes(planning));
  app.use('/api/me/prices', priceRoutes(planning));
  app.use('/api/kits', kitRecallRoutes(recalls));
  app.use('/api/kits', madeKitRoutes(make, sequelize));
  app.use('/api/kits', statementRoutes(planning));
  app.use('/api/kits', kitRoutes(planning));
  app.use('/api/print-requests', printRequestRoutes(printRequests));
  app.use('/api/crews', crewRoutes(crews));
  app.use('/api/invitations', invitationRoutes(crews));
  app.use('/api', apiNotFound());

  const dist = resolve(config.CLIENT_DIST);
  if (existsSync(resolve(dist, 'index.html'))) {
    app.use(
      express.static(dist, {
        index: false,
        setHeaders(res, path) {
          // Vite names what it builds under assets/ by content hash: a new build means a new name
          const hashed = path.startsWith(resolve(dist, 'assets') + sep);
          res.setHeader('Cache-Control', hashed ? 'public, max-age=31536000, immutable' : 'no-cache');
        },
      }),
    );
    app.get(/^(?!\/api\/).*/, (_req, res) => res.sendFile(resolve(dist, 'index.html'), { headers: { 'Cache-Control': 'no-cache' } }));
  }

  app.use(multerErrors);
  app.use(errorHandler({ onDatabaseUnavailable: database.reportUnavailable }));

  return {
    app,
    services: { parts, review, evidence, dirs, storage, search, wanted, crews, printRequests, payments, jobs, claims },
    /** Waits for photo work in hand, then stops the worker pools and the session store's expiry sweep. */
    async close() {
      await jobs.close();
      // pictures waiting are left for the next start at once; photos in hand are finished meanwhile
      await Promise.all([
        renders?.close(),
        (async () => {
          await parts.photosSettled();
          await photos.close();
        })(),
      ]);
      await closeCheckPool();
      await search.close();
      await slicer.close();
      await make.close();
      await payments.close();
      storage.close();
      (store as unknown as { stopExpiringSessions(): void }).stopExpiringSessions();
    },
  };
}
