/**
 * The rules every wellhead reading obeys, however it arrives (typed in, logged through the API, or
 * read from a plant export): which statuses exist, which temperatures are possible, that a flow is
 * never negative, and how a logged value in the user's unit becomes the stored °C / kg/s / Pa.
 * The manual log and the services use these functions; the CSV import applies the same rules with
 * the same arithmetic on its hot path (src/shared/import/row-validator.ts), and
 * test/services-contract.test.ts keeps the limits and the status words of the two equal, so a
 * reading is judged — and stored as the same doubles — however it came in.
 *
 * Volume flows become mass flows with the IAPWS-IF97 region 1 density of the produced water at the
 * production temperature (the injection temperature for an injection well, which logs no production
 * temperature) and the logged wellhead pressure; with no pressure logged, at saturation + 1 MPa,
 * a representative margin that keeps the line liquid. The density is returned so it can be stored
 * beside the reading as the recorded assumption (DOMAIN.md §4–5).
 *
 * Exported API:
 *   READING_STATUSES, type ReadingStatus, STATUS_WORDS, parseStatus(text, field?): ReadingStatus
 *   FIT_EXCLUDING_FLAGS ('bad', 'spike'), checkFlags(flags, field?): string[]
 *   PLAUSIBLE_TEMPERATURE_C { min: −50, max: 400 }
 *   temperatureC(value, unit, field, unitField?): { valueC, unit }   checked against the plausible range
 *   pressurePa(value, unit, field, unitField?): { valuePa, unit }    absolute; zero or below refused
 *   flowDensity(temperatureC, pressurePa | null, field?): FlowDensity
 *   flowValues(value, unit, densityAt, field?, unitField?): FlowValues   negative refused; volume → mass
 *   massOfVolumeFlow(volumeM3PerS, densityKgPerM3): number
 *   normaliseReading(entered: EnteredReading, names?): NormalisedReading   all of the above for one reading
 */
import { InputError } from '../errors.js';
import { findUnit } from '../units.js';
import { liquidDensityKgPerM3, saturationPressurePa } from '../water/iapws97.js';

export const READING_STATUSES = ['producing', 'shut-in', 'test'] as const;
export type ReadingStatus = (typeof READING_STATUSES)[number];

/** Flags that keep a reading in the log but out of every fit. */
export const FIT_EXCLUDING_FLAGS: readonly string[] = ['bad', 'spike'];

/**
 * Beyond these a logged temperature is a typing or sensor error, not a reading: no wellhead fluid
 * is below −50 °C, and 400 °C is above any liquid-dominated production well (and above the
 * critical point of water, 373.946 °C, IAPWS-IF97). Within them the reading is stored as logged.
 */
export const PLAUSIBLE_TEMPERATURE_C = { min: -50, max: 400 } as const;

/**
 * Wellhead margin over saturation assumed for the density of a volume flow when no pressure was
 * logged (an assumption the reading records); compressed-liquid density changes by about 0.05 %
 * per MPa below 200 °C (IAPWS-IF97 region 1), so the exact margin hardly matters.
 */
export const ASSUMED_MARGIN_OVER_SATURATION_PA = 1e6;

const ZERO_CELSIUS_K = 273.15; // exact offset of the Celsius scale (SI Brochure)
const FLAG_PATTERN = /^[a-z0-9][a-z0-9-]*$/;

/** The spellings a status may take, the same words as the CSV import's (a test keeps the two lists equal). */
export const STATUS_WORDS: Readonly<Record<ReadingStatus, readonly string[]>> = {
  producing: ['producing', 'production', 'prod', 'p', 'on', 'online', 'on-line', 'on line', 'running'],
  'shut-in': ['shut-in', 'shut in', 'shutin', 'shut_in', 'si', 'off', 'offline', 'off-line', 'shut'],
  test: ['test', 'testing', 'well test', 't'],
};

const STATUS_SPELLINGS = new Map<string, ReadingStatus>(
  (Object.keys(STATUS_WORDS) as ReadingStatus[]).flatMap((status) => STATUS_WORDS[status].map((w) => [w, status] as const)),
);

/** A status in any common spelling and case ('Shut in' → 'shut-in'); anything else is refused. */
export function parseStatus(text: string, field = 'status'): ReadingStatus {
  const key = typeof text === 'string' ? text.trim().toLowerCase().replace(/\s+/g, ' ') : '';
  const status = STATUS_SPELLINGS.get(key);
  if (status === undefined) {
    throw new InputError(`unknown status ${JSON.stringify(text)}; one of ${READING_STATUSES.join(', ')}`, { field });
  }
  return status;
}

/** Flags as stored: lower-case words with dashes, without repeats, in first-seen order. */
export function checkFlags(flags: readonly string[], field = 'flags'): string[] {
  const out: string[] = [];
  for (const raw of flags) {
    const flag = typeof raw === 'string' ? raw.trim().toLowerCase() : '';
    if (!FLAG_PATTERN.test(flag)) {
      throw new InputError(`each flag is lower-case letters, digits and dashes (got ${JSON.stringify(raw)})`, { field });
    }
    if (!out.includes(flag)) out.push(flag);
  }
  return out;
}

/** A temperature in °C from `value` in `unit` (degC, degF, K or an alias), refused outside the plausible range. */
export function temperatureC(value: number, unit: string, field: string, unitField = field): { valueC: number; unit: string } {
  const def = findUnit(unit, 'temperature', unitField);
  if (!Number.isFinite(value)) throw new InputError(`must be a finite number (got ${value})`, { field });
  const valueC = celsiusOf(value, def.symbol, def.toSI);
  const { min, max } = PLAUSIBLE_TEMPERATURE_C;
  if (valueC < min || valueC > max) {
    const shown = def.symbol === 'degC' ? `${value} °C` : `${value} ${def.symbol} = ${Number(valueC.toFixed(2))} °C`;
    throw new InputError(`impossible temperature ${shown}: a wellhead reading lies between ${min} °C and ${max} °C`, { field });
  }
  return { valueC, unit: def.symbol };
}

/**
 * °C without a round trip through kelvin, which would cost 175.3 °C its last binary digit: °C as typed,
 * T(°C) = (T(°F) − 32)·5/9 (NIST SP 811 B.8), T(°C) = T(K) − 273.15. The same arithmetic as the CSV
 * import, so the same entry is stored as the same double whichever way it came in.
 */
function celsiusOf(value: number, symbol: string, toSI: (v: number) => number): number {
  if (symbol === 'degC') return value;
  if (symbol === 'degF') return ((value - 32) * 5) / 9;
  return toSI(value) - ZERO_CELSIUS_K;
}

/** An absolute pressure in Pa from `value` in `unit` (MPa, kPa, bar, psi, …); zero or below is refused. */
export function pressurePa(value: number, unit: string, field: string, unitField = field): { valuePa: number; unit: string } {
  const def = findUnit(unit, 'pressure', unitField);
  if (!Number.isFinite(value)) throw new InputError(`must be a finite number (got ${value})`, { field });
  if (!(value > 0)) throw new InputError(`impossible pressure ${value} ${def.symbol}: wellhead pressures are absolute, above zero`, { field });
  return { valuePa: def.toSI(value), unit: def.symbol };
}

export interface FlowDensity {
  densityKgPerM3: number;
  temperatureC: number;
  /** Pressure the density was evaluated at: the logged one, or saturation + 1 MPa. */
  pressurePa: number;
  pressureAssumed: boolean;
  /** The assumption in words, for the record. */
  note: string;
}

/** Density of the produced water for a volume-flow conversion (IAPWS-IF97 region 1). */
export function flowDensity(temperatureC: number, loggedPressurePa: number | null, field = 'flow'): FlowDensity {
  const t = temperatureC + ZERO_CELSIUS_K;
  try {
    const assumed = loggedPressurePa === null;
    const p = assumed ? saturationPressurePa(t) + ASSUMED_MARGIN_OVER_SATURATION_PA : loggedPressurePa;
    // The same function as the import's, so a reading logged by hand and the same reading imported are
    // the same doubles and compare as exact duplicates.
    const density = liquidDensityKgPerM3(t, p);
    const at = assumed ? `saturation + 1 MPa = ${round(p / 1e6, 4)} MPa (no pressure logged)` : `the logged ${round(p / 1e6, 4)} MPa`;
    return {
      densityKgPerM3: density,
      temperatureC,
      pressurePa: p,
      pressureAssumed: assumed,
      note: `volume flow converted to mass with the IAPWS-IF97 water density ${round(density, 6)} kg/m3 at ${round(temperatureC, 4)} °C and ${at}`,
    };
  } catch (e) {
    if (e instanceof InputError) {
      throw new InputError(`cannot convert the volume flow to a mass flow: ${e.reason}; log the flow as a mass flow (kg/s, t/h) or check the temperature and pressure`, { field });
    }
    throw e;
  }
}

export interface FlowValues {
  /** As entered, when entered as a mass flow. */
  massFlowKgPerS: number | null;
  /** As entered, when entered as a volume flow. */
  volumeFlowM3PerS: number | null;
  flowUnit: string;
  normalisedMassFlowKgPerS: number;
  /** Density used for a volume flow; null for a mass flow. */
  flowDensityKgPerM3: number | null;
  /** The density assumption in words, or null for a mass flow. */
  densityNote: string | null;
}

/**
 * A logged flow in any mass or volume unit. `densityAt` is asked for the density only when the unit
 * is a volume unit, so a mass flow needs no temperature.
 */
export function flowValues(value: number, unit: string, densityAt: () => FlowDensity, field = 'flow', unitField = field): FlowValues {
  const def = findUnit(unit, ['massFlow', 'volumeFlow'], unitField);
  if (!Number.isFinite(value)) throw new InputError(`must be a finite number (got ${value})`, { field });
  if (value < 0) throw new InputError(`negative flow ${value} ${def.symbol}: a flow is logged as a magnitude ≥ 0`, { field });
  const si = def.toSI(value);
  if (def.quantity === 'massFlow') {
    return { massFlowKgPerS: si, volumeFlowM3PerS: null, flowUnit: def.symbol, normalisedMassFlowKgPerS: si, flowDensityKgPerM3: null, densityNote: null };
  }
  const d = densityAt();
  return {
    massFlowKgPerS: null,
    volumeFlowM3PerS: si,
    flowUnit: def.symbol,
    normalisedMassFlowKgPerS: massOfVolumeFlow(si, d.densityKgPerM3),
    flowDensityKgPerM3: d.densityKgPerM3,
    densityNote: d.note,
  };
}

/** ṁ = V̇·ρ. */
export function massOfVolumeFlow(volumeM3PerS: number, densityKgPerM3: number): number {
  return volumeM3PerS * densityKgPerM3;
}

/** One reading as logged: numbers in the units named beside them. */
export interface EnteredReading {
  productionTemperature?: number | null;
  injectionTemperature?: number | null;
  /** Unit of both temperatures; default degC. */
  temperatureUnit?: string | null;
  flow?: number | null;
  /** Required with a flow. */
  flowUnit?: string | null;
  pressure?: number | null;
  /** Default MPa. */
  pressureUnit?: string | null;
  status?: string | null;
}

/** The measured values of a stored reading; temperatures in °C, the rest SI, each with the unit it was entered in. */
export interface ReadingValues {
  productionTemperatureC: number | null;
  injectionTemperatureC: number | null;
  temperatureUnit: string | null;
  /** As entered, when entered as a mass flow. */
  massFlowKgPerS: number | null;
  /** As entered, when entered as a volume flow. */
  volumeFlowM3PerS: number | null;
  flowUnit: string | null;
  /** Mass flow; a volume flow converted with `flowDensityKgPerM3`. */
  normalisedMassFlowKgPerS: number | null;
  /** Water density used for that conversion: the recorded assumption. */
  flowDensityKgPerM3: number | null;
  pressurePa: number | null;
  pressureUnit: string | null;
  status: ReadingStatus;
  note: string;
  /** e.g. 'spike', 'bad'; a flagged reading is kept in the log but left out of fits. */
  flags: string[];
}

/** The result of normalising entered values: the stored values less note and flags, with the assumptions applied. */
export interface NormalisedReading extends Omit<ReadingValues, 'note' | 'flags'> {
  /** Plain-words assumptions applied (the density of a volume flow). */
  assumptions: string[];
}

/** Names used in messages for each value: the contract's by default, a file's column headers for an import. */
export interface ReadingFieldNames {
  productionTemperature: string;
  injectionTemperature: string;
  temperatureUnit: string;
  flow: string;
  flowUnit: string;
  pressure: string;
  pressureUnit: string;
  status: string;
}

export const CONTRACT_FIELD_NAMES: ReadingFieldNames = {
  productionTemperature: 'productionTemperature',
  injectionTemperature: 'injectionTemperature',
  temperatureUnit: 'temperatureUnit',
  flow: 'flow',
  flowUnit: 'flowUnit',
  pressure: 'pressure',
  pressureUnit: 'pressureUnit',
  status: 'status',
};

export function normaliseReading(entered: EnteredReading, names: ReadingFieldNames = CONTRACT_FIELD_NAMES): NormalisedReading {
  const temperatureUnit = entered.temperatureUnit ?? 'degC';
  const given = (v: number | null | undefined): v is number => v !== null && v !== undefined;
  const production = given(entered.productionTemperature)
    ? temperatureC(entered.productionTemperature, temperatureUnit, names.productionTemperature, names.temperatureUnit)
    : null;
  const injection = given(entered.injectionTemperature)
    ? temperatureC(entered.injectionTemperature, temperatureUnit, names.injectionTemperature, names.temperatureUnit)
    : null;
  const pressure = given(entered.pressure) ? pressurePa(entered.pressure, entered.pressureUnit ?? 'MPa', names.pressure, names.pressureUnit) : null;
  let flow: FlowValues | null = null;
  if (given(entered.flow)) {
    if (entered.flowUnit === null || entered.flowUnit === undefined) {
      throw new InputError('a flow needs its unit: kg/s, t/h, m3/s, m3/h, L/s, gpm or bbl/d', { field: names.flowUnit });
    }
    flow = flowValues(entered.flow, entered.flowUnit, () => {
      const t = production?.valueC ?? injection?.valueC;
      if (t === undefined) {
        throw new InputError('a volume flow needs a production (or injection) temperature for the water density that turns it into a mass flow', { field: names.flow });
      }
      return flowDensity(t, pressure?.valuePa ?? null, names.flow);
    }, names.flow, names.flowUnit);
  }
  const status = entered.status === null || entered.status === undefined ? 'producing' : parseStatus(entered.status, names.status);
  return {
    productionTemperatureC: production?.valueC ?? null,
    injectionTemperatureC: injection?.valueC ?? null,
    temperatureUnit: (production ?? injection)?.unit ?? null,
    massFlowKgPerS: flow?.massFlowKgPerS ?? null,
    volumeFlowM3PerS: flow?.volumeFlowM3PerS ?? null,
    flowUnit: flow?.flowUnit ?? null,
    normalisedMassFlowKgPerS: flow?.normalisedMassFlowKgPerS ?? null,
    flowDensityKgPerM3: flow?.flowDensityKgPerM3 ?? null,
    pressurePa: pressure?.valuePa ?? null,
    pressureUnit: pressure?.unit ?? null,
    status,
    assumptions: flow === null || flow.densityNote === null ? [] : [flow.densityNote],
  };
}

function round(v: number, digits: number): number {
  return Number(v.toPrecision(digits));
}
