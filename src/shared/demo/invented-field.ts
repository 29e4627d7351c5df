/**
 * The INVENTED demo field "Kettle Ridge (invented)": not a real site. Three production wells of an
 * imagined hot-dry-rock system and one injection well, with weekly wellhead readings over twelve
 * years from a seeded lumped model (DOMAIN.md §2 and §7) with some recharge, one well that cools
 * faster than its share of rock allows, flow changes, shut-ins and noise.
 *
 * One model feeds everything, so nothing can drift apart:
 * - `inventedFieldCsv()` is demo/invented-field.csv (written by demo/generate.mjs from the compiled
 *   form of this module; a test compares the committed file with it);
 * - `inventedDemoLog()` (invented-log.ts) is what `tauwell demo` stores: the same readings, plus
 *   wellhead pressures, the injection well's readings, two readings flagged 'bad' and a few entries
 *   that an operator corrected or deleted (so the audit log has something to show);
 * - `inventedExportWithFaults()` (invented-export.ts) is demo/invented-export-with-faults.csv, a
 *   plant export of the last weeks and one week beyond with planted faults (demo/README.md).
 *
 * Exported API:
 *   INVENTED_FIELD, INVENTED_RESERVOIR, INVENTED_WELLS, INJECTION_WELL, INVENTED_START_MS, INVENTED_WEEKS,
 *   REFERENCE_TEMPERATURE_C, WEEK_MS, WEEK_S, MODEL_CW_J_PER_KG_K
 *   inventedSeries(): ModelSeries         the seeded model, exactly as the original generator drew it
 *   inventedFieldCsv(): string
 *   mulberry32(seed), normalOf(rand)      the seeded generators the demo files draw from
 */
import type { ReadingStatus } from '../contract/reading-rules.js';

export const WEEK_MS = 7 * 86_400_000;
export const WEEK_S = 7 * 86400;
const YEAR_S = 365.25 * 86400;
/** J/(kg K), roughly IAPWS-IF97 cp near 160 °C: the model's own constant, not a measured value. */
export const MODEL_CW_J_PER_KG_K = 4300;
const CW = MODEL_CW_J_PER_KG_K;
/** Reinjection temperature, the minimum useful temperature of the production wells. */
export const REFERENCE_TEMPERATURE_C = 70;
/** A Monday morning (UTC); readings are weekly from then on. */
export const INVENTED_START_MS = Date.UTC(2014, 0, 6, 9, 0, 0);
export const INVENTED_WEEKS = 12 * 52;

export const INVENTED_FIELD = {
  name: 'Kettle Ridge (invented)',
  timeZone: 'Pacific/Auckland',
  notes:
    'INVENTED demo field: not a real site. Readings come from a seeded lumped model (src/shared/demo/invented-field.ts); ' +
    'the reservoir parameters describe no real rock.',
} as const;

/** demo/invented-reservoir.json, version 1 of the reservoir's parameters (a test keeps the two equal). */
const RESERVOIR_V1 = {
  note: "INVENTED demo parameters for the imagined Kettle Ridge hot-dry-rock system (one well's swept rock). Not a real site.",
  kind: 'hot-dry-rock',
  surfaceTemperature: 12,
  gradient: 0.034,
  minUsefulTemperature: 70,
  maxDepth: 5200,
  area: 30000,
  rockDensity: 2650,
  rockSpecificHeat: 820,
  massFlow: 50,
  fluid: { iapws: { temperature: 160, pressure: 8 } },
} as const;

export const INVENTED_RESERVOIR = {
  name: 'Kettle Ridge slab (invented)',
  versions: [
    { params: RESERVOIR_V1, note: 'first assumptions (invented)' },
    {
      params: { ...RESERVOIR_V1, area: 24000, note: `${RESERVOIR_V1.note} Version 2: swept area revised from 30000 to 24000 m2.` },
      note: 'revised: an invented tracer test suggests a smaller swept area (30000 → 24000 m2)',
    },
  ],
} as const;

interface ModelWell {
  name: string;
  thetaStartK: number;
  /** Heat capacity of the well's swept rock, J/K. */
  heatCapacityJPerK: number;
  /** Share of the extracted heat replenished. */
  rechargeFraction: number;
  /** [from s after the start, kg/s]. */
  flows: readonly (readonly [number, number])[];
}

const MODEL_WELLS: readonly ModelWell[] = [
  { name: 'KR-1', thetaStartK: 106, heatCapacityJPerK: 2.3e14, rechargeFraction: 0.15, flows: [[0, 45], [5 * YEAR_S, 58]] },
  { name: 'KR-2', thetaStartK: 99, heatCapacityJPerK: 2.0e14, rechargeFraction: 0.05, flows: [[0, 50], [7.5 * YEAR_S, 40]] },
  { name: 'KR-3', thetaStartK: 111, heatCapacityJPerK: 0.9e14, rechargeFraction: 0.0, flows: [[0, 42]] },
];
export const INJECTION_WELL = 'KR-4I';

export const INVENTED_WELLS: readonly { name: string; kind: 'production' | 'injection' }[] = [
  ...MODEL_WELLS.map((w) => ({ name: w.name, kind: 'production' as const })),
  { name: INJECTION_WELL, kind: 'injection' },
];

/** mulberry32: a small seeded generator, enough for invented data (and the original generator's). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Box–Muller; draws two uniforms, in this order, as the original generator did. */
export function normalOf(rand: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
}

/** One model reading as logged: numbers rounded as the CSV writes them, and that text. */
export interface ModelReading {
  well: string;
  week: number;
  timeMs: number;
  productionTemperatureC: number;
  flowKgPerS: number;
  injectionTemperatureC: number;
  status: Extract<ReadingStatus, 'producing' | 'shut-in'>;
  /** The CSV cells: time, production temperature, flow, injection temperature. */
  text: { time: string; productionTemperature: string; flow: string; injectionTemperature: string };
}

export interface ModelSeries {
  readings: ModelReading[];
  /** Per well after the last week: θ (K) and the flow of the last flow period (kg/s), to continue the model. */
  end: Record<string, { thetaK: number; flowKgPerS: number; heatCapacityJPerK: number; rechargeFraction: number }>;
}

function flowAt(well: ModelWell, tS: number): number {
  return (well.flows.filter(([from]) => tS >= from).at(-1) as readonly [number, number])[1];
}

/** The seeded model: one random stream, drawn well after well, week after week, exactly as the original generator. */
export function inventedSeries(): ModelSeries {
  const rand = mulberry32(20261201);
  const normal = normalOf(rand);
  const readings: ModelReading[] = [];
  const end: ModelSeries['end'] = {};
  for (const well of MODEL_WELLS) {
    let theta = well.thetaStartK;
    let shutInLeft = 0;
    for (let k = 0; k < INVENTED_WEEKS; k++) {
      const t = k * WEEK_S;
      const flow = flowAt(well, t);
      if (shutInLeft === 0 && rand() < 0.012) shutInLeft = 1 + Math.floor(rand() * 3);
      const producing = shutInLeft === 0;
      if (!producing) shutInLeft--;
      // C·dθ/dt = −ṁ·cw·θ·(1 − f) over one week while producing (DOMAIN.md §2 and §7).
      if (producing && k > 0) theta *= Math.exp((-flow * CW * (1 - well.rechargeFraction) * WEEK_S) / well.heatCapacityJPerK);
      const timeMs = INVENTED_START_MS + t * 1000;
      const measured = producing ? REFERENCE_TEMPERATURE_C + theta + 0.35 * normal() : REFERENCE_TEMPERATURE_C + theta - 8 - 4 * rand();
      const flowLogged = producing ? flow * (1 + 0.01 * normal()) : 0;
      const inj = REFERENCE_TEMPERATURE_C + 0.5 * normal();
      const text = {
        time: new Date(timeMs).toISOString().replace('.000Z', 'Z'),
        productionTemperature: measured.toFixed(2),
        flow: flowLogged.toFixed(1),
        injectionTemperature: inj.toFixed(1),
      };
      readings.push({
        well: well.name, week: k, timeMs,
        productionTemperatureC: Number(text.productionTemperature),
        flowKgPerS: Number(text.flow),
        injectionTemperatureC: Number(text.injectionTemperature),
        status: producing ? 'producing' : 'shut-in',
        text,
      });
    }
    end[well.name] = {
      thetaK: theta, flowKgPerS: flowAt(well, INVENTED_WEEKS * WEEK_S),
      heatCapacityJPerK: well.heatCapacityJPerK, rechargeFraction: well.rechargeFraction,
    };
  }
  return { readings, end };
}

/** demo/invented-field.csv. */
export function inventedFieldCsv(): string {
  const rows = ['time,well,production_temp_C,flow_kg_s,injection_temp_C,status'];
  for (const r of inventedSeries().readings) {
    rows.push([r.text.time, r.well, r.text.productionTemperature, r.text.flow, r.text.injectionTemperature, r.status].join(','));
  }
  return rows.join('\n') + '\n';
}
