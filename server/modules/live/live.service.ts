import type { Redis } from 'ioredis';
import { liveEventSchema, type LiveEvent } from '../../../shared/schemas/live.schema';
import type { Logger } from '../../lib/logger';

type Listener = (event: LiveEvent) => void;

/**
 * Live events fanned out through Redis pub/sub, so any server process can serve any farm's stream:
 * whoever publishes (server or worker) reaches every process, which forwards to its own SSE clients.
 */
export class LiveService {
  private subscriber: Redis | null = null;
  private readonly listeners = new Map<string, Set<Listener>>();

  constructor(
    private readonly redis: Redis,
    private readonly prefix: string,
    private readonly logger: Logger,
  ) {}

  private channel(farmId: string) {
    return `${this.prefix}:live:${farmId}`;
  }

  async publish(event: Omit<LiveEvent, 'at'> & { at?: string }): Promise<void> {
    const full: LiveEvent = { ...event, at: event.at ?? new Date().toISOString() };
    await this.redis.publish(this.channel(full.farmId), JSON.stringify(full));
  }

  /** Publishes without making the caller wait or fail: live updates are a convenience, not a record. */
  notify(event: Omit<LiveEvent, 'at'>): void {
    this.publish(event).catch((err: unknown) => this.logger.debug({ err }, 'live event not published'));
  }

  async subscribe(farmId: string, listener: Listener): Promise<() => void> {
    if (!this.subscriber) {
      this.subscriber = this.redis.duplicate({ connectionName: 'gillwise-live' });
      await this.subscriber.psubscribe(`${this.prefix}:live:*`);
      this.subscriber.on('pmessage', (_pattern, channel, message) => {
        const farm = channel.slice(`${this.prefix}:live:`.length);
        const set = this.listeners.get(farm);
        if (!set?.size) return;
        let parsed: LiveEvent;
        try {
          parsed = liveEventSchema.parse(JSON.parse(message));
        } catch {
          return;
        }
        for (const l of set) l(parsed);
      });
    }
    let set = this.listeners.get(farmId);
    if (!set) this.listeners.set(farmId, (set = new Set()));
    set.add(listener);
    return () => {
      set.delete(listener);
    };
  }

  async close(): Promise<void> {
    this.listeners.clear();
    await this.subscriber?.quit().catch(() => undefined);
    this.subscriber = null;
  }
}
