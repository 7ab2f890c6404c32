// The simulator process minus its CLI: loads credentials, runs one ProbeRunner per probe, re-reads
// the credential file, and shuts down gracefully. Tests drive it through startSimulator().
import type { SimulatorConfig } from './config';
import { type ProbeCredential, diffCredentials, readCredentialFile } from './credentials';
import type { Logger } from './log';
import { type FarmSite, type FarmWeather, farmWeatherFor } from './models';
import { type RunnerStats, ProbeRunner } from './publish/probe-runner';
import { ScenarioParamError, createScenario, parseScenarioText } from './scenarios';

export interface SimulatorHandle {
  /** Resolves with the exit code: after --once, after stop(), or 2 on a fatal configuration problem. */
  done: Promise<number>;
  stop(): Promise<void>;
  /** Re-reads the credential file now (SIGHUP). */
  reload(): Promise<void>;
  readonly runners: ReadonlyMap<string, ProbeRunner>;
}

export interface SimulatorDeps {
  log: Logger;
  now?: () => number;
  /** How long --once waits for acknowledgements (default 15 s). */
  onceTimeoutMs?: number;
  /** How long the missing-file retry waits (default 5 s). */
  retryMs?: number;
  minBackoffMs?: number;
}

const SHUTDOWN_FLUSH_MS = 3000;
const BURST_INTERVAL_SECONDS = 0.1;

/** Which entries run: deduplicated, --only, then the first --probes N. */
export function selectProbes(entries: readonly ProbeCredential[], config: Pick<SimulatorConfig, 'only' | 'probes'>): ProbeCredential[] {
  const seen = new Set<string>();
  let list = entries.filter((e) => (seen.has(e.probeKey) ? false : (seen.add(e.probeKey), true)));
  if (config.only.length > 0) list = list.filter((e) => config.only.includes(e.probeKey));
  if (config.probes !== undefined) list = list.slice(0, config.probes);
  return list;
}

/**
 * A probe's scenario: its credential entry wins unless it says `steady`; otherwise --scenario.
 * `--scenario flow-cut` cuts one raceway only (the first in the file), as the scenario describes.
 */
export function scenarioFor(entry: ProbeCredential, flag: string | undefined, firstRacewayKey: string | undefined): string | undefined {
  const own = entry.scenario.trim();
  if (own !== '' && own !== 'steady') return own;
  if (flag === undefined) return undefined;
  if (parseScenarioText(flag).name === 'flow-cut' && entry.probeKey !== firstRacewayKey) return undefined;
  return flag;
}

/** A farm's time zone and position: its --farm entry, else the global --tz / --lat / --lon. */
export function siteFor(
  config: Pick<SimulatorConfig, 'farms' | 'timeZone' | 'latitude' | 'longitude'>,
  farmSlug: string,
): Partial<FarmSite> {
  const own = config.farms[farmSlug] ?? {};
  const latitude = own.latitude ?? (own.longitude === undefined ? config.latitude : undefined);
  const longitude = own.longitude ?? (own.latitude === undefined ? config.longitude : undefined);
  return {
    timeZone: own.timeZone ?? config.timeZone,
    ...(latitude === undefined ? {} : { latitude }),
    ...(longitude === undefined ? {} : { longitude }),
  };
}

export function startSimulator(config: SimulatorConfig, deps: SimulatorDeps): SimulatorHandle {
  const log = deps.log;
  const now = deps.now ?? Date.now;
  const runStartMs = now();
  const runners = new Map<string, ProbeRunner>();
  const credentials = new Map<string, ProbeCredential>();
  const weathers = new Map<string, FarmWeather>();
  const stats: RunnerStats = { samplesSent: 0, messagesSent: 0, samplesDropped: 0 };
  let stopped = false;
  let lastProblem = '';
  let reloadTimer: ReturnType<typeof setInterval> | null = null;
  let summaryTimer: ReturnType<typeof setInterval> | null = null;
  let retryTimer: ReturnType<typeof setTimeout> | null = null;
  let loading: Promise<boolean> | null = null;
  let resolveDone: (code: number) => void = () => undefined;
  const done = new Promise<number>((resolve) => {
    resolveDone = resolve;
  });

  const problemOnce = (message: string, level: 'warn' | 'error' = 'warn'): void => {
    if (message === lastProblem) return;
    lastProblem = message;
    log[level](message);
  };

  const weatherFor = (farmSlug: string): FarmWeather => {
    let weather = weathers.get(farmSlug);
    if (!weather) {
      weather = farmWeatherFor({ seed: config.seed, farmSlug, site: siteFor(config, farmSlug) });
      weathers.set(farmSlug, weather);
    }
    return weather;
  };

  const runnerSettings = (entry: ProbeCredential, firstRacewayKey: string | undefined) => {
    let scenarioText = scenarioFor(entry, config.scenario, firstRacewayKey);
    try {
      createScenario(scenarioText, { startMs: runStartMs, timeZone: siteFor(config, entry.farmSlug).timeZone ?? 'UTC' });
    } catch (error) {
      if (!(error instanceof ScenarioParamError)) throw error;
      log.warn(`[${entry.probeKey}] scenario ${JSON.stringify(scenarioText)}: ${error.message}; using steady`);
      scenarioText = undefined;
    }
    const burst = scenarioText !== undefined && parseScenarioText(scenarioText).name === 'burst';
    return {
      scenarioText,
      temperatureUnit: entry.temperatureUnit ?? (config.fahrenheit.includes(entry.probeKey) ? 'F' : 'C'),
      intervalSeconds: config.intervalSeconds ?? (burst ? BURST_INTERVAL_SECONDS : entry.intervalSeconds),
      burst,
    } as const;
  };

  /** Applies a freshly read file. Returns false on a fatal problem (burst without enough credentials). */
  async function apply(brokerUrlFromFile: string, entries: readonly ProbeCredential[]): Promise<boolean> {
    // The file may carry each farm's time zone and position; a --farm flag still wins.
    for (const e of entries) {
      if (e.farmTimeZone && !config.farms[e.farmSlug]) {
        config.farms[e.farmSlug] = {
          timeZone: e.farmTimeZone,
          ...(e.latitude === undefined ? {} : { latitude: e.latitude }),
          ...(e.longitude === undefined ? {} : { longitude: e.longitude }),
        };
      }
    }
    const selected = selectProbes(entries, config);
    const firstRacewayKey = selected.find((e) => e.unitKind === 'raceway')?.probeKey;
    const settings = new Map(selected.map((e) => [e.probeKey, runnerSettings(e, firstRacewayKey)]));
    const anyBurst = [...settings.values()].some((s) => s.burst);
    if (config.probes !== undefined && selected.length < config.probes) {
      const message =
        `asked for ${config.probes} probes but the credential file has ${selected.length}` +
        ' (each simulated probe needs its own credential: the broker uses the probeKey as MQTT clientId,' +
        ' so a shared credential would knock the other connection off)';
      if (anyBurst) {
        log.error(`burst: ${message}. Add probes in Setup or seed more, then retry.`);
        return false;
      }
      problemOnce(message);
    }
    const brokerUrl = config.brokerUrl ?? brokerUrlFromFile;
    const diff = diffCredentials(credentials, selected);
    for (const key of diff.removed) {
      const runner = runners.get(key);
      runners.delete(key);
      credentials.delete(key);
      log.info(`[${key}] removed from the credential file: stopping`);
      if (runner) await runner.stop(now());
    }
    for (const entry of diff.rotated) {
      credentials.set(entry.probeKey, entry);
      await runners.get(entry.probeKey)?.rotate(entry);
    }
    for (const entry of diff.changed) {
      credentials.set(entry.probeKey, entry);
      const s = settings.get(entry.probeKey);
      if (s) runners.get(entry.probeKey)?.update({ credential: entry, ...s });
    }
    for (const entry of diff.added) {
      const s = settings.get(entry.probeKey);
      if (!s) continue;
      credentials.set(entry.probeKey, entry);
      const runner = new ProbeRunner({
        credential: entry,
        brokerUrl,
        scenarioText: s.scenarioText,
        temperatureUnit: s.temperatureUnit,
        intervalSeconds: s.intervalSeconds,
        weather: weatherFor(entry.farmSlug),
        seed: config.seed,
        speed: config.speed,
        runStartMs,
        backfillHours: config.backfillHours,
        bufferCapacity: config.bufferCapacity,
        log: log.child(entry.probeKey),
        stats,
        now,
        ...(deps.minBackoffMs === undefined ? {} : { minBackoffMs: deps.minBackoffMs }),
      });
      runners.set(entry.probeKey, runner);
      if (!config.once) runner.start();
    }
    if (diff.added.length > 0 && !config.once) {
      const zones = [...new Set([...runners.keys()].map((k) => siteFor(config, credentials.get(k)?.farmSlug ?? '').timeZone))];
      log.info(
        `${runners.size} probes publishing to ${brokerUrl} (seed ${config.seed}, speed ×${config.speed}, farm time ${zones.join(', ')})`,
      );
    }
    return true;
  }

  async function load(): Promise<boolean> {
    const read = await readCredentialFile(config.credentialsFile);
    if (!read.ok) {
      if (read.reason === 'missing' && runners.size === 0) {
        problemOnce(
          `waiting for the probe credential file at ${config.credentialsFile} (the demo seed writes it; set PROBE_CREDENTIALS_FILE or --credentials to use another)`,
        );
      } else {
        problemOnce(`${read.message}; keeping the probes already running`, 'error');
      }
      return false;
    }
    lastProblem = '';
    if (read.file.probes.length === 0) problemOnce(`${config.credentialsFile} lists no probes yet; add them in Setup`);
    const ok = await apply(read.file.brokerUrl, read.file.probes);
    if (!ok) {
      await shutdown(2);
      return false;
    }
    return true;
  }

  function reload(): Promise<boolean> {
    if (stopped) return Promise.resolve(false);
    loading ??= load().finally(() => {
      loading = null;
    });
    return loading;
  }

  async function shutdown(code: number): Promise<void> {
    if (stopped) return;
    stopped = true;
    if (reloadTimer) clearInterval(reloadTimer);
    if (summaryTimer) clearInterval(summaryTimer);
    if (retryTimer) clearTimeout(retryTimer);
    const deadline = now() + SHUTDOWN_FLUSH_MS;
    const left = await Promise.all([...runners.values()].map((r) => r.stop(deadline)));
    const unsent = left.reduce((a, b) => a + b, 0);
    log.info(
      `stopped: ${stats.samplesSent} samples sent in ${stats.messagesSent} messages${unsent ? `; ${unsent} unsent samples discarded` : ''}`,
    );
    resolveDone(code);
  }

  async function runOnce(): Promise<void> {
    const timeout = deps.onceTimeoutMs ?? 15_000;
    const results = await Promise.all([...runners.values()].map((r) => r.runOnce(timeout)));
    const failed = results.filter((ok) => !ok).length;
    if (failed > 0) log.error(`--once: ${failed} of ${results.length} probes could not deliver within ${timeout / 1000} s`);
    else log.info(`--once: ${results.length} probes delivered`);
    await shutdown(failed > 0 || results.length === 0 ? 1 : 0);
  }

  async function begin(): Promise<void> {
    const ok = await reload();
    if (stopped) return;
    if (!ok) {
      retryTimer = setTimeout(() => void begin(), deps.retryMs ?? 5000);
      return;
    }
    if (config.once) {
      await runOnce();
      return;
    }
    reloadTimer = setInterval(() => void reload(), config.reloadSeconds * 1000);
    let lastSent = 0;
    summaryTimer = setInterval(() => {
      const connected = [...runners.values()].filter((r) => r.connected).length;
      const buffered = [...runners.values()].reduce((a, r) => a + r.queue.size, 0);
      log.info(
        `${stats.samplesSent - lastSent} samples sent in the last minute; ${connected}/${runners.size} connected; ${buffered} buffered`,
      );
      lastSent = stats.samplesSent;
    }, 60_000);
  }

  void begin();

  return {
    done,
    stop: () => shutdown(0),
    reload: async () => {
      await reload();
    },
    runners,
  };
}
