import type pg from 'pg';
import type { Config } from './config.js';
import type { Db } from './db/client.js';
import type { DevMail } from '../shared/schemas/members.js';

/** What the app is built from; main.ts and the tests each assemble one. */
export interface AppContext {
  db: Db;
  pool: pg.Pool;
  config: Config;
  /** Asks the outbox worker to send what is due (after a commit that queued mail). */
  kickMail: () => void;
  /** Messages held by the development mail fake, when it runs in this process. */
  devMail?: () => DevMail[];
}
