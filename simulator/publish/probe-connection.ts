// One MQTT connection per probe: clientId and username = probeKey, password = secret, MQTT 3.1.1
// (aedes 1.x), persistent session (clean: false), QoS 1. Reconnects with exponential backoff.
//
// mqtt.js keeps an unacknowledged QoS 1 packet in its outgoing store and resends it after a
// reconnect, so a publish in flight when the link drops stays pending and resolves on the later
// PUBACK. When this connection is replaced or stopped, pending publishes are rejected instead, and
// the sample queue sends those samples again on the next connection.
import { type IClientOptions, type MqttClient, connectAsync } from 'mqtt';
import type { Logger } from '../log';

export class NotConnectedError extends Error {
  override readonly name = 'NotConnectedError';
}

export interface ProbeConnectionOptions {
  brokerUrl: string;
  probeKey: string;
  secret: string;
  log: Logger;
  onConnect?: () => void;
  minBackoffMs?: number;
  maxBackoffMs?: number;
  /** Replaceable for tests. */
  connect?: (url: string, options: IClientOptions) => Promise<MqttClient>;
}

const describe = (error: unknown): string => (error instanceof Error ? error.message || error.name : String(error));

export class ProbeConnection {
  private client: MqttClient | null = null;
  private stopped = false;
  private wantOnline = true;
  private connecting = false;
  private backoffMs: number;
  private reconnectTimer: ReturnType<typeof setTimeout> | null = null;
  private inFlight = 0;
  private refusedStreak = 0;
  private lastError = '';
  private wake: (() => void) | null = null;
  private abort: { reject: (error: Error) => void; promise: Promise<never> } = makeAbort();
  private readonly minBackoffMs: number;
  private readonly maxBackoffMs: number;

  constructor(private readonly options: ProbeConnectionOptions) {
    this.minBackoffMs = options.minBackoffMs ?? 1000;
    this.maxBackoffMs = options.maxBackoffMs ?? 60_000;
    this.backoffMs = this.minBackoffMs;
  }

  get connected(): boolean {
    return this.client?.connected === true;
  }

  get online(): boolean {
    return this.wantOnline;
  }

  start(): void {
    if (this.stopped || this.client || this.connecting) return;
    void this.connectLoop();
  }

  /** Takes the link down (dropout scenario) or brings it back; samples keep buffering meanwhile. */
  setOnline(online: boolean): void {
    if (online === this.wantOnline) return;
    this.wantOnline = online;
    if (online) {
      this.options.log.info('link back up');
      this.backoffMs = this.minBackoffMs;
      this.start();
    } else {
      this.options.log.info('link down (dropout): buffering');
      this.wake?.();
      this.dropClient();
    }
  }

  private nextBackoff(): number {
    const wait = this.backoffMs * (0.8 + 0.4 * Math.random());
    this.backoffMs = Math.min(this.maxBackoffMs, this.backoffMs * 2);
    return wait;
  }

  private logErrorOnce(message: string): void {
    if (message === this.lastError) {
      this.options.log.debug(message);
      return;
    }
    this.lastError = message;
    this.options.log.warn(message);
  }

  private async connectLoop(): Promise<void> {
    this.connecting = true;
    const connect = this.options.connect ?? connectAsync;
    try {
      while (!this.stopped && this.wantOnline) {
        try {
          const client = await connect(this.options.brokerUrl, {
            clientId: this.options.probeKey,
            username: this.options.probeKey,
            password: this.options.secret,
            protocolVersion: 4,
            clean: false,
            keepalive: 30,
            connectTimeout: 10_000,
            reconnectPeriod: 0, // reconnects are scheduled here, with backoff
            resubscribe: false,
          });
          if (this.stopped || !this.wantOnline) {
            client.end(true);
            return;
          }
          this.attach(client);
          return;
        } catch (error) {
          const wait = this.nextBackoff();
          this.logErrorOnce(`cannot connect: ${describe(error)}; retrying in ${(wait / 1000).toFixed(1)} s`);
          await new Promise<void>((resolve) => {
            const timer = setTimeout(resolve, wait);
            this.wake = () => {
              clearTimeout(timer);
              resolve();
            };
          });
          this.wake = null;
        }
      }
    } finally {
      this.connecting = false;
    }
  }

  private attach(client: MqttClient): void {
    this.client = client;
    this.abort = makeAbort();
    this.lastError = '';
    if (this.refusedStreak === 0) this.backoffMs = this.minBackoffMs;
    this.options.log.info(`connected to ${this.options.brokerUrl}`);
    client.on('error', (error) => {
      if (this.client === client) this.logErrorOnce(`mqtt: ${describe(error)}`);
    });
    client.on('connect', () => {
      if (this.client !== client) return;
      if (this.refusedStreak === 0) this.backoffMs = this.minBackoffMs;
      this.lastError = '';
      this.options.log.info('reconnected');
      this.options.onConnect?.();
    });
    client.on('close', () => {
      if (this.client !== client || this.stopped) return;
      if (this.inFlight > 0) {
        // MQTT 3.1.1 has no negative PUBACK: a broker refusing a publish (ACL) closes the connection.
        this.refusedStreak += 1;
        if (this.refusedStreak === 1) {
          this.options.log.warn('broker closed the connection during a publish (refused by its ACL?); backing off');
        }
      }
      const wait = this.nextBackoff();
      this.options.log.debug(`disconnected; reconnecting in ${(wait / 1000).toFixed(1)} s`);
      this.clearReconnectTimer();
      this.reconnectTimer = setTimeout(() => {
        this.reconnectTimer = null;
        if (this.client === client && !this.stopped && this.wantOnline && !client.connected) client.reconnect();
      }, wait);
    });
    this.options.onConnect?.();
  }

  /** Publishes at QoS 1; resolves on PUBACK. Rejects when not connected or when this connection is replaced. */
  async publish(topic: string, payload: string): Promise<void> {
    const client = this.client;
    if (!client || !client.connected) throw new NotConnectedError('not connected');
    this.inFlight += 1;
    try {
      await Promise.race([client.publishAsync(topic, payload, { qos: 1 }), this.abort.promise]);
      this.refusedStreak = 0;
      this.backoffMs = this.minBackoffMs;
    } finally {
      this.inFlight -= 1;
    }
  }

  private clearReconnectTimer(): void {
    if (this.reconnectTimer) clearTimeout(this.reconnectTimer);
    this.reconnectTimer = null;
  }

  private dropClient(): void {
    this.clearReconnectTimer();
    const client = this.client;
    this.client = null;
    this.abort.reject(new NotConnectedError('connection closed'));
    if (client) client.end(true);
  }

  /** Ends the connection: politely (DISCONNECT) when nothing is in flight, otherwise at once. */
  async stop(): Promise<void> {
    this.stopped = true;
    this.wake?.();
    this.clearReconnectTimer();
    const client = this.client;
    this.client = null;
    this.abort.reject(new NotConnectedError('stopped'));
    if (!client) return;
    const force = this.inFlight > 0 || !client.connected;
    await Promise.race([client.endAsync(force).catch(() => undefined), sleep(1000)]);
    if (!client.disconnected) client.end(true);
  }
}

function makeAbort(): { reject: (error: Error) => void; promise: Promise<never> } {
  let reject: (error: Error) => void = () => undefined;
  const promise = new Promise<never>((_resolve, rej) => {
    reject = rej;
  });
  promise.catch(() => undefined); // an abort nobody is waiting for is not an unhandled rejection
  return { reject, promise };
}

function sleep(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms));
}
