import type { RecommendationDto } from '@shared/schemas/feed.schema';
import { z } from 'zod';

// The recommendation's `inputs` is a free-form record (every input the rule used). The sheet shows a
// few of them; each is read leniently so a missing or renamed input shows as "—", never as an error.

const num = z.number().finite();
const latestSchema = z.object({ nh3MgL: num, sampledAt: z.string(), flags: z.array(z.object({ message: z.string() })).optional() });
const forecastSchema = z.object({ nh3MgL: num, localTime: z.string().optional(), at: z.string().optional() });
const loadSchema = z.object({ plannedTanKgPerDay: num.nullable().optional(), recommendedTanKgPerDay: num.nullable().optional() });
const levelsSchema = z.object({ watchNh3MgL: num.nullable().optional(), actNh3MgL: num.nullable().optional() });
const biomassSchema = z.object({ biomass95: z.object({ lowKg: num, highKg: num }).nullable().optional() });

export interface RationInputs {
  latestNh3: { mgL: number; sampledAt: string; flagged: boolean } | null;
  forecastNh3: { mgL: number; localTime: string | null } | null;
  watchNh3MgL: number | null;
  actNh3MgL: number | null;
  plannedTanKgPerDay: number | null;
  recommendedTanKgPerDay: number | null;
  biomass95: { lowKg: number; highKg: number } | null;
}

function pick<T>(schema: z.ZodType<T>, value: unknown): T | null {
  const r = schema.safeParse(value);
  return r.success ? r.data : null;
}

export function readInputs(rec: Pick<RecommendationDto, 'inputs'> | null): RationInputs {
  const inputs = (rec?.inputs ?? {}) as Record<string, unknown>;
  const ammonia = (inputs.ammonia ?? {}) as Record<string, unknown>;
  const latest = pick(latestSchema, ammonia.latest);
  const forecast = pick(forecastSchema, ammonia.forecastPeak);
  const levels = pick(levelsSchema, ammonia.levels);
  const load = pick(loadSchema, inputs.ammoniaLoad);
  const biomass = pick(biomassSchema, inputs.biomass);
  return {
    latestNh3: latest ? { mgL: latest.nh3MgL, sampledAt: latest.sampledAt, flagged: (latest.flags?.length ?? 0) > 0 } : null,
    forecastNh3: forecast ? { mgL: forecast.nh3MgL, localTime: forecast.localTime ?? null } : null,
    watchNh3MgL: levels?.watchNh3MgL ?? null,
    actNh3MgL: levels?.actNh3MgL ?? null,
    plannedTanKgPerDay: load?.plannedTanKgPerDay ?? null,
    recommendedTanKgPerDay: load?.recommendedTanKgPerDay ?? null,
    biomass95: biomass?.biomass95 ?? null,
  };
}

/** Where a free-ammonia value stands against the unit's watch and act levels. */
export function nh3Level(mgL: number, inputs: Pick<RationInputs, 'watchNh3MgL' | 'actNh3MgL'>): 'clear' | 'watch' | 'act' | null {
  if (inputs.actNh3MgL !== null && mgL >= inputs.actNh3MgL) return 'act';
  if (inputs.watchNh3MgL !== null && mgL >= inputs.watchNh3MgL) return 'watch';
  if (inputs.watchNh3MgL === null && inputs.actNh3MgL === null) return null;
  return 'clear';
}
