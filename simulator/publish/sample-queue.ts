// Per-probe buffer of samples not yet acknowledged by the broker. A sample leaves the buffer only
// after the publish carrying it resolves (PUBACK); a failed publish leaves its samples at the head,
// to go again in order. Delivery is therefore at least once; ingest drops duplicates.
import type { ProbeReadingsPayload, ReadingSample } from '../../shared/schemas/mqtt.schema';
import { MAX_READINGS_PAYLOAD_BYTES } from '../../shared/schemas/mqtt.schema';
import { payloadBytes } from './payload';

export interface SampleQueueOptions {
  /** Sends one payload; resolves on PUBACK, rejects on any failure. */
  publish: (payload: ProbeReadingsPayload) => Promise<void>;
  /** Wraps samples in a payload (adds v, sentAt, battery, RSSI). */
  makePayload: (samples: readonly ReadingSample[]) => ProbeReadingsPayload;
  /** Most samples kept; the oldest unsent ones are dropped beyond it (default 10 000). */
  capacity?: number;
  /** Most samples in one message (default 200). */
  maxSamplesPerMessage?: number;
  /** Largest message, bytes (default the broker's limit, MAX_READINGS_PAYLOAD_BYTES). */
  maxPayloadBytes?: number;
  /** Told how many samples were dropped because the buffer was full. */
  onDrop?: (count: number) => void;
}

export interface FlushResult {
  sentSamples: number;
  sentMessages: number;
  /** The error of the publish that stopped this flush, if one failed. */
  error?: unknown;
}

export class SampleQueue {
  private items: ReadingSample[] = [];
  /** The first `inFlight` items are in the message being published. */
  private inFlight = 0;
  private running: Promise<FlushResult> | null = null;
  private readonly capacity: number;
  private readonly maxSamples: number;
  private readonly maxBytes: number;
  droppedTotal = 0;

  constructor(private readonly options: SampleQueueOptions) {
    this.capacity = options.capacity ?? 10_000;
    this.maxSamples = Math.min(1000, options.maxSamplesPerMessage ?? 200);
    this.maxBytes = options.maxPayloadBytes ?? MAX_READINGS_PAYLOAD_BYTES;
  }

  /** Samples waiting, including any in flight. */
  get size(): number {
    return this.items.length;
  }

  get flushing(): boolean {
    return this.running !== null;
  }

  push(...samples: ReadingSample[]): void {
    this.items.push(...samples);
    const excess = this.items.length - this.capacity;
    if (excess > 0) {
      // Drop the oldest samples that are not in flight: the newest data matters most to the farm.
      const removable = Math.min(excess, this.items.length - this.inFlight);
      this.items.splice(this.inFlight, removable);
      this.droppedTotal += removable;
      this.options.onDrop?.(removable);
    }
  }

  /** Sends until the buffer is empty or a publish fails. Concurrent calls share one run. */
  flush(): Promise<FlushResult> {
    if (!this.running) {
      this.running = this.run().finally(() => {
        this.running = null;
      });
    }
    return this.running;
  }

  private buildChunk(): { count: number; payload: ProbeReadingsPayload } {
    let count = Math.min(this.maxSamples, this.items.length);
    for (;;) {
      const payload = this.options.makePayload(this.items.slice(0, count));
      if (count === 1 || payloadBytes(payload) <= this.maxBytes) return { count, payload };
      count = Math.max(1, Math.floor(count / 2));
    }
  }

  private async run(): Promise<FlushResult> {
    const result: FlushResult = { sentSamples: 0, sentMessages: 0 };
    while (this.items.length > 0) {
      const { count, payload } = this.buildChunk();
      this.inFlight = count;
      try {
        await this.options.publish(payload);
      } catch (error) {
        this.inFlight = 0;
        result.error = error;
        return result;
      }
      this.items.splice(0, count);
      this.inFlight = 0;
      result.sentSamples += count;
      result.sentMessages += 1;
    }
    return result;
  }
}
