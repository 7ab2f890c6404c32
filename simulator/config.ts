// Simulator configuration: command-line flags and environment, validated once with zod. Nothing
// else in the simulator reads process.env or process.argv.
import { parseArgs } from 'node:util';
import { z } from 'zod';
import { assertTimeZone } from './models/clock';
import { ScenarioParamError, parseScenarioText, scenarioNames, scenarios } from './scenarios';
import type { LogLevel } from './log';

export interface SimulatorConfig {
  credentialsFile: string;
  /** Overrides the credential file's brokerUrl. */
  brokerUrl: string | undefined;
  /** Scenario for probes whose credential entry says `steady`. */
  scenario: string | undefined;
  /** Run only the first N probes of the file. */
  probes: number | undefined;
  /** Run only these probe keys. */
  only: string[];
  /** Publish interval in seconds for every probe (default: each entry's intervalSeconds; burst 0.1). */
  intervalSeconds: number | undefined;
  /** Model time runs this many times faster than the wall clock. */
  speed: number;
  /** Publish one round (plus any backfill) and exit. */
  once: boolean;
  /** Hours of history to generate and send on start (0 = none). */
  backfillHours: number;
  seed: number | string;
  timeZone: string;
  latitude: number | undefined;
  longitude: number | undefined;
  /** Per-farm time zone and position by farm slug (from --farm); farms not listed use timeZone/latitude/longitude. */
  farms: Record<string, FarmSiteOverride>;
  /** Probe keys reporting water temperature in °F (besides entries with temperatureUnit F). */
  fahrenheit: string[];
  reloadSeconds: number;
  bufferCapacity: number;
  logLevel: LogLevel;
  help: boolean;
}

export interface FarmSiteOverride {
  timeZone?: string;
  latitude?: number;
  longitude?: number;
}

export type ConfigResult = { ok: true; config: SimulatorConfig } | { ok: false; errors: string[] };

const FARM_SPEC = /^([a-z0-9][a-z0-9-]*)=([^@]*)(?:@(-?\d+(?:\.\d+)?),(-?\d+(?:\.\d+)?))?$/;

/** `slug=Zone`, `slug=Zone@lat,lon` or `slug=@lat,lon`. */
export function parseFarmSpec(text: string): { slug: string; site: FarmSiteOverride } | string {
  const match = FARM_SPEC.exec(text.trim());
  if (!match) return `--farm ${JSON.stringify(text)}: expected slug=Time/Zone, slug=Time/Zone@lat,lon or slug=@lat,lon`;
  const [, slug = '', zone = '', lat, lon] = match;
  const site: FarmSiteOverride = {};
  if (zone !== '') {
    try {
      assertTimeZone(zone);
    } catch {
      return `--farm ${slug}: unknown time zone ${JSON.stringify(zone)}`;
    }
    site.timeZone = zone;
  }
  if (lat !== undefined && lon !== undefined) {
    const latitude = Number(lat);
    const longitude = Number(lon);
    if (Math.abs(latitude) > 66 || Math.abs(longitude) > 180)
      return `--farm ${slug}: latitude must be within ±66 and longitude within ±180`;
    site.latitude = latitude;
    site.longitude = longitude;
  }
  return { slug, site };
}

const DEFAULT_CREDENTIALS_FILE = '.data/probe-credentials.json';
const DEFAULT_BACKFILL_HOURS = 24;

const list = z
  .string()
  .optional()
  .transform((s) =>
    s
      ? s
          .split(',')
          .map((x) => x.trim())
          .filter(Boolean)
      : [],
  );
const optionalNumber = (schema: z.ZodNumber) =>
  z
    .string()
    .optional()
    .transform((s, ctx) => {
      if (s === undefined) return undefined;
      const n = Number(s);
      const parsed = schema.safeParse(n);
      if (s.trim() === '' || !parsed.success) {
        ctx.addIssue({ code: 'custom', message: parsed.success ? 'must be a number' : (parsed.error.issues[0]?.message ?? 'invalid') });
        return z.NEVER;
      }
      return parsed.data;
    });

const rawSchema = z.object({
  credentials: z.string().min(1).optional(),
  broker: z
    .string()
    .regex(/^(mqtts?|tcp|ssl|wss?):\/\//, 'must be a URL such as mqtt://127.0.0.1:1883')
    .optional(),
  scenario: z
    .string()
    .optional()
    .superRefine((s, ctx) => {
      if (s === undefined) return;
      try {
        parseScenarioText(s);
      } catch (error) {
        ctx.addIssue({ code: 'custom', message: error instanceof ScenarioParamError ? error.message : String(error) });
      }
    }),
  probes: optionalNumber(z.number().int().min(1).max(100_000)),
  only: list,
  interval: optionalNumber(z.number().min(0.05).max(86_400)),
  speed: optionalNumber(z.number().min(0.01).max(100_000)),
  once: z.boolean().optional(),
  backfill: optionalNumber(
    z
      .number()
      .min(0)
      .max(24 * 60),
  ),
  seed: z.string().min(1).optional(),
  tz: z
    .string()
    .optional()
    .superRefine((tz, ctx) => {
      if (tz === undefined) return;
      try {
        assertTimeZone(tz);
      } catch {
        ctx.addIssue({ code: 'custom', message: `unknown time zone ${JSON.stringify(tz)}` });
      }
    }),
  lat: optionalNumber(z.number().min(-66).max(66)),
  lon: optionalNumber(z.number().min(-180).max(180)),
  fahrenheit: list,
  farm: z.array(z.string()).optional(),
  'reload-seconds': optionalNumber(z.number().min(1).max(3600)),
  buffer: optionalNumber(z.number().int().min(1).max(1_000_000)),
  verbose: z.boolean().optional(),
  quiet: z.boolean().optional(),
  help: z.boolean().optional(),
});

const options = {
  credentials: { type: 'string' },
  broker: { type: 'string' },
  scenario: { type: 'string' },
  probes: { type: 'string' },
  only: { type: 'string' },
  interval: { type: 'string' },
  speed: { type: 'string' },
  once: { type: 'boolean' },
  backfill: { type: 'string' },
  seed: { type: 'string' },
  tz: { type: 'string' },
  lat: { type: 'string' },
  lon: { type: 'string' },
  fahrenheit: { type: 'string' },
  farm: { type: 'string', multiple: true },
  'reload-seconds': { type: 'string' },
  buffer: { type: 'string' },
  verbose: { type: 'boolean' },
  quiet: { type: 'boolean' },
  help: { type: 'boolean', short: 'h' },
} as const;

const takesValue = (arg: string): boolean => {
  const name = arg.startsWith('--') ? arg.slice(2) : '';
  return Object.hasOwn(options, name) && options[name as keyof typeof options].type === 'string';
};

/**
 * Smooths two parseArgs edges: `--backfill` may stand alone (24 h), and a negative number after a
 * flag (`--lon -91.7`) is a value, not another flag.
 */
function normaliseArgv(argv: readonly string[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < argv.length; i += 1) {
    const arg = argv[i] ?? '';
    const next = argv[i + 1];
    if (arg === '--backfill' && (next === undefined || next.startsWith('--'))) {
      out.push(arg, String(DEFAULT_BACKFILL_HOURS));
    } else if (takesValue(arg) && next !== undefined && /^-\d/.test(next)) {
      out.push(`${arg}=${next}`);
      i += 1;
    } else {
      out.push(arg);
    }
  }
  return out;
}

export function parseConfig(argv: readonly string[], env: Readonly<Record<string, string | undefined>>): ConfigResult {
  let values: Record<string, string | boolean | string[] | undefined>;
  try {
    const parsed = parseArgs({ args: normaliseArgv(argv), options, strict: true, allowPositionals: false });
    values = parsed.values;
  } catch (error) {
    return { ok: false, errors: [(error as Error).message] };
  }
  const fromEnv = {
    credentials: env.PROBE_CREDENTIALS_FILE || undefined,
    broker: env.MQTT_BROKER_URL || undefined,
    seed: env.SIMULATOR_SEED || undefined,
    tz: env.FARM_TIME_ZONE || undefined,
  };
  const raw = rawSchema.safeParse({
    ...values,
    credentials: values.credentials ?? fromEnv.credentials,
    broker: values.broker ?? fromEnv.broker,
    seed: values.seed ?? fromEnv.seed,
    tz: values.tz ?? fromEnv.tz,
  });
  if (!raw.success) {
    return { ok: false, errors: raw.error.issues.map((issue) => `--${issue.path.join('.')}: ${issue.message}`) };
  }
  const r = raw.data;
  const errors: string[] = [];
  if ((r.lat === undefined) !== (r.lon === undefined)) errors.push('--lat and --lon go together');
  if (r.verbose && r.quiet) errors.push('--verbose and --quiet exclude each other');
  const farms: Record<string, FarmSiteOverride> = {};
  for (const spec of r.farm ?? []) {
    const parsed = parseFarmSpec(spec);
    if (typeof parsed === 'string') errors.push(parsed);
    else farms[parsed.slug] = { ...farms[parsed.slug], ...parsed.site };
  }
  if (errors.length > 0) return { ok: false, errors };
  const seedText = r.seed ?? '1';
  return {
    ok: true,
    config: {
      credentialsFile: r.credentials ?? DEFAULT_CREDENTIALS_FILE,
      brokerUrl: r.broker,
      scenario: r.scenario,
      probes: r.probes,
      only: r.only,
      intervalSeconds: r.interval,
      speed: r.speed ?? 1,
      once: r.once ?? false,
      backfillHours: r.backfill ?? 0,
      seed: /^-?\d+$/.test(seedText) ? Number(seedText) : seedText,
      timeZone: r.tz ?? Intl.DateTimeFormat().resolvedOptions().timeZone,
      latitude: r.lat,
      longitude: r.lon,
      farms,
      fahrenheit: r.fahrenheit,
      reloadSeconds: r['reload-seconds'] ?? 30,
      bufferCapacity: r.buffer ?? 10_000,
      logLevel: r.verbose ? 'debug' : r.quiet ? 'quiet' : 'info',
      help: r.help ?? false,
    },
  };
}

export function helpText(): string {
  const scenarioLines = scenarioNames.map((name) => {
    const def = scenarios[name];
    const params = Object.entries(def.params)
      .map(([k, v]) => `\n                      ${k}=… ${v}`)
      .join('');
    return `    ${name.padEnd(10)} ${def.summary}${params}`;
  });
  return `Gillwise probe simulator: publishes the demo farm's probe readings over MQTT.

usage: npm run simulate -- [flags]

  --credentials PATH   probe credential file (env PROBE_CREDENTIALS_FILE; default ${DEFAULT_CREDENTIALS_FILE})
  --broker URL         broker URL, overrides the file's brokerUrl (env MQTT_BROKER_URL)
  --scenario SPEC      scenario for probes whose entry says steady, e.g. drift or flow-cut:at=14:00
  --probes N           run only the first N probes of the file (each probe needs its own credential)
  --only KEY,KEY       run only these probe keys
  --interval SECONDS   publish interval for every probe (default: the entry's intervalSeconds; burst 0.1)
  --speed FACTOR       model time runs FACTOR times faster than the clock (demos); timestamps stay real
  --once               publish one round and exit (0 when every sample was acknowledged)
  --backfill [HOURS]   first generate and send the last HOURS of history (default ${DEFAULT_BACKFILL_HOURS})
  --seed SEED          model seed (env SIMULATOR_SEED; default 1; use the demo seed's value)
  --tz ZONE            farm time zone, IANA (env FARM_TIME_ZONE; default the system's)
  --lat DEG --lon DEG  farm position: sunrise and sunset follow the date
  --farm SLUG=ZONE[@LAT,LON]  time zone (and position) of one farm; repeat per farm, e.g.
                       --farm harrow-bend=America/Chicago --farm cedar-flats=America/Denver
  --fahrenheit KEY,KEY probes that report water temperature in °F
  --reload-seconds S   how often to re-read the credential file (default 30; also on SIGHUP)
  --buffer N           unsent samples kept per probe (default 10000)
  --verbose | --quiet
  -h, --help

scenarios (SPEC is name or name:key=value,key=value):
${scenarioLines.join('\n')}
`;
}
