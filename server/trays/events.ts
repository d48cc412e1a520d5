/**
 * Live tray changes between instances of the server: a change is announced with PostgreSQL's
 * NOTIFY in the transaction that saves it (delivered on commit, to every instance), and each
 * instance LISTENs on one dedicated connection (not the pool: a pooled client would be handed
 * to other queries) and pushes the lesson's fresh board to its open event streams.
 */
import pg from 'pg';
import { sql } from 'drizzle-orm';
import type { Tx } from '../db/client.js';
import type { TrayBoard } from '../../shared/schemas/trays.js';

export const TRAY_CHANNEL = 'trayplan_trays';

/** Announces that a lesson's trays changed; call inside the transaction that changed them. */
export async function notifyTrayChange(tx: Tx, lessonId: string): Promise<void> {
  await tx.execute(sql`SELECT pg_notify(${TRAY_CHANNEL}, ${lessonId})`);
}

/** One open stream of a lesson's board. */
export interface TrayStream {
  send: (board: TrayBoard) => void;
  /** Ends the stream (the server is shutting down). */
  end: () => void;
}

/** Bursts of ticks within this many milliseconds become one board. */
const DEBOUNCE_MS = 60;
const RECONNECT_MS = 1_000;

const hubs = new Set<TrayEvents>();

/** The LISTEN side in one instance: streams per lesson and the connection that feeds them. */
export class TrayEvents {
  private readonly streams = new Map<string, Set<TrayStream>>();
  private readonly pending = new Map<string, NodeJS.Timeout>();
  private client: pg.Client | null = null;
  private connecting: Promise<void> | null = null;
  private closed = false;

  constructor(
    private readonly databaseUrl: string,
    private readonly loadBoard: (lessonId: string) => Promise<TrayBoard>,
  ) {
    hubs.add(this);
  }

  /** Adds a stream of a lesson once this instance listens; returns its removal. */
  async subscribe(lessonId: string, stream: TrayStream): Promise<() => void> {
    await this.listen();
    const set = this.streams.get(lessonId) ?? new Set();
    set.add(stream);
    this.streams.set(lessonId, set);
    return () => {
      set.delete(stream);
      if (!set.size) this.streams.delete(lessonId);
    };
  }

  private listen(): Promise<void> {
    if (this.client) return Promise.resolve();
    this.connecting ??= (async () => {
      const client = new pg.Client({ connectionString: this.databaseUrl });
      client.on('notification', (msg) => {
        if (msg.channel === TRAY_CHANNEL && msg.payload) this.changed(msg.payload);
      });
      client.on('error', () => this.lost(client));
      client.on('end', () => this.lost(client));
      try {
        await client.connect();
        await client.query(`LISTEN ${TRAY_CHANNEL}`);
        this.client = client;
      } finally {
        this.connecting = null;
      }
    })();
    return this.connecting;
  }

  /** The connection dropped: listen again and send every open lesson's board (catch-up). */
  private lost(client: pg.Client): void {
    if (this.client !== client) return;
    this.client = null;
    void client.end().catch(() => {});
    if (this.closed) return;
    const retry = () => {
      if (this.closed || !this.streams.size) return;
      this.listen().then(
        () => {
          for (const lessonId of this.streams.keys()) this.changed(lessonId);
        },
        () => setTimeout(retry, RECONNECT_MS).unref(),
      );
    };
    setTimeout(retry, RECONNECT_MS).unref();
  }

  private changed(lessonId: string): void {
    if (!this.streams.has(lessonId) || this.pending.has(lessonId)) return;
    const timer = setTimeout(() => {
      this.pending.delete(lessonId);
      void this.push(lessonId);
    }, DEBOUNCE_MS);
    this.pending.set(lessonId, timer);
  }

  private async push(lessonId: string): Promise<void> {
    const set = this.streams.get(lessonId);
    if (!set?.size) return;
    try {
      const board = await this.loadBoard(lessonId);
      for (const s of set) s.send(board);
    } catch (err) {
      console.error('Could not send a tray board:', err);
    }
  }

  /** Ends every stream and the LISTEN connection (server shutdown). */
  async close(): Promise<void> {
    this.closed = true;
    hubs.delete(this);
    for (const t of this.pending.values()) clearTimeout(t);
    this.pending.clear();
    for (const set of this.streams.values()) for (const s of set) s.end();
    this.streams.clear();
    await this.connecting?.catch(() => {});
    const client = this.client;
    this.client = null;
    await client?.end().catch(() => {});
  }
}

/** Ends every open tray stream of this process (shutdown, and the end of a test). */
export async function closeTrayEvents(): Promise<void> {
  await Promise.all([...hubs].map((h) => h.close()));
}
