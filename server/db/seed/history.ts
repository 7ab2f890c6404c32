import type { EntityManager } from 'typeorm';
import type { ProbeCredentialFile } from '../../../shared/schemas/mqtt.schema';
import { farmWeatherFor, generateHistory } from '../../../simulator/models';
import { ReadingHandler, type ReadingRow } from '../../ingest/reading-handler';

const DAY = 86_400_000;
/** The simulator's default run seed: live readings continue the stored history without a jump. */
const SIMULATOR_SEED = 1;

/**
 * Stores three weeks of simulated probe history for the demo, from the same pond model the live simulator
 * runs, through the same validation and unit handling as MQTT ingest (°F probes, specific conductance).
 */
export async function storeSimulatedHistory(args: {
  manager: EntityManager;
  probes: Array<{ id: string; entry: ProbeCredentialFile['probes'][number] }>;
  now: Date;
  days?: number;
  stepSeconds?: number;
}): Promise<void> {
  const to = args.now.getTime();
  const from = to - (args.days ?? 21) * DAY;
  const handler = new ReadingHandler();
  const weathers = new Map<string, ReturnType<typeof farmWeatherFor>>();
  for (const { id, entry } of args.probes) {
    let weather = weathers.get(entry.farmSlug);
    if (!weather) {
      weather = farmWeatherFor({
        seed: SIMULATOR_SEED,
        farmSlug: entry.farmSlug,
        site: { timeZone: entry.farmTimeZone ?? 'UTC', ...(entry.latitude === undefined ? {} : { latitude: entry.latitude }), ...(entry.longitude === undefined ? {} : { longitude: entry.longitude }) },
      });
      weathers.set(entry.farmSlug, weather);
    }
    const samples = generateHistory({ probe: entry, from, to, stepSeconds: args.stepSeconds ?? 600, seed: SIMULATOR_SEED, weather });
    for (let i = 0; i < samples.length; i += 500) {
      const chunk = samples.slice(i, i + 500);
      const { rows } = handler.handle({ probeId: id, probeKey: entry.probeKey, farmId: '', unitId: null }, JSON.stringify({ v: 1, samples: chunk }), to);
      await insert(args.manager, rows);
    }
  }
}

async function insert(m: EntityManager, rows: ReadingRow[]): Promise<void> {
  if (!rows.length) return;
  await m.query(
    `INSERT INTO readings (probe_id, quantity, at, value, quality)
     SELECT * FROM unnest($1::uuid[], $2::text[], $3::timestamptz[], $4::float8[], $5::text[]) ON CONFLICT DO NOTHING`,
    [rows.map((r) => r.probeId), rows.map((r) => r.quantity), rows.map((r) => r.at.toISOString()), rows.map((r) => r.value), rows.map((r) => r.quality)],
  );
}
