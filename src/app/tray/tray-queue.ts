import type { TrayLineUpdate } from '../../../shared/schemas/trays';

/** One tap waiting to be sent: the line and what the tap changed. */
export interface QueuedTap {
  partCode: string;
  change: TrayLineUpdate;
}

/**
 * The taps of one tray not yet confirmed by the server, kept in the browser's storage so they
 * survive a reload and a lost network; each tap is sent as its own request, in order.
 */
export class TapQueue {
  private taps: QueuedTap[];

  constructor(
    private readonly key: string,
    private readonly storage: Storage | null = globalThis.localStorage ?? null,
  ) {
    this.taps = this.read();
  }

  get length(): number {
    return this.taps.length;
  }

  /** The oldest tap waiting, if any. */
  peek(): QueuedTap | undefined {
    return this.taps[0];
  }

  push(tap: QueuedTap): void {
    this.taps.push(tap);
    this.write();
  }

  /** Drops the oldest tap (it was saved, or the server refused it for good). */
  shift(): void {
    this.taps.shift();
    this.write();
  }

  /** Every waiting tap, oldest first. */
  all(): readonly QueuedTap[] {
    return this.taps;
  }

  private read(): QueuedTap[] {
    try {
      const raw = this.storage?.getItem(this.key);
      const list: unknown = raw ? JSON.parse(raw) : [];
      return Array.isArray(list)
        ? list.filter(
            (t): t is QueuedTap =>
              typeof t === 'object' && t !== null && typeof t.partCode === 'string',
          )
        : [];
    } catch {
      return [];
    }
  }

  private write(): void {
    try {
      if (this.taps.length) this.storage?.setItem(this.key, JSON.stringify(this.taps));
      else this.storage?.removeItem(this.key);
    } catch {
      // Storage full or blocked (private mode): the taps still wait in memory.
    }
  }
}
