import { quantitySchema } from '../../shared/schemas/mqtt.schema';
import { ScenarioParamError, iso, timeParam } from './params';
import type { ScenarioDefinition } from './types';

/** A failed sensor that keeps reporting its last value. */
export const flatlineScenario: ScenarioDefinition = {
  name: 'flatline',
  summary: 'one sensor stuck at its last value',
  params: {
    quantity: 'the stuck quantity (default dissolved_oxygen)',
    at: 'when it sticks (default +5m live, end-12h in history)',
  },
  create(params, context, base) {
    const parsed = quantitySchema.safeParse(params.quantity ?? 'dissolved_oxygen');
    if (!parsed.success) throw new ScenarioParamError(`quantity must be a probe quantity; got ${JSON.stringify(params.quantity)}`);
    const fallback = context.endMs !== undefined ? context.endMs - 12 * 3_600_000 : context.startMs + 5 * 60_000;
    const fromMs = timeParam(params, 'at', fallback, context);
    return {
      ...base,
      flatline: { quantity: parsed.data, fromMs },
      description: `flatline:quantity=${parsed.data},at=${iso(fromMs)}`,
    };
  },
};
