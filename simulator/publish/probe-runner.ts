// One simulated probe: its model, its buffer and its MQTT connection, driven by a timer.
import { readingsTopic } from '../../shared/mqtt/topics';
import type { ReadingSample } from '../../shared/schemas/mqtt.schema';
import type { ProbeCredential } from '../credentials';
import type { Logger } from '../log';
import { type FarmWeather, ProbeModel, type TemperatureUnit, probeTelemetry, unsupportedQuantities } from '../models';
import { HOUR_MS } from '../models/clock';
import { type ScenarioEffects, createScenario } from '../scenarios';
import { buildReadingsPayload } from './payload';
import { NotConnectedError, ProbeConnection } from './probe-connection';
import { SampleQueue } from './sample-queue';

export interface RunnerStats {
  samplesSent: number;
  messagesSent: number;
  samplesDropped: number;
}

export interface ProbeRunnerOptions {
  credential: ProbeCredential;
  brokerUrl: string;
  scenarioText: string | undefined;
  temperatureUnit: TemperatureUnit;
  intervalSeconds: number;
  weather: FarmWeather;
  seed: number | string;
  /** Model time = runStart + (wall − runStart) × speed. */
  speed: number;
  runStartMs: number;
  backfillHours: number;
  bufferCapacity: number;
  log: Logger;
  stats: RunnerStats;
  now?: () => number;
  minBackoffMs?: number;
}

export class ProbeRunner {
  readonly probeKey: string;
  readonly queue: SampleQueue;
  private connection: ProbeConnection;
  private model: ProbeModel;
  private scenario: ScenarioEffects;
  private timer: ReturnType<typeof setInterval> | null = null;
  private readonly topic: string;
  private readonly now: () => number;
  private options: ProbeRunnerOptions;

  constructor(options: ProbeRunnerOptions) {
    this.options = options;
    this.probeKey = options.credential.probeKey;
    this.topic = readingsTopic(this.probeKey);
    this.now = options.now ?? Date.now;
    const log = options.log;
    this.scenario = this.buildScenario(options);
    const modelStart = options.runStartMs - options.backfillHours * HOUR_MS;
    this.model = this.buildModel(options, modelStart);
    this.queue = new SampleQueue({
      capacity: options.bufferCapacity,
      publish: async (payload) => {
        await this.connection.publish(this.topic, JSON.stringify(payload));
        options.stats.messagesSent += 1;
        options.stats.samplesSent += payload.samples.length;
      },
      makePayload: (samples) =>
        buildReadingsPayload(samples, probeTelemetry(options.seed, this.probeKey, this.modelTime(this.now())), this.now()),
      onDrop: (count) => {
        options.stats.samplesDropped += count;
        log.warn(`buffer full (${options.bufferCapacity} samples): dropped the ${count} oldest`);
      },
    });
    this.connection = this.buildConnection(options.credential.secret);
    const unsupported = unsupportedQuantities(this.model.probe);
    if (unsupported.length > 0) log.warn(`a ${options.credential.unitKind} has no ${unsupported.join(', ')}; not published`);
    if (this.scenario.name !== 'steady') log.info(`scenario ${this.scenario.description}`);
  }

  private buildScenario(options: ProbeRunnerOptions): ScenarioEffects {
    return createScenario(options.scenarioText, { startMs: options.runStartMs, timeZone: options.weather.site.timeZone });
  }

  private buildModel(options: ProbeRunnerOptions, startMs: number): ProbeModel {
    const c = options.credential;
    return new ProbeModel({
      probe: { ...c, temperatureUnit: options.temperatureUnit },
      weather: options.weather,
      seed: options.seed,
      startMs,
      scenario: this.scenario,
    });
  }

  private buildConnection(secret: string): ProbeConnection {
    return new ProbeConnection({
      brokerUrl: this.options.brokerUrl,
      probeKey: this.probeKey,
      secret,
      log: this.options.log,
      onConnect: () => this.flushSoon(),
      ...(this.options.minBackoffMs === undefined ? {} : { minBackoffMs: this.options.minBackoffMs }),
    });
  }

  get connected(): boolean {
    return this.connection.connected;
  }

  get intervalSeconds(): number {
    return this.options.intervalSeconds;
  }

  modelTime(wallMs: number): number {
    const { runStartMs, speed } = this.options;
    return runStartMs + (wallMs - runStartMs) * speed;
  }

  /** History for the hours before the start, at the publish interval (coarser if it would overflow the buffer). */
  private backfill(): void {
    const hours = this.options.backfillHours;
    if (hours <= 0) return;
    const spanMs = hours * HOUR_MS;
    const stepMs = Math.max(this.options.intervalSeconds * 1000, Math.ceil(spanMs / this.options.bufferCapacity / 1000) * 1000);
    const samples: ReadingSample[] = [];
    for (let t = this.options.runStartMs - spanMs; t < this.options.runStartMs; t += stepMs) {
      const sample = this.model.sampleAt(t);
      if (sample.values.length > 0) samples.push(sample);
    }
    this.queue.push(...samples);
    this.options.log.info(`backfill: ${samples.length} samples over the last ${hours} h, every ${stepMs / 1000} s`);
  }

  /** Takes one sample now and queues it. */
  tick(): void {
    const wall = this.now();
    const modelMs = this.modelTime(wall);
    this.model.advanceTo(modelMs);
    const values = this.model.observe();
    if (values.length > 0) this.queue.push({ at: new Date(wall).toISOString(), values });
    this.connection.setOnline(!this.scenario.offline(modelMs));
    this.flushSoon();
  }

  private flushSoon(): void {
    if (!this.connection.connected || this.queue.flushing || this.queue.size === 0) return;
    void this.queue.flush().then((result) => {
      if (result.error && !(result.error instanceof NotConnectedError)) {
        this.options.log.debug(`publish failed: ${String(result.error)}; ${this.queue.size} samples kept`);
      }
      if (!result.error && this.queue.size > 0) this.flushSoon();
    });
  }

  start(): void {
    this.backfill();
    this.connection.start();
    this.tick();
    this.timer = setInterval(() => this.tick(), this.options.intervalSeconds * 1000);
  }

  /** Backfill plus one sample, sent; resolves true when everything was acknowledged within the timeout. */
  async runOnce(timeoutMs: number): Promise<boolean> {
    this.backfill();
    this.tick();
    this.connection.start();
    const deadline = this.now() + timeoutMs;
    while (this.queue.size > 0 && this.now() < deadline) {
      this.flushSoon();
      await sleep(25);
    }
    return this.queue.size === 0;
  }

  /** New secret (rotated in Setup): reconnect with it; buffered samples are kept. */
  async rotate(credential: ProbeCredential): Promise<void> {
    this.options = { ...this.options, credential };
    const old = this.connection;
    this.connection = this.buildConnection(credential.secret);
    await old.stop();
    this.options.log.info('secret rotated: reconnecting');
    this.connection.start();
  }

  /** The unit's description changed: rebuild the model from now on; buffered samples are kept. */
  update(options: Pick<ProbeRunnerOptions, 'credential' | 'scenarioText' | 'temperatureUnit' | 'intervalSeconds'>): void {
    this.options = { ...this.options, ...options };
    this.scenario = this.buildScenario(this.options);
    this.model = this.buildModel(this.options, this.modelTime(this.now()));
    if (this.timer) {
      clearInterval(this.timer);
      this.timer = setInterval(() => this.tick(), this.options.intervalSeconds * 1000);
    }
    this.options.log.info('probe details changed: model rebuilt');
  }

  /** Stops sampling, tries to send what is buffered until `deadlineMs`, then ends the connection. Returns samples left unsent. */
  async stop(deadlineMs: number): Promise<number> {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    while (this.queue.size > 0 && this.connection.connected && this.now() < deadlineMs) {
      this.flushSoon();
      await sleep(25);
    }
    await this.connection.stop();
    return this.queue.size;
  }
}

function sleep(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms));
}
