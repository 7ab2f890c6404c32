// One culture unit's water, stepped through time, and the probe that reads it.
//
// State: water temperature, DO, dissolved inorganic carbon (→ pH), salinity, water level, aerator.
// Each state obeys dX/dt = a − b·X over a step (a, b frozen at the step's start), integrated exactly
// with X' = a/b + (X − a/b)·e^(−b·dt), which is stable for any step; steps are at most 5 minutes.
import { celsiusToFahrenheit } from '../../shared/units';
import type { Quantity, ReadingSample, ReadingValue } from '../../shared/schemas/mqtt.schema';
import { type ScenarioEffects, createScenario } from '../scenarios';
import { HOUR_MS } from './clock';
import {
  type CarbonateConstants,
  carbonateConstants,
  carbonateFromDic,
  co2AtAirEquilibriumMmolL,
  conductivityFromSalinity,
  dicFromPh,
  doSaturationMgL,
  specificConductanceFromSalinity,
} from './chemistry';
import { deriveSeed, signedHash, smoothNoise, unitHash } from './random';
import { type ProbeSpec, type UnitParams, unitParams } from './unit-params';
import type { FarmWeather, WeatherSample } from './weather';

/** The modelled water at one instant (true values, before the sensor). */
export interface UnitState {
  atMs: number;
  waterTemperatureC: number;
  doMgL: number;
  doSaturationMgL: number;
  dicMmolL: number;
  ph: number;
  salinityPpt: number;
  /** Raceway inflow, L/min; null for ponds and tanks. */
  flowLpm: number | null;
  waterLevelM: number;
  aeratorRunning: boolean;
  pumpRunning: boolean;
  /** Photosynthesis and respiration of the last step, mg O2/L/h (for inspection and tests). */
  photosynthesisMgLPerHour: number;
  respirationMgLPerHour: number;
  /** Photosynthesis averaged over about a day: the fresh organic matter bacteria are decomposing. */
  recentPhotosynthesisMgLPerHour: number;
}

export interface ProbeModelOptions {
  probe: ProbeSpec;
  weather: FarmWeather;
  /** Run seed (the same one given to the farm's weather); the probe key is mixed in. */
  seed: number | string;
  /** First instant the caller will ask for. The model spins up from `startMs − warmUpHours`. */
  startMs: number;
  /** Scenario effects; default: built from `probe.scenario` with the start as reference. */
  scenario?: ScenarioEffects;
  /** Spin-up before `startMs` so the state has forgotten its made-up initial values (default 168 h: DO, pH and salinity forget their start values). */
  warmUpHours?: number;
}

const MAX_STEP_MS = 5 * 60_000;
const PCO2_ATM = 420e-6;
const PHOTOSYNTHETIC_QUOTIENT = 1.2; // mol O2 released per mol CO2 fixed (nitrate-fed algae, from memory)
const RESPIRATORY_QUOTIENT = 0.9; // mol CO2 released per mol O2 used (from memory)
const O2_MG_PER_MMOL = 32;
const DECOMPOSED_FRACTION = 0.75; // of fresh production respired in the pond (product decision for the model)
const DECOMPOSITION_HOURS = 24;
const PHYSICAL_QUANTITIES: readonly Quantity[] = [
  'ph',
  'water_temperature',
  'dissolved_oxygen',
  'salinity',
  'specific_conductance',
  'conductivity',
  'flow',
  'water_level',
];

const relax = (x: number, target: number, rate: number, dtHours: number): number =>
  rate <= 0 ? x : target + (x - target) * Math.exp(-rate * dtHours);
const clamp = (value: number, min: number, max: number): number => Math.min(max, Math.max(min, value));
const round = (value: number, digits: number): number => {
  const f = 10 ** digits;
  return Math.round(value * f) / f;
};

/** Quantities a probe lists that this kind of unit cannot produce (e.g. flow in a pond). */
export function unsupportedQuantities(probe: ProbeSpec): Quantity[] {
  const hasAerator = probe.unitKind !== 'raceway';
  return probe.quantities.filter((q) => (q === 'flow' && probe.unitKind !== 'raceway') || (q === 'aerator_running' && !hasAerator));
}

export class ProbeModel {
  readonly probe: ProbeSpec;
  readonly params: UnitParams;
  readonly scenario: ScenarioEffects;
  private readonly weather: FarmWeather;
  private readonly seed: number;
  private readonly sourceDicMmolL: number;
  private readonly quantityOrder: readonly Quantity[];
  private readonly stuck = new Map<Quantity, ReadingValue>();
  private refilling = false;
  private current: UnitState;

  constructor(options: ProbeModelOptions) {
    this.probe = options.probe;
    this.weather = options.weather;
    this.seed = deriveSeed(options.seed, 'probe', options.probe.probeKey);
    this.params = unitParams(options.probe, deriveSeed(options.seed, 'farm-units'));
    this.scenario =
      options.scenario ?? createScenario(options.probe.scenario, { startMs: options.startMs, timeZone: options.weather.site.timeZone });
    const wanted = new Set(options.probe.quantities);
    // In-situ conductivity means nothing without the temperature it was read at.
    if (wanted.has('conductivity')) wanted.add('water_temperature');
    const unsupported = new Set(unsupportedQuantities(options.probe));
    this.quantityOrder = [...wanted].filter((q) => !unsupported.has(q));

    const p = this.params;
    const sourceConstants = carbonateConstants(p.source.temperatureC, p.salinity.setPpt);
    this.sourceDicMmolL = dicFromPh(sourceConstants, p.source.ph, p.alkalinityMeqL);
    const warmUpMs = (options.warmUpHours ?? 168) * HOUR_MS;
    const t0 = options.startMs - warmUpMs;
    this.current = this.initialState(t0);
    this.advanceTo(options.startMs);
  }

  get state(): Readonly<UnitState> {
    return this.current;
  }

  /** Quantities this probe publishes, in order (unsupported ones removed). */
  get publishedQuantities(): readonly Quantity[] {
    return this.quantityOrder;
  }

  private initialState(atMs: number): UnitState {
    const p = this.params;
    const w = this.weather.at(atMs);
    const waterTemperatureC = p.raceway ? p.raceway.springTemperatureC : w.airDailyMeanC + 1;
    const salinityPpt = p.salinity.setPpt;
    const sat = doSaturationMgL(waterTemperatureC, salinityPpt);
    const c = carbonateConstants(waterTemperatureC, salinityPpt);
    const dicMmolL = dicFromPh(c, p.source.ph, p.alkalinityMeqL);
    return {
      atMs,
      waterTemperatureC,
      doMgL: 0.9 * sat,
      doSaturationMgL: sat,
      dicMmolL,
      ph: p.source.ph,
      salinityPpt,
      flowLpm: p.raceway ? p.raceway.nominalFlowLpm : null,
      waterLevelM: p.depthM,
      aeratorRunning: p.aerator?.alwaysOn ?? false,
      pumpRunning: p.kind !== 'pond',
      photosynthesisMgLPerHour: 0,
      respirationMgLPerHour: 0,
      recentPhotosynthesisMgLPerHour: 0,
    };
  }

  /** Steps the state forward to `ms` (never backward). */
  advanceTo(ms: number): Readonly<UnitState> {
    while (this.current.atMs < ms) {
      const dtMs = Math.min(MAX_STEP_MS, ms - this.current.atMs);
      this.current = this.step(this.current, dtMs);
    }
    return this.current;
  }

  private flowAt(ms: number): number | null {
    const r = this.params.raceway;
    if (!r) return null;
    const wobble = 1 + 0.01 * smoothNoise(deriveSeed(this.seed, 'flow'), ms / HOUR_MS, 0.5);
    return r.nominalFlowLpm * this.scenario.flowFactor(ms) * wobble;
  }

  private step(s: UnitState, dtMs: number): UnitState {
    const p = this.params;
    const dt = dtMs / HOUR_MS;
    const mid = s.atMs + dtMs / 2;
    const w: WeatherSample = this.weather.at(mid);
    const flowLpm = this.flowAt(mid);
    // Water exchange with the source, 1/h: a raceway's flow, a pond's top-up, a tank's flow-through.
    const exchange = p.raceway && flowLpm !== null ? (flowLpm * 60) / p.raceway.volumeL : p.exchangePerHour;

    // Temperature: first-order lag toward an equilibrium set by air and sun, diluted by inflow.
    const airForcing = w.airDailyMeanC + p.thermal.airDamping * (w.airTemperatureC - w.airDailyMeanC) + p.thermal.solarGainC * w.light;
    const airRate = 1 / p.thermal.tauHours;
    const tempTarget = (airForcing * airRate + p.source.temperatureC * exchange) / (airRate + exchange);
    const waterTemperatureC = relax(s.waterTemperatureC, tempTarget, airRate + exchange, dt);
    const t = (s.waterTemperatureC + waterTemperatureC) / 2;

    // Oxygen budget: dDO/dt = P − R + (k + k_aer)(DOsat − DO) + exchange·(DO_in − DO).
    const sat = doSaturationMgL(t, s.salinityPpt);
    const algae = p.algae * this.scenario.algaeFactor;
    const carbonLimit = 1 / (1 + Math.exp((s.ph - 9.7) / 0.12)); // algae run short of CO2/HCO3 at very high pH
    const photosynthesis = p.pMaxMgLPerHour * algae * w.light * 1.036 ** (t - 20) * carbonLimit;
    const q10Factor = p.q10 ** ((t - 20) / 10);
    const doLimit = s.doMgL / (s.doMgL + 0.8);
    // Most of what the bloom fixes is respired again within a day or two (algal dark respiration and
    // bacterial decay), which closes the carbon cycle; the rest settles out. Fish and sediment come on top.
    const decomposition = DECOMPOSED_FRACTION * s.recentPhotosynthesisMgLPerHour;
    const respiration = (decomposition + (p.planktonRespirationMgLPerHour * algae + p.fishRespirationMgLPerHour) * q10Factor) * doLimit;
    const recentPhotosynthesisMgLPerHour = relax(s.recentPhotosynthesisMgLPerHour, photosynthesis, 1 / DECOMPOSITION_HOURS, dt);
    const kSurface = p.kSurfacePerHour * clamp(0.6 + 0.2 * w.windMs, 0.4, 3);
    const kAerator = s.aeratorRunning && p.aerator ? p.aerator.kPerHour : 0;
    const inletFraction = p.raceway ? p.raceway.inletDoFraction : p.source.doFraction;
    const doIn = inletFraction * doSaturationMgL(p.source.temperatureC, s.salinityPpt);
    const doRate = kSurface + kAerator + exchange;
    const doTarget = (photosynthesis - respiration + (kSurface + kAerator) * sat + exchange * doIn) / doRate;
    const doMgL = Math.max(0, relax(s.doMgL, doTarget, doRate, dt));

    // Carbon budget: photosynthesis takes CO2, respiration returns it, free CO2 exchanges with air.
    const c: CarbonateConstants = carbonateConstants(t, s.salinityPpt);
    const now = carbonateFromDic(c, s.dicMmolL, p.alkalinityMeqL);
    const co2Fraction = s.dicMmolL > 0 ? now.co2MmolL / s.dicMmolL : 0;
    const kCo2 = 0.9 * (kSurface + kAerator);
    const carbonIn =
      -photosynthesis / (O2_MG_PER_MMOL * PHOTOSYNTHETIC_QUOTIENT) +
      (respiration * RESPIRATORY_QUOTIENT) / O2_MG_PER_MMOL +
      kCo2 * co2AtAirEquilibriumMmolL(c, PCO2_ATM) +
      exchange * this.sourceDicMmolL;
    const carbonRate = kCo2 * co2Fraction + exchange;
    const dicMmolL = Math.max(0.01, relax(s.dicMmolL, carbonIn / carbonRate, carbonRate, dt));
    const waterTemperatureForPh = waterTemperatureC;

    // Salinity: evaporation concentrates, rain and runoff dilute, managed exchange pulls back to the set point.
    const evaporationMmPerHour =
      (p.salinity.evaporationMmPerDay / 24) * (0.4 + 1.6 * w.light) * Math.max(0.2, 1 + 0.04 * (w.airTemperatureC - 25));
    const rainInMmPerHour = w.rainMmPerHour * p.salinity.runoffFactor;
    let salinityPpt: number;
    let waterLevelM = s.waterLevelM;
    let pumpRunning = s.pumpRunning;
    if (p.kind === 'pond') {
      const below = s.salinityPpt < p.salinity.setPpt - 0.4;
      const manage = (below ? p.salinity.recoveryExchangePerDay : p.salinity.baseExchangePerDay) / 24;
      const concentrate = (evaporationMmPerHour - rainInMmPerHour) / (p.depthM * 1000);
      salinityPpt = Math.max(0, s.salinityPpt + dt * (s.salinityPpt * concentrate + manage * (p.salinity.setPpt - s.salinityPpt)));
      // Level: rain in, evaporation out, overflow above the spillway, top-up pump below the mark.
      if (s.waterLevelM < p.depthM - 0.04) this.refilling = true;
      if (s.waterLevelM >= p.depthM) this.refilling = false;
      const topUp = this.refilling ? 10 : 0;
      const overflow = s.waterLevelM > p.depthM + 0.03 ? (s.waterLevelM - p.depthM - 0.03) * 2000 : 0;
      waterLevelM = s.waterLevelM + (dt * (rainInMmPerHour + topUp - evaporationMmPerHour - overflow)) / 1000;
      pumpRunning = this.refilling;
    } else {
      salinityPpt = relax(s.salinityPpt, p.salinity.setPpt, Math.max(exchange, 0.01), dt);
      if (p.raceway && flowLpm !== null) {
        waterLevelM = p.depthM * (0.75 + 0.25 * (flowLpm / p.raceway.nominalFlowLpm) ** (2 / 3));
        pumpRunning = flowLpm >= 0.5 * p.raceway.nominalFlowLpm;
      } else {
        waterLevelM = p.depthM;
        pumpRunning = true;
      }
    }

    // Aerator: on when DO falls below the threshold; off once the sun is up and DO has recovered.
    let aeratorRunning = s.aeratorRunning;
    if (p.aerator) {
      if (p.aerator.alwaysOn) aeratorRunning = true;
      else if (!aeratorRunning && doMgL < p.aerator.onBelowMgL) aeratorRunning = true;
      else if (aeratorRunning && w.light > 0.05 && doMgL >= p.aerator.offAboveMgL) aeratorRunning = false;
    }

    const after = carbonateFromDic(carbonateConstants(waterTemperatureForPh, salinityPpt), dicMmolL, p.alkalinityMeqL);
    return {
      atMs: s.atMs + dtMs,
      waterTemperatureC,
      doMgL,
      doSaturationMgL: doSaturationMgL(waterTemperatureC, salinityPpt),
      dicMmolL,
      ph: after.ph,
      salinityPpt,
      flowLpm,
      waterLevelM,
      aeratorRunning,
      pumpRunning,
      photosynthesisMgLPerHour: photosynthesis,
      respirationMgLPerHour: respiration,
      recentPhotosynthesisMgLPerHour,
    };
  }

  /** What the probe reports for the current state (sensor noise, scenario faults, units). */
  observe(): ReadingValue[] {
    const s = this.current;
    const second = Math.floor(s.atMs / 1000);
    const noise = (q: Quantity): number => signedHash(deriveSeed(this.seed, 'noise', q), second);
    const spikeSeed = deriveSeed(this.seed, 'spike');
    const spiking =
      this.scenario.spikeProbability > 0 && unitHash(spikeSeed, second) < this.scenario.spikeProbability
        ? this.pickSpikeQuantity(second)
        : undefined;
    const spikeSign = signedHash(deriveSeed(spikeSeed, 'sign'), second) < 0 ? -1 : 1;
    const values: ReadingValue[] = [];

    for (const quantity of this.quantityOrder) {
      const flat = this.scenario.flatline;
      if (flat && flat.quantity === quantity && s.atMs >= flat.fromMs) {
        const held = this.stuck.get(quantity);
        if (held) {
          values.push({ ...held });
          continue;
        }
      }
      const spike = spiking === quantity;
      const value = this.read(quantity, s, noise(quantity), spike ? spikeSign : 0);
      if (!value) continue;
      if (flat && flat.quantity === quantity && s.atMs >= flat.fromMs) this.stuck.set(quantity, value);
      values.push(value);
    }
    return values;
  }

  /** Advances to `ms` and returns the sample taken then, stamped `atMs` (default `ms`). */
  sampleAt(ms: number, atMs: number = ms): ReadingSample {
    this.advanceTo(ms);
    return { at: new Date(atMs).toISOString(), values: this.observe() };
  }

  private pickSpikeQuantity(second: number): Quantity | undefined {
    const candidates = this.quantityOrder.filter((q) => PHYSICAL_QUANTITIES.includes(q));
    if (candidates.length === 0) return undefined;
    const index = Math.floor(unitHash(deriveSeed(this.seed, 'spike-which'), second) * candidates.length);
    return candidates[Math.min(index, candidates.length - 1)];
  }

  // spike: 0 for a normal reading, ±1 for a single-sample spike in that direction.
  private read(quantity: Quantity, s: UnitState, n: number, spike: number): ReadingValue | undefined {
    switch (quantity) {
      case 'ph': {
        const ph = s.ph + this.scenario.phOffset(s.atMs) + 0.01 * n + 2.5 * spike;
        return { quantity, value: round(clamp(ph, 0, 14), 2), unit: 'pH' };
      }
      case 'water_temperature': {
        const c = s.waterTemperatureC + 0.02 * n + 6 * Math.abs(spike);
        return this.probe.temperatureUnit === 'F'
          ? { quantity, value: round(celsiusToFahrenheit({ temperatureC: c }), 2), unit: 'F' }
          : { quantity, value: round(c, 2), unit: 'C' };
      }
      case 'dissolved_oxygen':
        return { quantity, value: round(clamp(s.doMgL + 0.04 * n + 8 * Math.abs(spike), 0, 40), 2), unit: 'mg/L' };
      case 'salinity':
        return { quantity, value: round(Math.max(0, s.salinityPpt + 0.02 * n + 8 * Math.abs(spike)), 2), unit: 'ppt' };
      case 'specific_conductance': {
        const sc = specificConductanceFromSalinity(s.salinityPpt) * (1 + 0.001 * n + 0.5 * Math.abs(spike));
        return { quantity, value: round(sc, 3), unit: 'mS/cm' };
      }
      case 'conductivity': {
        const ec = conductivityFromSalinity(s.salinityPpt, s.waterTemperatureC) * (1 + 0.001 * n + 0.5 * Math.abs(spike));
        return { quantity, value: round(ec, 3), unit: 'mS/cm' };
      }
      case 'flow':
        if (s.flowLpm === null) return undefined;
        return { quantity, value: round(Math.max(0, s.flowLpm * (spike ? 0.05 : 1)), 0), unit: 'L/min' };
      case 'water_level':
        return { quantity, value: round(Math.max(0, s.waterLevelM + 0.002 * n + 0.5 * Math.abs(spike)), 3), unit: 'm' };
      case 'aerator_running':
        return this.params.aerator ? { quantity, value: s.aeratorRunning ? 1 : 0, unit: 'bool' } : undefined;
      case 'pump_running':
        return { quantity, value: s.pumpRunning ? 1 : 0, unit: 'bool' };
    }
  }
}
