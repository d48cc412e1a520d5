import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import pg from 'pg';
import { fileURLToPath } from 'node:url';
import * as schema from './schema/index.js';

export type Db = NodePgDatabase<typeof schema>;
/** A database handle or an open transaction: both run the same queries. */
export type Tx = Db | Parameters<Parameters<Db['transaction']>[0]>[0];

export interface Database {
  pool: pg.Pool;
  db: Db;
}

/** The database address to print: user, host, port and database, never the password. */
export function printableDatabaseUrl(url: string): string {
  try {
    const u = new URL(url);
    u.password = '';
    return u.toString();
  } catch {
    return '(an address that is not a URL)';
  }
}

/** Opens a pool and a Drizzle handle with snake_case columns. */
export function openDatabase(url: string, max = 10): Database {
  // A connection attempt gives up after 5 s so requests answer 503 during an outage instead of
  // waiting; broken clients are dropped by the pool and new ones made once PostgreSQL is back.
  const pool = new pg.Pool({ connectionString: url, max, connectionTimeoutMillis: 5000 });
  // An idle client losing its connection must not crash the process.
  pool.on('error', (err) => console.error('PostgreSQL pool error:', err.message));
  return { pool, db: drizzle(pool, { schema, casing: 'snake_case' }) };
}

export const migrationsFolder = fileURLToPath(new URL('../../migrations', import.meta.url));

/** Applies every committed migration not yet applied. */
export async function runMigrations(db: Db): Promise<void> {
  await migrate(db, { migrationsFolder });
}

export { schema };
