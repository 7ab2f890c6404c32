import { performance } from 'node:perf_hooks';
import type { ReadingRow } from './reading-handler';

const SETTLE_SLICE_MS = 4;

type Pending = { rows: ReadingRow[]; done: (err?: unknown) => void };

export type BatchWriterOptions = {
  maxRows: number;
  flushMs: number;
  /** Flushes that may be in flight at once (each uses one database connection). */
  concurrency: number;
  insert: (rows: ReadingRow[]) => Promise<number>;
  /** Called after a batch is durable, with every row it carried. */
  onDurable?: (rows: ReadingRow[], inserted: number) => void;
};

/**
 * Collects rows from many messages and writes them in batches. Each caller's promise settles only when
 * the batch holding its rows is committed, so the broker can acknowledge a QoS 1 message only once its
 * readings are durable; if the write fails, every message in the batch is refused and will be re-sent.
 */
export class BatchWriter {
  private queue: Pending[] = [];
  private queuedRows = 0;
  private timer: NodeJS.Timeout | null = null;
  private inFlight = 0;
  private closed = false;
  readonly stats = { batches: 0, rows: 0, inserted: 0, failures: 0 };

  constructor(private readonly options: BatchWriterOptions) {}

  write(rows: ReadingRow[]): Promise<void> {
    return new Promise<void>((resolve, reject) => this.add(rows, (err) => (err === undefined ? resolve() : reject(err))));
  }

  /**
   * Like write(), with a callback instead of a promise: `done()` once the rows are committed,
   * `done(err)` when they are not. The broker uses this on the hot path (one call per message).
   */
  add(rows: ReadingRow[], done: (err?: unknown) => void): void {
    if (this.closed) return done(new Error('ingest is shutting down'));
    if (!rows.length) return done();
    this.queue.push({ rows, done });
    this.queuedRows += rows.length;
    if (this.queuedRows >= this.options.maxRows) this.kick();
    else this.timer ??= setTimeout(() => this.kick(), this.options.flushMs);
  }

  private kick(): void {
    if (this.timer) {
      clearTimeout(this.timer);
      this.timer = null;
    }
    while (this.queue.length && this.inFlight < this.options.concurrency) {
      const take: Pending[] = [];
      let count = 0;
      while (this.queue.length && count < this.options.maxRows) {
        const next = this.queue.shift();
        if (!next) break;
        take.push(next);
        count += next.rows.length;
      }
      this.queuedRows -= count;
      void this.flush(take);
    }
    if (this.queue.length && !this.timer) this.timer = setTimeout(() => this.kick(), this.options.flushMs);
  }

  private async flush(batch: Pending[]): Promise<void> {
    this.inFlight++;
    const rows: ReadingRow[] = [];
    for (const p of batch) for (const r of p.rows) rows.push(r);
    let inserted: number;
    try {
      inserted = await this.options.insert(rows);
    } catch (err) {
      this.stats.failures++;
      this.inFlight--;
      for (const p of batch) p.done(err ?? new Error('insert failed'));
      if (this.queue.length) this.kick();
      return;
    }
    this.stats.batches++;
    this.stats.rows += rows.length;
    this.stats.inserted += inserted;
    this.inFlight--;
    this.settle(batch);
    this.options.onDurable?.(rows, inserted);
    if (this.queue.length) this.kick();
  }

  /**
   * Calls the batch's callbacks in slices of a few milliseconds: each one acknowledges a message and lets
   * the broker read the next ones from that connection, and a batch holds thousands of messages, so doing
   * them all in one turn of the event loop would hold up HTTP requests for that long.
   */
  private settle(batch: Pending[], from = 0): void {
    const until = performance.now() + SETTLE_SLICE_MS;
    let i = from;
    while (i < batch.length) {
      batch[i++]!.done();
      if (i % 16 === 0 && performance.now() >= until) break;
    }
    if (i < batch.length) setImmediate(() => this.settle(batch, i));
  }

  /** Writes what is queued, then refuses new rows. */
  async close(): Promise<void> {
    this.closed = true;
    this.kick();
    while (this.inFlight > 0 || this.queue.length) {
      await new Promise((r) => setTimeout(r, 10));
      this.kick();
    }
  }
}
