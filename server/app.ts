/** Builds the Express app (no listening here: main.ts listens, tests call supertest(app)). */
import express, { type Express, type RequestHandler } from 'express';
import helmet from 'helmet';
import type { Store } from 'express-session';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { AppContext } from './context.js';
import { errorHandler, jsonNotFound } from './http.js';
import { csrfGuard } from './auth/csrf.js';
import { loadActor, sessionMiddleware } from './auth/session.js';
import { authRouter } from './routes/auth.js';
import { accountRouter } from './routes/account.js';
import { devMailRouter } from './routes/dev-mail.js';
import { healthRouter } from './routes/health.js';
import { invitationsRouter } from './routes/invitations.js';
import { membersRouter } from './routes/members.js';
import { schoolRouter } from './routes/school.js';
import { classesRouter } from './routes/classes.js';
import { kitTypesRouter } from './routes/kit-types.js';
import { tubsRouter } from './routes/tubs.js';
import { outcomesRouter } from './routes/outcomes.js';
import { unitsRouter } from './routes/units.js';
import { lessonsRouter } from './routes/lessons.js';
import { activitiesRouter } from './routes/activities.js';
import { agendaRouter, conflictsRouter } from './routes/agenda.js';
import { bookingsRouter } from './routes/bookings.js';
import { reliefRouter } from './routes/relief.js';
import { shareLinksRouter } from './routes/share-links.js';
import { shareRouter } from './routes/share.js';
import { traysRouter } from './routes/trays.js';
import { calendarFeedRouter, calendarRouter } from './routes/calendar-feed.js';
import { reviewRouter } from './routes/review.js';
import { COVERAGE_PATH, coverageHandler } from './routes/coverage.js';

export const clientDir = fileURLToPath(new URL('../dist/trayplan/browser', import.meta.url));

export interface AppOptions {
  /** Whether the session store prunes on a timer (off in tests). */
  pruneSessions?: boolean;
  /** Folder of the built client; the API alone is served when it is missing. */
  clientDir?: string;
  /** The session store, when the caller closes it itself on shutdown (main.ts). */
  sessionStore?: Store;
}

/** The API under /api: every route, then a JSON 404 and the one error handler. */
function api(ctx: AppContext, options: AppOptions): express.Router {
  const router = express.Router();
  router.use('/health', healthRouter(ctx));
  // A tray's token is its credential: no session, no CSRF (API.md).
  router.use('/trays', traysRouter(ctx));
  router.use(express.json({ limit: '1mb' }));
  router.use(
    sessionMiddleware({
      store: options.sessionStore,
      pool: ctx.pool,
      secret: ctx.config.sessionSecret,
      idleMinutes: ctx.config.sessionIdleMinutes,
      secure: ctx.config.behindHttps,
      prune: options.pruneSessions ?? true,
    }),
  );
  router.use(loadActor(ctx.db));
  router.use(csrfGuard(ctx.config.sessionSecret));
  router.use((_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  });
  router.use('/auth', authRouter(ctx));
  router.use('/invitations', invitationsRouter(ctx));
  router.use('/account/calendar-feed', calendarFeedRouter(ctx));
  router.use('/account', accountRouter(ctx));
  router.use('/calendar', calendarRouter(ctx));
  router.use('/members', membersRouter(ctx));
  router.use('/dev/mail', devMailRouter(ctx));
  router.use('/school', schoolRouter(ctx));
  router.use('/classes', classesRouter(ctx));
  router.use('/kit-types', kitTypesRouter(ctx));
  router.use('/tubs', tubsRouter(ctx));
  router.use('/outcomes', outcomesRouter(ctx));
  router.use('/review', reviewRouter(ctx));
  // /coverage, /coverage.csv and /coverage.pdf: one resource whose formats are extensions.
  router.get(COVERAGE_PATH, coverageHandler(ctx));
  router.use('/units', unitsRouter(ctx));
  router.use('/agenda', agendaRouter(ctx));
  router.use('/relief', reliefRouter(ctx));
  router.use('/conflicts', conflictsRouter(ctx));
  router.use('/bookings', bookingsRouter(ctx));
  router.use('/share-links', shareLinksRouter(ctx));
  router.use('/share', shareRouter(ctx));
  router.use('/lessons', lessonsRouter(ctx));
  router.use('/activities', activitiesRouter(ctx));
  router.use(jsonNotFound);
  return router;
}

/** The service worker's files: checked again on every visit, so a new version is found. */
const WORKER_FILES = new Set([
  'ngsw-worker.js',
  'ngsw.json',
  'safety-worker.js',
  'worker-basic.min.js',
]);

/**
 * Serves the built client. index.html goes out exactly as built, the same bytes for `/`,
 * `/index.html` and every client route: the service worker checks it against its hash in
 * ngsw.json and serves its cached copy offline, so nothing in it may change per request (no
 * nonce; the CSP below needs no inline script).
 */
function client(dir: string): express.Router {
  const router = express.Router();
  const indexFile = path.join(dir, 'index.html');
  const sendIndex: RequestHandler = (_req, res, next) => {
    if (!existsSync(indexFile)) {
      res
        .status(503)
        .type('text/plain')
        .send('The client is not built yet. Run npm start or npm run build.');
      return;
    }
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(indexFile, { cacheControl: false }, (error) => error && next(error));
  };
  router.get('/index.html', sendIndex);
  router.use(
    express.static(dir, {
      index: false,
      maxAge: '1h',
      setHeaders: (res, file) => {
        if (WORKER_FILES.has(path.basename(file))) res.setHeader('Cache-Control', 'no-cache');
      },
    }),
  );
  router.get('/*splat', sendIndex);
  router.get('/', sendIndex);
  return router;
}

/**
 * Echoes a read's tag (`X-Trayplan-Read`, a random hex string the client sends with every GET):
 * an answer the service worker later serves from its cache carries the old tag, which is how the
 * client knows it shows a saved copy (src/app/offline/saved-copies.ts). Anything else is ignored.
 */
const echoReadTag: RequestHandler = (req, res, next) => {
  const tag = req.get('X-Trayplan-Read');
  if (tag && /^[0-9a-f]{16,64}$/.test(tag)) res.setHeader('X-Trayplan-Read', tag);
  next();
};

export function createApp(ctx: AppContext, options: AppOptions = {}): Express {
  const app = express();
  app.disable('x-powered-by');
  // Exactly the configured number of proxies is trusted for the client's address, so a forged
  // X-Forwarded-For cannot dodge the per-address sign-in limit (Express "trust proxy" as a count).
  if (ctx.config.trustProxyHops > 0) app.set('trust proxy', ctx.config.trustProxyHops);
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          // No inline script anywhere, so scripts stay 'self' only. Styles allow inline: Angular
          // and Material add component styles at run time, and the shell the service worker
          // serves offline cannot carry a per-request nonce (a nonce kept in a cached copy
          // would be a fixed one, which protects nothing).
          styleSrc: ["'self'", "'unsafe-inline'"],
          workerSrc: ["'self'"],
          fontSrc: ["'self'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          frameSrc: ["'self'"],
          frameAncestors: ["'none'"],
          baseUri: ["'self'"],
          formAction: ["'self'"],
          ...(ctx.config.behindHttps ? { upgradeInsecureRequests: [] } : {}),
        },
      },
      strictTransportSecurity: ctx.config.behindHttps,
    }),
  );
  app.use('/api', echoReadTag, api(ctx, options));
  app.use(client(options.clientDir ?? clientDir));
  app.use(errorHandler);
  return app;
}
