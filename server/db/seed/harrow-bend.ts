// The invented demo farm of product.md: "Harrow Bend Fish Farm". Every name, place and number here is
// made up for the demo, except the threshold and feeding defaults, which carry their source labels.
import type { ThresholdRule } from '../entities';
import type { FeedingTableRow, UnitKind, UnitState, WaterType } from '../entities';
import type { Quantity } from '../../../shared/schemas/mqtt.schema';

export const HARROW_BEND = {
  slug: 'harrow-bend',
  name: 'Harrow Bend Fish Farm',
  timeZone: 'America/Chicago',
  // Invented coordinates in open country.
  origin: { lon: -91.02875, lat: 33.26431 },
};

export const CEDAR_FLATS = {
  slug: 'cedar-flats',
  name: 'Cedar Flats Hatchery',
  timeZone: 'America/Denver',
  origin: { lon: -104.61802, lat: 38.90155 },
};

export const DEMO_PASSWORD = 'gillwise-demo';

export const demoUsers = [
  { email: 'hand@harrowbend.example', name: 'Marisol Ortega', role: 'hand', farm: 'harrow-bend', isAdmin: false, locale: 'en' },
  { email: 'hand2@harrowbend.example', name: 'Tomás Reyes', role: 'hand', farm: 'harrow-bend', isAdmin: false, locale: 'es' },
  { email: 'manager@harrowbend.example', name: 'Dale Whitcomb', role: 'manager', farm: 'harrow-bend', isAdmin: false, locale: 'en' },
  { email: 'planner@harrowbend.example', name: 'Priya Raman', role: 'planner', farm: 'harrow-bend', isAdmin: false, locale: 'en' },
  { email: 'admin@harrowbend.example', name: 'Sam Okafor', role: null, farm: null, isAdmin: true, locale: 'en' },
  { email: 'manager@cedarflats.example', name: 'June Halvorsen', role: 'manager', farm: 'cedar-flats', isAdmin: false, locale: 'en' },
  { email: 'hand@cedarflats.example', name: 'Eli Brandt', role: 'hand', farm: 'cedar-flats', isAdmin: false, locale: 'en' },
] as const;

export type DemoUnit = {
  code: string;
  name: string;
  kind: UnitKind;
  species: string;
  lifeStage: string;
  waterType: WaterType;
  salinityPpt: number;
  state: UnitState;
  /** Position of the south-west corner and size, metres. */
  at: [number, number, number, number];
  depthM: number;
  designFlowLpm?: number;
  stock: { count: number; meanWeightG: number; daysAgo: number; meanLengthCm?: number };
  protein: number;
  probe: { quantities: Quantity[]; scenario: string; temperatureUnit?: 'C' | 'F' };
};

const pondProbe: DemoUnit['probe'] = { quantities: ['ph', 'water_temperature', 'dissolved_oxygen', 'aerator_running'], scenario: 'steady' };

export const harrowBendUnits: DemoUnit[] = [
  { code: 'P1', name: 'Pond 1 — North Levee', kind: 'pond', species: 'channel_catfish', lifeStage: 'food_fish', waterType: 'fresh', salinityPpt: 0, state: 'active', at: [0, 260, 140, 110], depthM: 1.2, stock: { count: 22000, meanWeightG: 410, daysAgo: 120 }, protein: 0.32, probe: pondProbe },
  { code: 'P2', name: 'Pond 2 — Willow', kind: 'pond', species: 'channel_catfish', lifeStage: 'food_fish', waterType: 'fresh', salinityPpt: 0, state: 'active', at: [150, 260, 140, 110], depthM: 1.2, stock: { count: 20500, meanWeightG: 455, daysAgo: 130 }, protein: 0.32, probe: { ...pondProbe, temperatureUnit: 'F' } },
  { code: 'P3', name: 'Pond 3 — Cottonwood', kind: 'pond', species: 'channel_catfish', lifeStage: 'food_fish', waterType: 'fresh', salinityPpt: 0, state: 'active', at: [300, 260, 140, 110], depthM: 1.3, stock: { count: 24000, meanWeightG: 380, daysAgo: 110 }, protein: 0.32, probe: pondProbe },
  { code: 'P4', name: 'Pond 4 — Long Reach', kind: 'pond', species: 'nile_tilapia', lifeStage: 'grow_out', waterType: 'fresh', salinityPpt: 0, state: 'active', at: [0, 140, 140, 110], depthM: 1.1, stock: { count: 30000, meanWeightG: 180, daysAgo: 75 }, protein: 0.3, probe: pondProbe },
  { code: 'P5', name: 'Pond 5 — New Cut', kind: 'pond', species: 'nile_tilapia', lifeStage: 'fingerling', waterType: 'fresh', salinityPpt: 0, state: 'cycling', at: [150, 140, 140, 110], depthM: 1.1, stock: { count: 18000, meanWeightG: 24, daysAgo: 12 }, protein: 0.36, probe: { ...pondProbe, scenario: 'cycling' } },
  { code: 'P6', name: 'Pond 6 — Heron', kind: 'pond', species: 'nile_tilapia', lifeStage: 'grow_out', waterType: 'fresh', salinityPpt: 0, state: 'active', at: [300, 140, 140, 110], depthM: 1.1, stock: { count: 28000, meanWeightG: 240, daysAgo: 90 }, protein: 0.3, probe: pondProbe },
  { code: 'R1', name: 'Raceway 1', kind: 'raceway', species: 'rainbow_trout', lifeStage: 'food_fish', waterType: 'fresh', salinityPpt: 0, state: 'active', at: [470, 140, 3, 30], depthM: 0.9, designFlowLpm: 2600, stock: { count: 2400, meanWeightG: 210, daysAgo: 95, meanLengthCm: 25 }, protein: 0.42, probe: { quantities: ['ph', 'water_temperature', 'dissolved_oxygen', 'flow'], scenario: 'steady' } },
  { code: 'R2', name: 'Raceway 2', kind: 'raceway', species: 'rainbow_trout', lifeStage: 'food_fish', waterType: 'fresh', salinityPpt: 0, state: 'active', at: [476, 140, 3, 30], depthM: 0.9, designFlowLpm: 2600, stock: { count: 2500, meanWeightG: 190, daysAgo: 90, meanLengthCm: 24 }, protein: 0.42, probe: { quantities: ['ph', 'water_temperature', 'dissolved_oxygen', 'flow'], scenario: 'steady' } },
  { code: 'R3', name: 'Raceway 3', kind: 'raceway', species: 'rainbow_trout', lifeStage: 'food_fish', waterType: 'fresh', salinityPpt: 0, state: 'active', at: [482, 140, 3, 30], depthM: 0.9, designFlowLpm: 2600, stock: { count: 2600, meanWeightG: 230, daysAgo: 100, meanLengthCm: 26 }, protein: 0.42, probe: { quantities: ['ph', 'water_temperature', 'dissolved_oxygen', 'flow'], scenario: 'flow-cut' } },
  { code: 'R4', name: 'Raceway 4', kind: 'raceway', species: 'rainbow_trout', lifeStage: 'fingerling', waterType: 'fresh', salinityPpt: 0, state: 'active', at: [488, 140, 3, 30], depthM: 0.9, designFlowLpm: 2200, stock: { count: 6000, meanWeightG: 45, daysAgo: 40, meanLengthCm: 15 }, protein: 0.45, probe: { quantities: ['ph', 'water_temperature', 'dissolved_oxygen', 'flow'], scenario: 'steady' } },
  { code: 'S1', name: 'Shrimp Pond East', kind: 'pond', species: 'whiteleg_shrimp', lifeStage: 'juvenile', waterType: 'brackish', salinityPpt: 18, state: 'active', at: [0, 0, 70, 70], depthM: 1.0, stock: { count: 250000, meanWeightG: 9, daysAgo: 50 }, protein: 0.35, probe: { quantities: ['ph', 'water_temperature', 'dissolved_oxygen', 'salinity', 'aerator_running'], scenario: 'steady' } },
  { code: 'S2', name: 'Shrimp Pond West', kind: 'pond', species: 'whiteleg_shrimp', lifeStage: 'juvenile', waterType: 'brackish', salinityPpt: 15, state: 'active', at: [80, 0, 70, 70], depthM: 1.0, stock: { count: 240000, meanWeightG: 8, daysAgo: 48 }, protein: 0.35, probe: { quantities: ['ph', 'water_temperature', 'dissolved_oxygen', 'specific_conductance', 'aerator_running'], scenario: 'steady' } },
];

export const cedarFlatsUnits: DemoUnit[] = [
  { code: 'T1', name: 'Hatchery Tank 1', kind: 'tank', species: 'rainbow_trout', lifeStage: 'fry', waterType: 'fresh', salinityPpt: 0, state: 'active', at: [0, 0, 4, 4], depthM: 1, designFlowLpm: 120, stock: { count: 9000, meanWeightG: 2, daysAgo: 20, meanLengthCm: 5 }, protein: 0.5, probe: { quantities: ['ph', 'water_temperature', 'dissolved_oxygen'], scenario: 'steady' } },
];

// --- threshold profiles (husbandry.md §3; each rule names its basis and source label) ---
const src = {
  commonNh3: 'common practice, no source: about 0.02 mg/L NH3 already harms fish',
  fa27: 'UF/IFAS FA27 (published): aerate when DO is projected below 4 mg/L',
};
export const thresholdProfiles: Array<{ species: string; name: string; rules: ThresholdRule[] }> = [
  {
    species: 'channel_catfish',
    name: 'Channel catfish — food fish',
    rules: [
      { metric: 'nh3', watch: 0.02, act: 0.05, basis: 'mg/L NH3', source: `${src.commonNh3}; 0.02–0.05 chronic guidance (husbandry §3)` },
      { metric: 'tan', watch: 2, act: 4, basis: 'mg/L TAN', source: 'product decision' },
      { metric: 'nitrite', watch: 0.5, act: 1, basis: 'mg/L NO2-N', source: 'product decision; keep chloride ≥ 10 × nitrite (SRAC 462, published)' },
      { metric: 'do_min', watch: 4, act: 2.5, basis: 'mg/L DO', source: `${src.fa27}; < 2.5 mortality (husbandry §3)` },
      { metric: 'ph_min', watch: 6.8, act: 6.5, basis: 'pH', source: 'Piper et al. 1982: 6.5–9.0 (published)' },
      { metric: 'ph_max', watch: 8.8, act: 9, basis: 'pH', source: 'Piper et al. 1982: 6.5–9.0 (published)' },
      { metric: 'temperature_max', watch: 31, act: 33.5, basis: '°C', source: 'upper lethal ~33.5 °C acclimated at 25 (husbandry §3)' },
    ],
  },
  {
    species: 'nile_tilapia',
    name: 'Nile tilapia — grow-out',
    rules: [
      { metric: 'nh3', watch: 0.03, act: 0.1, basis: 'mg/L NH3', source: `${src.commonNh3}; tilapia tolerate more (product decision)` },
      { metric: 'tan', watch: 2, act: 4, basis: 'mg/L TAN', source: 'product decision' },
      { metric: 'nitrite', watch: 1, act: 5, basis: 'mg/L NO2-N', source: 'product decision (< 27 mg/L in fresh water, husbandry §3)' },
      { metric: 'do_min', watch: 4, act: 2.3, basis: 'mg/L DO', source: 'keep ≥ 2.3 (husbandry §3)' },
      { metric: 'ph_min', watch: 6.5, act: 6, basis: 'pH', source: '6–9 best (husbandry §3)' },
      { metric: 'ph_max', watch: 8.8, act: 9, basis: 'pH', source: '6–9 best (husbandry §3)' },
      { metric: 'temperature_min', watch: 20, act: 17.2, basis: '°C', source: 'stops feeding below 17.2 °C (SRAC 283, published)' },
    ],
  },
  {
    species: 'rainbow_trout',
    name: 'Rainbow trout — raceway',
    rules: [
      { metric: 'nh3', watch: 0.0125, act: 0.025, basis: 'mg/L NH3', source: 'EIFAC 1970 ≤ 0.025 mg/L NH3 (from memory)' },
      { metric: 'tan', watch: 1, act: 2, basis: 'mg/L TAN', source: 'product decision' },
      { metric: 'do_min', watch: 6, act: 5, basis: 'mg/L DO', source: 'Piper et al. 1982: ≥ 5.0 minimum (published)' },
      { metric: 'temperature_max', watch: 19, act: 21, basis: '°C', source: 'chronic limit 19, upper ~21 °C (husbandry §3)' },
      { metric: 'flow_min', watch: 1800, act: 1000, basis: 'L/min', source: 'product decision for the design flow of 2,600 L/min' },
      { metric: 'ph_min', watch: 6.8, act: 6.5, basis: 'pH', source: '6.5–9.0 (husbandry §3)' },
      { metric: 'ph_max', watch: 8.8, act: 9, basis: 'pH', source: '6.5–9.0 (husbandry §3)' },
    ],
  },
  {
    species: 'whiteleg_shrimp',
    name: 'Whiteleg shrimp — brackish pond',
    rules: [
      {
        metric: 'nh3',
        watch: 0.08,
        act: 0.16,
        basis: 'mg/L NH3-N',
        source: 'Lin & Chen 2001: safe 0.12 / 0.16 / 0.16 mg/L NH3-N at 15 / 25 / 35 ‰ (published); act = safe level at the unit salinity, watch = half (product decision)',
        bySalinity: [
          { salinityPpt: 15, act: 0.12 },
          { salinityPpt: 25, act: 0.16 },
          { salinityPpt: 35, act: 0.16 },
        ],
      },
      { metric: 'nitrite', watch: 3, act: 6.1, basis: 'mg/L NO2-N', source: 'Lin & Chen 2003: safe 6.1 mg/L NO2-N at 15 ‰ (published)' },
      { metric: 'do_min', watch: 4, act: 3, basis: 'mg/L DO', source: '≥ 3 daily minimum (Boyd, husbandry §3)' },
      { metric: 'ph_min', watch: 7.2, act: 7, basis: 'pH', source: '7–9 (from memory)' },
      { metric: 'ph_max', watch: 8.8, act: 9, basis: 'pH', source: '7–9 (from memory)' },
      { metric: 'temperature_min', watch: 23, act: 20, basis: '°C', source: 'stop feeding below 20 °C (from memory)' },
    ],
  },
];

// --- feeding tables (husbandry.md §2) ---
export const feedingTables: Array<{ species: string; name: string; source: string; maxKgPerHaPerDay?: number; rows: FeedingTableRow[] }> = [
  {
    species: 'channel_catfish',
    name: 'Channel catfish, food fish in ponds',
    source: 'extension sources (published); 18.3–21 °C band is a product decision',
    maxKgPerHaPerDay: 134.5,
    rows: [
      { minTemperatureC: -5, maxTemperatureC: 7.2, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 0, daysPerWeek: 0, note: 'no feeding below 7.2 °C' },
      { minTemperatureC: 7.2, maxTemperatureC: 12.8, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 1, daysPerWeek: 2, note: '1 % BW twice a week' },
      { minTemperatureC: 12.8, maxTemperatureC: 18.3, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 1, daysPerWeek: 3.5, note: '1 % BW every other day' },
      { minTemperatureC: 18.3, maxTemperatureC: 21, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 1.5, daysPerWeek: 7, note: 'product decision' },
      { minTemperatureC: 21, maxTemperatureC: 40, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 3, daysPerWeek: 7, note: 'once daily to satiation, capped at 3 % BW' },
    ],
  },
  {
    species: 'nile_tilapia',
    name: 'Nile tilapia by size (full ration at ≥ 29 °C)',
    source: 'size table from memory; temperature bands SRAC 283 (published); linear scaling between 17.2 and 29 °C is a product decision',
    rows: [
      { minTemperatureC: 17.2, maxTemperatureC: 40, minWeightG: 0, maxWeightG: 1, pctBodyWeightPerDay: 20, daysPerWeek: 7 },
      { minTemperatureC: 17.2, maxTemperatureC: 40, minWeightG: 1, maxWeightG: 5, pctBodyWeightPerDay: 8, daysPerWeek: 7 },
      { minTemperatureC: 17.2, maxTemperatureC: 40, minWeightG: 5, maxWeightG: 20, pctBodyWeightPerDay: 5, daysPerWeek: 7 },
      { minTemperatureC: 17.2, maxTemperatureC: 40, minWeightG: 20, maxWeightG: 100, pctBodyWeightPerDay: 3.5, daysPerWeek: 7 },
      { minTemperatureC: 17.2, maxTemperatureC: 40, minWeightG: 100, maxWeightG: 1e6, pctBodyWeightPerDay: 2.25, daysPerWeek: 7 },
    ],
  },
  {
    species: 'rainbow_trout',
    name: 'Rainbow trout, hatchery constant (FCR 1.2, ΔL 0.1 cm/day)',
    source: 'Haskell 1959; Piper et al. 1982 (from memory): % BW = 3 × FCR × ΔL × 100 / L; half ration 19–21 °C, none above 21 °C (published guidance, thresholds product decisions)',
    rows: [
      { minTemperatureC: 0, maxTemperatureC: 19, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: -1, daysPerWeek: 7, note: 'hatchery constant' },
      { minTemperatureC: 19, maxTemperatureC: 21, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: -0.5, daysPerWeek: 7, note: 'half of the hatchery-constant ration' },
      { minTemperatureC: 21, maxTemperatureC: 40, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 0, daysPerWeek: 0, note: 'stop feeding above 21 °C' },
    ],
  },
  {
    species: 'whiteleg_shrimp',
    name: 'Whiteleg shrimp, juveniles',
    source: 'from memory: stop below 20 °C, half ration below 23 °C or above 33 °C; % BW by size is a product decision',
    rows: [
      { minTemperatureC: 0, maxTemperatureC: 20, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 0, daysPerWeek: 0, note: 'stop below 20 °C' },
      { minTemperatureC: 20, maxTemperatureC: 23, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 2, daysPerWeek: 7, note: 'half ration' },
      { minTemperatureC: 23, maxTemperatureC: 33, minWeightG: 0, maxWeightG: 5, pctBodyWeightPerDay: 6, daysPerWeek: 7 },
      { minTemperatureC: 23, maxTemperatureC: 33, minWeightG: 5, maxWeightG: 1e6, pctBodyWeightPerDay: 4, daysPerWeek: 7 },
      { minTemperatureC: 33, maxTemperatureC: 45, minWeightG: 0, maxWeightG: 1e6, pctBodyWeightPerDay: 2, daysPerWeek: 7, note: 'half ration' },
    ],
  },
];
