// Physical parameters of a culture unit, derived from what the credential file says about it
// (kind, water type, salinity, species) plus a small per-probe variation so no two ponds are
// identical. Rates are per hour; concentrations mg/L unless named otherwise.
import type { Quantity } from '../../shared/schemas/mqtt.schema';
import { deriveSeed, signedHash } from './random';

export type UnitKind = 'pond' | 'raceway' | 'tank';
export type WaterType = 'fresh' | 'brackish' | 'marine';
export type TemperatureUnit = 'C' | 'F';

/**
 * What the model needs to know about a probe. A credential-file entry
 * (`probeCredentialFileSchema`) fits this type as it is.
 */
export interface ProbeSpec {
  probeKey: string;
  farmSlug?: string;
  unitCode?: string;
  unitKind: UnitKind;
  waterType: WaterType;
  /** The unit's set salinity, ‰ (fresh water ≈ 0.1–0.5). */
  salinityPpt: number;
  species?: string;
  /** Quantities the probe reports; others are modelled but not published. */
  quantities: readonly Quantity[];
  /** Scenario string, e.g. `steady`, `drift:phPerDay=0.05` (see simulator/scenarios). */
  scenario?: string;
  /** Unit of water_temperature; default C. */
  temperatureUnit?: TemperatureUnit;
  /** Water depth, m, when known (default by kind: pond 1.2–1.3, raceway 0.9, tank 1.2). */
  depthM?: number;
  /** A raceway's normal inflow, L/min, when known (default 2,000–4,000 from the probe key). */
  designFlowLpm?: number;
}

export interface AeratorParams {
  /** Extra reaeration rate when running, 1/h (a paddlewheel sized for the pond). */
  kPerHour: number;
  /** Starts when DO falls below this, mg/L. */
  onBelowMgL: number;
  /** Stops after sunrise once DO is back above this, mg/L. */
  offAboveMgL: number;
  /** Runs all the time (diffused air in tanks). */
  alwaysOn: boolean;
}

export interface RacewayParams {
  nominalFlowLpm: number;
  volumeL: number;
  springTemperatureC: number;
  /** Inflow DO as a fraction of saturation (after the head-box). */
  inletDoFraction: number;
}

export interface UnitParams {
  kind: UnitKind;
  depthM: number;
  /** Plankton bloom relative to an established catfish pond (1). */
  algae: number;
  /** Gross photosynthesis at full overhead sun, 20 °C, algae 1, mg O2/L/h. */
  pMaxMgLPerHour: number;
  /** Basal plankton respiration at 20 °C per unit of algae, mg O2/L/h (decay of fresh production comes on top). */
  planktonRespirationMgLPerHour: number;
  /** Fish and sediment respiration at 20 °C, mg O2/L/h. */
  fishRespirationMgLPerHour: number;
  q10: number;
  /** Surface reaeration at a 2 m/s wind, 1/h. */
  kSurfacePerHour: number;
  aerator: AeratorParams | null;
  /** Exchange with source water (pond seepage and top-up, tank flow-through), 1/h. Raceways use their flow. */
  exchangePerHour: number;
  alkalinityMeqL: number;
  source: { temperatureC: number; ph: number; doFraction: number };
  thermal: { tauHours: number; solarGainC: number; airDamping: number };
  raceway: RacewayParams | null;
  salinity: {
    setPpt: number;
    /** Daily exchange that holds salinity near the set point, 1/day. */
    baseExchangePerDay: number;
    /** Exchange when salinity is below the set point after rain, 1/day. */
    recoveryExchangePerDay: number;
    /** Rain plus runoff from the banks, as a multiple of the rain depth. */
    runoffFactor: number;
    evaporationMmPerDay: number;
  };
}

export function unitParams(spec: ProbeSpec, seed: number): UnitParams {
  const s = deriveSeed(seed, 'unit', spec.probeKey);
  // ±`spread` relative variation, different for each parameter (index) and probe.
  const vary = (index: number, spread: number): number => 1 + spread * signedHash(s, index);
  const setPpt = Math.max(0, spec.salinityPpt);
  const brackish = spec.waterType !== 'fresh';
  const salinity = {
    setPpt,
    baseExchangePerDay: brackish ? 0.1 : 0.03,
    recoveryExchangePerDay: brackish ? 0.35 : 0.03,
    runoffFactor: 1.6 * vary(1, 0.15),
    evaporationMmPerDay: 5 * vary(2, 0.15),
  };

  if (spec.unitKind === 'raceway') {
    const nominalFlowLpm = spec.designFlowLpm ?? Math.round(3000 + 1000 * signedHash(s, 3));
    const depthM = spec.depthM ?? 0.9;
    const volumeL = 30 * 2.5 * depthM * 1000 * vary(4, 0.1);
    const springTemperatureC = 12.5 + 0.5 * signedHash(s, 5);
    const q10 = 2;
    // Stocked to the flow (flow index): oxygen use leaves about 2.2 mg/L deficit at the outlet.
    const exchangePerHourAtNominal = (nominalFlowLpm * 60) / volumeL;
    const fishRespirationMgLPerHour = (2.2 * vary(6, 0.1) * exchangePerHourAtNominal) / q10 ** ((springTemperatureC - 20) / 10);
    return {
      kind: 'raceway',
      depthM,
      algae: 0.02,
      pMaxMgLPerHour: 1.6,
      planktonRespirationMgLPerHour: 0.04,
      fishRespirationMgLPerHour,
      q10,
      kSurfacePerHour: 0.25,
      aerator: null,
      exchangePerHour: 0,
      alkalinityMeqL: 2.0 * vary(7, 0.1),
      source: { temperatureC: springTemperatureC, ph: 7.6 + 0.1 * signedHash(s, 8), doFraction: 0.93 },
      thermal: { tauHours: 20, solarGainC: 2, airDamping: 1 },
      raceway: { nominalFlowLpm, volumeL, springTemperatureC, inletDoFraction: 0.93 },
      salinity,
    };
  }

  if (spec.unitKind === 'tank') {
    return {
      kind: 'tank',
      depthM: spec.depthM ?? 1.2,
      algae: 0.15,
      pMaxMgLPerHour: 1.6,
      planktonRespirationMgLPerHour: 0.04,
      fishRespirationMgLPerHour: 0.9 * vary(9, 0.15),
      q10: 2,
      kSurfacePerHour: 0.05,
      aerator: { kPerHour: 0.45, onBelowMgL: 5, offAboveMgL: 6, alwaysOn: true },
      exchangePerHour: 0.25 * vary(10, 0.15),
      alkalinityMeqL: brackish ? 2.3 : 1.6,
      source: { temperatureC: 20, ph: 7.5, doFraction: 0.8 },
      thermal: { tauHours: 8, solarGainC: 0.5, airDamping: 0.6 },
      raceway: null,
      salinity,
    };
  }

  // Earthen pond. Brackish shrimp ponds are better buffered (higher alkalinity) than catfish ponds.
  const depthM = spec.depthM ?? (brackish ? 1.2 : 1.3) * vary(11, 0.1);
  return {
    kind: 'pond',
    depthM,
    algae: (brackish ? 0.9 : 1) * vary(12, 0.15),
    pMaxMgLPerHour: 1.5,
    planktonRespirationMgLPerHour: 0.04,
    fishRespirationMgLPerHour: 0.12 * vary(13, 0.2),
    q10: 2,
    kSurfacePerHour: 0.045 / depthM,
    aerator: { kPerHour: 0.12, onBelowMgL: 4, offAboveMgL: 5.5, alwaysOn: false },
    exchangePerHour: salinity.baseExchangePerDay / 24,
    alkalinityMeqL: (brackish ? 2.4 : 1.2) * vary(14, 0.2),
    source: { temperatureC: 22, ph: brackish ? 7.9 : 7.5, doFraction: 0.8 },
    thermal: { tauHours: 5 * (depthM / 1.3), solarGainC: 2.5, airDamping: 0.9 },
    raceway: null,
    salinity,
  };
}
