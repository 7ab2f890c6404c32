// A probe as the fault tests drive it: mqtt.js, MQTT 3.1.1, QoS 1, clean: false and a short
// reconnect period, so it keeps every message the broker has not acknowledged and sends it again
// after a reconnect. Each message carries one sample at its own instant, so the instant identifies
// the message in the readings table.
import mqtt, { type MqttClient } from 'mqtt';
import { readingsTopic } from '../../../shared/mqtt/topics';

export type PublisherStats = {
  /** Messages handed to mqtt.js. */
  sent: number;
  /** Messages whose PUBACK came back. */
  acked: number;
  /** PUBLISH packets that went out on the wire, first sends and re-sends. */
  wirePublishes: number;
  /** PUBLISH packets re-sent by mqtt.js from its store after a reconnect (dup flag set). */
  resent: number;
  /**
   * Publishes mqtt.js gave up on ("Connection closed" for messages queued while it was replaying its
   * store) that this probe published again, as a real probe's sample buffer does.
   */
  republished: number;
  connects: number;
  closes: number;
};

export type Publisher = {
  client: MqttClient;
  stats: PublisherStats;
  /** Sample instants (ms) of the messages sent, and of those acknowledged, by message index. */
  sentAt: number[];
  ackedAt: Set<number>;
  /** Sends one message a tick until stopPublishing(). */
  startPublishing(everyMs: number): void;
  stopPublishing(): void;
  /** Timestamps of acknowledgements, to see when the broker acknowledged and when it refused. */
  ackTimes: number[];
  /** Waits until every message sent so far is acknowledged. */
  settle(timeoutMs: number): Promise<void>;
  end(): Promise<void>;
};

export const VALUES_PER_MESSAGE = 2;

export async function startPublisher(opts: { brokerUrl: string; probeKey: string; secret: string; firstAtMs: number; stepMs?: number }): Promise<Publisher> {
  const stepMs = opts.stepMs ?? 1000;
  const client = await mqtt.connectAsync(opts.brokerUrl, {
    protocolVersion: 4,
    clientId: opts.probeKey,
    username: opts.probeKey,
    password: opts.secret,
    clean: false,
    reconnectPeriod: 200,
    connectTimeout: 5000,
    keepalive: 10,
    // A refused CONNACK (code 3 while the database is away) must not end the reconnect loop.
    reconnectOnConnackError: true,
  });
  const stats: PublisherStats = { sent: 0, acked: 0, wirePublishes: 0, resent: 0, republished: 0, connects: 1, closes: 0 };
  const sentAt: number[] = [];
  const ackedAt = new Set<number>();
  const ackTimes: number[] = [];
  const pending = new Set<Promise<void>>();
  client.on('packetsend', (packet) => {
    if (packet.cmd !== 'publish') return;
    stats.wirePublishes++;
    if (packet.dup) stats.resent++;
  });
  client.on('connect', () => stats.connects++);
  client.on('close', () => stats.closes++);
  // Connection errors are expected here (refused connections while the server restarts).
  client.on('error', () => undefined);

  const topic = readingsTopic(opts.probeKey);
  let ending = false;
  const publishIndex = (index: number) => {
    const at = opts.firstAtMs + index * stepMs;
    const payload = JSON.stringify({
      v: 1,
      samples: [
        {
          at: new Date(at).toISOString(),
          values: [
            { quantity: 'dissolved_oxygen', value: 6 + (index % 20) / 10, unit: 'mg/L' },
            { quantity: 'water_temperature', value: 24 + (index % 10) / 10, unit: 'C' },
          ],
        },
      ],
    });
    const p = client.publishAsync(topic, payload, { qos: 1 }).then(
      () => {
        stats.acked++;
        ackedAt.add(at);
        ackTimes.push(Date.now());
      },
      () => {
        // Not acknowledged and dropped by the library: keep it and send it again.
        if (ending) return;
        stats.republished++;
        setTimeout(() => publishIndex(index), 100);
      },
    );
    pending.add(p);
    void p.finally(() => pending.delete(p));
  };
  const publishOne = () => {
    const index = sentAt.length;
    sentAt.push(opts.firstAtMs + index * stepMs);
    stats.sent++;
    publishIndex(index);
  };

  let timer: NodeJS.Timeout | null = null;
  return {
    client,
    stats,
    sentAt,
    ackedAt,
    ackTimes,
    startPublishing(everyMs) {
      timer = setInterval(publishOne, everyMs);
    },
    stopPublishing() {
      if (timer) clearInterval(timer);
      timer = null;
    },
    async settle(timeoutMs) {
      const deadline = Date.now() + timeoutMs;
      while (stats.acked < stats.sent) {
        if (Date.now() > deadline) {
          throw new Error(`publisher: ${stats.sent - stats.acked} of ${stats.sent} messages still unacknowledged after ${timeoutMs} ms`);
        }
        await new Promise((r) => setTimeout(r, 50));
      }
    },
    async end() {
      ending = true;
      if (timer) clearInterval(timer);
      await client.endAsync(true).catch(() => undefined);
    },
  };
}
