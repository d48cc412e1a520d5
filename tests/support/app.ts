/**
 * A real app on a fresh database with the SMTP fake and the outbox worker, and an HTTP client
 * that keeps cookies and sends the CSRF header the way the Angular client does.
 */
import supertest from 'supertest';
import type { Express } from 'express';
import { createApp } from '../../server/app.js';
import { loadConfig } from '../../server/config.js';
import type { AppContext } from '../../server/context.js';
import {
  createMailTransport,
  startOutboxWorker,
  type OutboxWorker,
} from '../../server/mail/outbox.js';
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp.js';
import { DEMO_PASSWORD } from '../../server/seed/index.js';
import { freshDatabase, type TestDatabase } from './db.js';
import { closePdfPool } from '../../server/pdf/pool.js';
import { closeTrayEvents } from '../../server/trays/events.js';

export interface TestApp {
  app: Express;
  ctx: AppContext;
  database: TestDatabase;
  smtp: FakeSmtp;
  outbox: OutboxWorker;
  close: () => Promise<void>;
}

export async function testApp(): Promise<TestApp> {
  const database = await freshDatabase();
  const smtp = await startFakeSmtp();
  const config = loadConfig({
    databaseUrl: database.url,
    smtpUrl: smtp.url,
    appUrl: 'http://127.0.0.1:3999',
    development: true,
  });
  const outbox = startOutboxWorker(
    database.db,
    createMailTransport(smtp.url),
    config.mailFrom,
    200,
  );
  const ctx: AppContext = {
    db: database.db,
    pool: database.pool,
    config,
    kickMail: () => void outbox.kick(),
    devMail: () => smtp.messages(),
  };
  const app = createApp(ctx, { pruneSessions: false, clientDir: '/nonexistent' });
  return {
    app,
    ctx,
    database,
    smtp,
    outbox,
    close: async () => {
      await closeTrayEvents();
      await outbox.stop();
      await closePdfPool();
      await smtp.close();
      await database.drop();
    },
  };
}

type Method = 'get' | 'post' | 'patch' | 'put' | 'delete';

/** A browser-like client: a cookie jar, and X-XSRF-TOKEN on every changing request. */
export class Browser {
  readonly agent: ReturnType<typeof supertest.agent>;
  csrf = '';

  constructor(app: Express) {
    this.agent = supertest.agent(app);
  }

  private remember(res: supertest.Response): supertest.Response {
    const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
    for (const c of cookies) {
      const m = /^XSRF-TOKEN=([^;]*)/.exec(c);
      if (m) this.csrf = decodeURIComponent(m[1]!);
    }
    return res;
  }

  async ensureCsrf(): Promise<void> {
    if (!this.csrf) this.remember(await this.agent.get('/api/auth/csrf'));
  }

  /** Sends a request; `csrf: false` leaves the header out (to test the guard). */
  async send(method: Method, url: string, body?: unknown, options: { csrf?: boolean } = {}) {
    if (method !== 'get') await this.ensureCsrf();
    let req = this.agent[method](url);
    if (method !== 'get' && options.csrf !== false) req = req.set('X-XSRF-TOKEN', this.csrf);
    if (body !== undefined) req = req.send(body as object);
    return this.remember(await req);
  }

  get(url: string) {
    return this.send('get', url);
  }
  post(url: string, body?: unknown, options?: { csrf?: boolean }) {
    return this.send('post', url, body, options);
  }
  patch(url: string, body?: unknown, options?: { csrf?: boolean }) {
    return this.send('patch', url, body, options);
  }
  delete(url: string, options?: { csrf?: boolean }) {
    return this.send('delete', url, undefined, options);
  }

  async signIn(email: string, password = DEMO_PASSWORD): Promise<supertest.Response> {
    return this.post('/api/auth/sign-in', { email, password });
  }
}

/** A signed-in browser for one of the demo accounts (fails the test when sign-in fails). */
export async function signedIn(app: Express, email: string): Promise<Browser> {
  const b = new Browser(app);
  const res = await b.signIn(email);
  if (res.status !== 200) throw new Error(`Sign-in as ${email} failed: ${res.status} ${res.text}`);
  return b;
}
