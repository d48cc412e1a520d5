import type { RequestHandler } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import { eq } from 'drizzle-orm';
import type pg from 'pg';
import type { Db } from '../db/client.js';
import { schools, users } from '../db/schema/index.js';
import { HttpError } from '../http.js';
import type { Actor } from './policy.js';

declare module 'express-session' {
  interface SessionData {
    userId?: string;
  }
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      /** The signed-in, active user, loaded fresh on every request. */
      actor?: Actor;
    }
  }
}

/** The PostgreSQL session store; close() it before ending the pool (it prunes on a timer). */
export function createSessionStore(
  pool: pg.Pool,
  prune: boolean,
): session.Store & { close(): void } {
  const PgStore = connectPgSimple(session);
  return new PgStore({
    pool,
    tableName: 'session',
    createTableIfMissing: false,
    pruneSessionInterval: prune ? 15 * 60 : false,
  });
}

export interface SessionOptions {
  /** The store (main.ts makes it so it can close it in order); one is made when left out. */
  store?: session.Store;
  pool: pg.Pool;
  secret: string;
  idleMinutes: number;
  secure: boolean;
  /** Whether the store prunes expired sessions on a timer (off in tests so processes exit). */
  prune: boolean;
}

/** express-session stored in PostgreSQL; rolling expiry gives the idle timeout. */
export function sessionMiddleware(o: SessionOptions): RequestHandler {
  return session({
    name: 'trayplan.sid',
    secret: o.secret,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    store: o.store ?? createSessionStore(o.pool, o.prune),
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      secure: o.secure,
      maxAge: o.idleMinutes * 60 * 1000,
      path: '/',
    },
  });
}

/** Loads `req.actor` from the session; a deactivated or removed user is signed out. */
export function loadActor(db: Db): RequestHandler {
  return async (req, _res, next) => {
    const userId = req.session?.userId;
    if (!userId) return next();
    const [row] = await db
      .select({
        id: users.id,
        email: users.email,
        name: users.name,
        role: users.role,
        status: users.status,
        schoolId: users.schoolId,
        schoolName: schools.name,
      })
      .from(users)
      .innerJoin(schools, eq(schools.id, users.schoolId))
      .where(eq(users.id, userId));
    if (row && row.status === 'active') {
      req.actor = row;
    } else {
      delete req.session.userId;
    }
    next();
  };
}

/** Throws 401 unless someone is signed in; returns them. */
export function requireActor(req: Express.Request): Actor {
  if (!req.actor) throw new HttpError(401, 'signed-out', 'Sign in to continue.');
  return req.actor;
}

/** Middleware form of requireActor for whole routers. */
export const signedIn: RequestHandler = (req, _res, next) => {
  requireActor(req);
  next();
};

/** Regenerates the session id (at sign-in) and resolves when it is saved. */
export function regenerate(req: Express.Request): Promise<void> {
  return new Promise((resolve, reject) =>
    req.session.regenerate((err) => (err ? reject(err) : resolve())),
  );
}

export function saveSession(req: Express.Request): Promise<void> {
  return new Promise((resolve, reject) =>
    req.session.save((err) => (err ? reject(err) : resolve())),
  );
}

export function destroySession(req: Express.Request): Promise<void> {
  return new Promise((resolve, reject) =>
    req.session.destroy((err) => (err ? reject(err) : resolve())),
  );
}
