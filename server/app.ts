/** Builds the Express app (no listening here: main.ts listens, tests call supertest(app)). */
import express, { type Express, type RequestHandler } from 'express';
import helmet from 'helmet';
import type { Store } from 'express-session';
import { randomBytes } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
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

/** Serves the built client; index.html gets a fresh CSP nonce on every request. */
function client(dir: string): express.Router {
  const router = express.Router();
  const indexFile = path.join(dir, 'index.html');
  router.use(express.static(dir, { index: false, maxAge: '1h' }));
  const sendIndex: RequestHandler = (_req, res) => {
    if (!existsSync(indexFile)) {
      res
        .status(503)
        .type('text/plain')
        .send('The client is not built yet. Run npm start or npm run build.');
      return;
    }
    const nonce = res.locals.cspNonce as string;
    res.setHeader('Cache-Control', 'no-cache');
    res.type('html').send(readFileSync(indexFile, 'utf8').replaceAll('__CSP_NONCE__', nonce));
  };
  router.get('/*splat', sendIndex);
  router.get('/', sendIndex);
  return router;
}

export function createApp(ctx: AppContext, options: AppOptions = {}): Express {
  const app = express();
  app.disable('x-powered-by');
  // Exactly the configured number of proxies is trusted for the client's address, so a forged
  // X-Forwarded-For cannot dodge the per-address sign-in limit (Express "trust proxy" as a count).
  if (ctx.config.trustProxyHops > 0) app.set('trust proxy', ctx.config.trustProxyHops);
  app.use((_req, res, next) => {
    res.locals.cspNonce = randomBytes(16).toString('base64');
    next();
  });
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          styleSrc: [
            "'self'",
            (_req, res) => `'nonce-${(res as express.Response).locals.cspNonce}'`,
          ],
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
  app.use('/api', api(ctx, options));
  app.use(client(options.clientDir ?? clientDir));
  app.use(errorHandler);
  return app;
}
