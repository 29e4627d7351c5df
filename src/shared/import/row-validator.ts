/**
 * One data row of a plant export → a validated reading, or a rejection whose one-line reason
 * names the column and the value at fault. Never throws for a bad row; the only exception that
 * escapes is the date-order InputError of timestamps.ts, which stops the whole import because it
 * would apply to every row.
 *
 * Checks, in column order: a required cell (time, well, production temperature) is empty; a
 * number or timestamp does not parse; a production or injection temperature lies below −50 °C or
 * above 400 °C, which no geothermal wellhead of these plants can show (a unit mix-up or a sensor
 * fault); a flow is negative; a pressure is not above zero (pressures are absolute); a status is
 * none of producing, shut-in, test or their synonyms. An empty status means producing.
 *
 * Volume flows become mass flows with the density of liquid water at the logged production
 * temperature and wellhead pressure, IAPWS-IF97 region 1 (water/iapws97.ts); without a logged
 * pressure the assumption is the saturation pressure + 1 MPa — a wellhead kept liquid by a modest
 * overpressure — and that density is returned with the reading as the recorded assumption. A state
 * outside region 1 is a rejection with IAPWS-IF97's reason: the density is never extrapolated.
 */
import { InputError } from '../errors.js';
import type { UnitDef } from '../units.js';
import { liquidDensityKgPerM3, liquidWater, REGION1_LIMITS, saturationPressurePa } from '../water/iapws97.js';
import type { ResolvedColumns } from './columns.js';
import { isBlankCell, parseDecimal } from './numbers.js';
import type { TimestampReader } from './timestamps.js';
import { ROLE_LABEL, type ColumnRole, type DecimalSeparator, type ReadCounts, type Reading, type ReadingStatus, type Rejection } from './types.js';

const ZERO_CELSIUS_K = 273.15; // exact offset of the Celsius scale (NIST SP 811 §4.2.1.1)
export const MIN_TEMPERATURE_C = -50;
export const MAX_TEMPERATURE_C = 400;
/** Overpressure above saturation assumed when a volume flow has no logged wellhead pressure. */
export const ASSUMED_OVERPRESSURE_PA = 1e6;
/** Bound on the density memo, so that memory stays flat however many distinct (T, p) pairs a file logs. */
const DENSITY_MEMO_LIMIT = 100_000;

/** Status synonyms (lower case, blanks trimmed). */
export const STATUS_SYNONYMS: Readonly<Record<ReadingStatus, readonly string[]>> = {
  producing: ['producing', 'production', 'prod', 'p', 'on', 'online', 'on-line', 'on line', 'running'],
  'shut-in': ['shut-in', 'shut in', 'shutin', 'shut_in', 'si', 'off', 'offline', 'off-line', 'shut'],
  test: ['test', 'testing', 'well test', 't'],
};

const STATUS_OF = new Map<string, ReadingStatus>();
for (const status of Object.keys(STATUS_SYNONYMS) as ReadingStatus[]) {
  for (const word of STATUS_SYNONYMS[status]) STATUS_OF.set(word, status);
}

export interface RowBatchTarget {
  readings: Reading[];
  rejections: Rejection[];
}

export interface RowValidatorSetup {
  columns: ResolvedColumns;
  headerCount: number;
  decimal: DecimalSeparator;
  /** The `well` option: every row's well (a well column, if any, must agree). */
  well: string | null;
  timestamps: TimestampReader;
  counts: ReadCounts;
}

/** °C from a value in the unit `symbol`, without the round trip through kelvin that would cost 175.3 its last digit. */
function celsiusConverter(def: UnitDef): (v: number) => number {
  if (def.symbol === 'degC') return (v) => v;
  if (def.symbol === 'degF') return (v) => ((v - 32) * 5) / 9; // NIST SP 811 B.8
  return (v) => def.toSI(v) - ZERO_CELSIUS_K;
}

/** A cell value for a message: quoted, escaped, at most 60 characters. */
function shown(text: string): string {
  const s = JSON.stringify(text);
  return s.length > 62 ? `${s.slice(0, 59)}…"` : s;
}

function formatNumber(v: number): string {
  return String(Number(v.toPrecision(6)));
}

export class RowValidator {
  private readonly counts: ReadCounts;
  private readonly timestamps: TimestampReader;
  private readonly decimalComma: boolean;
  private readonly well: string | null;
  private readonly headerCount: number;
  private readonly header: Record<ColumnRole, string | null>;
  private readonly iTime: number;
  private readonly iWell: number;
  private readonly iProd: number;
  private readonly iInj: number;
  private readonly iFlow: number;
  private readonly iPressure: number;
  private readonly iStatus: number;
  private readonly iNote: number;
  private readonly prodToC: (v: number) => number;
  private readonly injToC: (v: number) => number;
  private readonly temperatureUnit: string;
  private readonly injectionUnit: string;
  private readonly flowDef: UnitDef;
  private readonly flowIsVolume: boolean;
  private readonly pressureDef: UnitDef;
  private readonly densityMemo = new Map<number, Map<number, number>>();
  private densityMemoSize = 0;
  /** Reason of the last density that could not be found (outside IAPWS-IF97 region 1). */
  private densityProblem = '';

  constructor(setup: RowValidatorSetup) {
    const { columns } = setup;
    this.counts = setup.counts;
    this.timestamps = setup.timestamps;
    this.decimalComma = setup.decimal === ',';
    this.well = setup.well;
    this.headerCount = setup.headerCount;
    this.header = columns.header;
    this.iTime = columns.index.time;
    this.iWell = columns.index.well;
    this.iProd = columns.index['production-temperature'];
    this.iInj = columns.index['injection-temperature'];
    this.iFlow = columns.index.flow;
    this.iPressure = columns.index.pressure;
    this.iStatus = columns.index.status;
    this.iNote = columns.index.note;
    this.prodToC = celsiusConverter(columns.unitDefs['production-temperature']);
    this.injToC = celsiusConverter(columns.unitDefs['injection-temperature']);
    this.temperatureUnit = columns.unitDefs['production-temperature'].symbol;
    this.injectionUnit = columns.unitDefs['injection-temperature'].symbol;
    this.flowDef = columns.unitDefs.flow;
    this.flowIsVolume = this.flowDef.quantity === 'volumeFlow';
    this.pressureDef = columns.unitDefs.pressure;
  }

  /** Adds a row that cannot be read as fields at all (quoting) to the rejections. */
  rejectRow(line: number, raw: string, reason: string, out: RowBatchTarget): void {
    this.counts.rowsRead++;
    this.counts.rejections++;
    out.rejections.push({ line, raw, reason, field: null });
  }

  private reject(line: number, raw: string, role: ColumnRole, value: string, reason: string, out: RowBatchTarget): void {
    const header = this.header[role];
    const field = header ?? role;
    const where = header === null ? ROLE_LABEL[role] : `column "${header}" (${ROLE_LABEL[role]})`;
    this.counts.rowsRead++;
    this.counts.rejections++;
    out.rejections.push({ line, raw, reason: `${where}: ${shown(value)} ${reason}`, field });
  }

  private rejectMissing(line: number, raw: string, role: ColumnRole, cells: readonly string[], out: RowBatchTarget): void {
    const header = this.header[role] as string;
    const reason = cells.length < this.headerCount
      ? `the row has ${cells.length} field${cells.length === 1 ? '' : 's'} and the header ${this.headerCount}: no value for column "${header}" (${ROLE_LABEL[role]}), which is required`
      : `column "${header}" (${ROLE_LABEL[role]}) is empty; it is required`;
    this.counts.rowsRead++;
    this.counts.rejections++;
    out.rejections.push({ line, raw, reason, field: header });
  }

  /** Validates one data row (its cells as split, its first physical line, its raw text) into `out`. */
  validate(cells: readonly string[], line: number, raw: string, out: RowBatchTarget): void {
    const n = cells.length;

    // Time.
    const timeText = this.iTime < n ? cells[this.iTime] : '';
    if (isBlankCell(timeText)) return this.rejectMissing(line, raw, 'time', cells, out);
    const timeMs = this.timestamps.read(timeText, line);
    if (timeMs !== timeMs) return this.reject(line, raw, 'time', timeText, this.timestamps.reason, out);

    // Well.
    let wellName: string;
    if (this.iWell >= 0) {
      const cell = this.iWell < n ? cells[this.iWell] : '';
      if (isBlankCell(cell)) {
        if (this.well === null) return this.rejectMissing(line, raw, 'well', cells, out);
        wellName = this.well;
      } else {
        wellName = cell.trim();
        if (this.well !== null && wellName !== this.well) {
          return this.reject(line, raw, 'well', cell, `differs from the well given as an option, "${this.well}"`, out);
        }
      }
    } else wellName = this.well as string;

    // Production temperature. Numbers are parsed first and checked for blankness only when they
    // fail: one pass over the cell for the common case.
    const prodText = this.iProd < n ? cells[this.iProd] : '';
    const prodValue = parseDecimal(prodText, this.decimalComma);
    if (prodValue !== prodValue) {
      if (isBlankCell(prodText)) return this.rejectMissing(line, raw, 'production-temperature', cells, out);
      return this.reject(line, raw, 'production-temperature', prodText, this.notANumber(), out);
    }
    const productionTemperatureC = this.prodToC(prodValue);
    const prodProblem = temperatureProblem(productionTemperatureC, this.temperatureUnit);
    if (prodProblem !== null) return this.reject(line, raw, 'production-temperature', prodText, prodProblem, out);

    // Injection temperature.
    let injectionTemperatureC: number | null = null;
    if (this.iInj >= 0 && this.iInj < n) {
      const text = cells[this.iInj];
      const v = parseDecimal(text, this.decimalComma);
      if (v === v) {
        injectionTemperatureC = this.injToC(v);
        const problem = temperatureProblem(injectionTemperatureC, this.injectionUnit);
        if (problem !== null) return this.reject(line, raw, 'injection-temperature', text, problem, out);
      } else if (!isBlankCell(text)) return this.reject(line, raw, 'injection-temperature', text, this.notANumber(), out);
    }

    // Pressure (before flow: a volume flow's density needs it).
    let pressurePa: number | null = null;
    if (this.iPressure >= 0 && this.iPressure < n) {
      const text = cells[this.iPressure];
      const v = parseDecimal(text, this.decimalComma);
      if (v === v) {
        if (!(v > 0)) return this.reject(line, raw, 'pressure', text, `is not above zero; wellhead pressures are absolute (${this.pressureDef.symbol})`, out);
        pressurePa = this.pressureDef.toSI(v);
      } else if (!isBlankCell(text)) return this.reject(line, raw, 'pressure', text, this.notANumber(), out);
    }

    // Flow.
    let massFlowKgPerS: number | null = null;
    let volumeFlowM3PerS: number | null = null;
    let normalisedMassFlowKgPerS: number | null = null;
    let flowDensityKgPerM3: number | null = null;
    let flowUnit: string | null = null;
    const flowText = this.iFlow >= 0 && this.iFlow < n ? cells[this.iFlow] : '';
    const flow = parseDecimal(flowText, this.decimalComma);
    if (flow === flow) {
      if (flow < 0) return this.reject(line, raw, 'flow', flowText, 'is negative; a produced flow cannot be below zero', out);
      flowUnit = this.flowDef.symbol;
      if (this.flowIsVolume) {
        volumeFlowM3PerS = this.flowDef.toSI(flow);
        const density = this.density(productionTemperatureC + ZERO_CELSIUS_K, pressurePa);
        if (density !== density) {
          return this.reject(line, raw, 'flow', flowText, `is a volume flow that cannot be converted to mass: ${this.densityProblem}`, out);
        }
        flowDensityKgPerM3 = density;
        normalisedMassFlowKgPerS = volumeFlowM3PerS * density;
      } else {
        massFlowKgPerS = this.flowDef.toSI(flow);
        normalisedMassFlowKgPerS = massFlowKgPerS;
      }
    } else if (!isBlankCell(flowText)) return this.reject(line, raw, 'flow', flowText, this.notANumber(), out);

    // Status.
    let status: ReadingStatus = 'producing';
    if (this.iStatus >= 0 && this.iStatus < n && !isBlankCell(cells[this.iStatus])) {
      const text = cells[this.iStatus];
      const found = STATUS_OF.get(text) ?? STATUS_OF.get(text.trim().toLowerCase());
      if (found === undefined) {
        return this.reject(line, raw, 'status', text, 'is not a status: use producing (on, online, p), shut-in (off, shut in, si) or test (testing)', out);
      }
      status = found;
    }

    const note = this.iNote >= 0 && this.iNote < n ? cells[this.iNote].trim() : '';

    const counts = this.counts;
    counts.rowsRead++;
    counts.readings++;
    if (this.timestamps.naive) {
      counts.naiveTimestamps++;
      if (this.timestamps.localKind === 'ambiguous') counts.ambiguousLocalTimes++;
      else if (this.timestamps.localKind === 'nonexistent') counts.nonexistentLocalTimes++;
    }
    if (flowDensityKgPerM3 !== null) {
      counts.volumeFlowsConverted++;
      if (pressurePa === null) counts.densityAtAssumedPressure++;
    }
    out.readings.push({
      line,
      raw,
      wellName,
      timeMs,
      productionTemperatureC,
      injectionTemperatureC,
      temperatureUnit: this.temperatureUnit,
      massFlowKgPerS,
      volumeFlowM3PerS,
      flowUnit,
      normalisedMassFlowKgPerS,
      flowDensityKgPerM3,
      pressurePa,
      pressureUnit: pressurePa === null ? null : this.pressureDef.symbol,
      status,
      note,
    });
  }

  private notANumber(): string {
    return this.decimalComma ? 'is not a number (this file is read with a decimal comma)' : 'is not a number';
  }

  /**
   * Liquid density at (T, p), p defaulting to ps(T) + 1 MPa; NaN with densityProblem set when the
   * state is outside IAPWS-IF97 region 1. Memoised: liquidWater sums 34 terms with six powers each.
   */
  private density(temperatureK: number, pressurePa: number | null): number {
    const key = pressurePa ?? -1;
    let byPressure = this.densityMemo.get(temperatureK);
    const hit = byPressure?.get(key);
    if (hit !== undefined) {
      if (hit !== hit) this.densityProblem = this.explainDensity(temperatureK, pressurePa);
      return hit;
    }
    let density: number;
    try {
      density = liquidDensityKgPerM3(temperatureK, pressurePa ?? assumedPressurePa(temperatureK));
    } catch (err) {
      if (!(err instanceof InputError)) throw err;
      density = NaN;
      this.densityProblem = err.reason;
    }
    if (this.densityMemoSize >= DENSITY_MEMO_LIMIT) {
      this.densityMemo.clear();
      this.densityMemoSize = 0;
      byPressure = undefined;
    }
    if (byPressure === undefined) {
      byPressure = new Map();
      this.densityMemo.set(temperatureK, byPressure);
    }
    byPressure.set(key, density);
    this.densityMemoSize++;
    return density;
  }

  private explainDensity(temperatureK: number, pressurePa: number | null): string {
    try {
      liquidWater(temperatureK, pressurePa ?? assumedPressurePa(temperatureK));
      return 'outside IAPWS-IF97 region 1';
    } catch (err) {
      return err instanceof InputError ? err.reason : String(err);
    }
  }
}

/**
 * ps(T) + 1 MPa inside region 1's temperature range; outside it any pressure, so that liquidWater
 * gives its reason about the temperature rather than the saturation line's.
 */
function assumedPressurePa(temperatureK: number): number {
  const inRange = temperatureK >= REGION1_LIMITS.minTemperatureK && temperatureK <= REGION1_LIMITS.maxTemperatureK;
  return inRange ? saturationPressurePa(temperatureK) + ASSUMED_OVERPRESSURE_PA : ASSUMED_OVERPRESSURE_PA;
}

/** Why a temperature in °C (entered in `unit`) cannot be a wellhead reading, or null. */
function temperatureProblem(celsius: number, unit: string): string | null {
  if (celsius >= MIN_TEMPERATURE_C && celsius <= MAX_TEMPERATURE_C) return null;
  const is = unit === 'degC' ? `is ${formatNumber(celsius)} °C` : `in ${unit} is ${formatNumber(celsius)} °C`;
  return celsius < MIN_TEMPERATURE_C
    ? `${is}, below ${MIN_TEMPERATURE_C} °C: physically impossible for these plants (a unit mix-up or a sensor fault?)`
    : `${is}, above ${MAX_TEMPERATURE_C} °C: physically impossible for these plants (a unit mix-up or a sensor fault?)`;
}
