/**
 * The demo database's log (INVENTED, not a real site): the model readings of invented-field.ts as an
 * operator logged them, with a wellhead pressure in bar every fourth week, the injection well's
 * weekly readings (a volume flow and its pressure), two readings flagged 'bad', and the entries that
 * were corrected or deleted. Drawn from a second seeded stream, so the model's own stream — and
 * demo/invented-field.csv — stay exactly as they were.
 *
 * Exported API:
 *   interface DemoReading, DemoCorrection, DemoLog
 *   inventedDemoLog(): DemoLog
 */
import type { ReadingStatus } from '../contract/reading-rules.js';
import {
  INJECTION_WELL, INVENTED_START_MS, INVENTED_WEEKS, REFERENCE_TEMPERATURE_C, WEEK_MS, inventedSeries, mulberry32, normalOf,
} from './invented-field.js';

/** A reading as entered: temperatures in °C, flow in its unit, pressure in bar. */
export interface DemoReading {
  well: string;
  timeMs: number;
  productionTemperatureC: number | null;
  injectionTemperatureC: number | null;
  flow: number | null;
  flowUnit: 'kg/s' | 'm3/h' | null;
  pressureBar: number | null;
  status: ReadingStatus;
  flags: string[];
  note: string;
}

/**
 * 'edit': the reading at (well, timeMs) was first entered with `entered` in place of its values,
 * then corrected; 'delete': a stray entry `entered` at (well, timeMs) was logged, then deleted.
 */
export interface DemoCorrection {
  kind: 'edit' | 'delete';
  well: string;
  timeMs: number;
  entered: Partial<DemoReading>;
  reason: string;
}

export interface DemoLog {
  readings: DemoReading[];
  corrections: DemoCorrection[];
}

/** Weeks (and wells) chosen for the planted events; the first producing week at or after each is used. */
const BAD_READINGS = [
  { well: 'KR-1', week: 301, dropK: 23.4, note: 'thermocouple fault; sensor replaced the following week' },
  { well: 'KR-2', week: 455, dropK: 31.7, note: 'reading taken with the spare gauge, which was found out of calibration' },
] as const;
const INJECTION_DENSITY_GUESS_KG_PER_M3 = 978; // only to invent plausible m3/h values; the stored mass flow uses IAPWS-IF97

export function inventedDemoLog(): DemoLog {
  const { readings: model } = inventedSeries();
  const rand = mulberry32(20261202); // a second stream: the extras leave the model's stream untouched
  const normal = normalOf(rand);
  const readings: DemoReading[] = [];
  for (const r of model) {
    // Wellhead pressure every fourth week, in bar (a gauge read by hand).
    const pressureBar = r.week % 4 === 3 ? Number(((r.status === 'producing' ? 24 : 31) + 0.3 * normal()).toFixed(1)) : null;
    readings.push({
      well: r.well, timeMs: r.timeMs,
      productionTemperatureC: r.productionTemperatureC, injectionTemperatureC: r.injectionTemperatureC,
      flow: r.flowKgPerS, flowUnit: 'kg/s', pressureBar, status: r.status, flags: [], note: '',
    });
  }
  const find = (well: string, week: number, status?: ReadingStatus): DemoReading => {
    for (let k = week; k < INVENTED_WEEKS; k++) {
      const r = readings.find((x) => x.well === well && x.timeMs === INVENTED_START_MS + k * WEEK_MS) as DemoReading;
      if (status === undefined || r.status === status) return r;
    }
    throw new Error(`invented demo: no ${status ?? ''} reading of ${well} from week ${week}`);
  };
  for (const bad of BAD_READINGS) {
    const r = find(bad.well, bad.week, 'producing');
    r.productionTemperatureC = Number(((r.productionTemperatureC as number) - bad.dropK).toFixed(2));
    r.flags = ['bad'];
    r.note = bad.note;
  }

  // The injection well returns the produced water, logged as a volume flow with its pressure.
  for (let k = 0; k < INVENTED_WEEKS; k++) {
    const timeMs = INVENTED_START_MS + k * WEEK_MS;
    const totalKgPerS = model.filter((r) => r.timeMs === timeMs).reduce((s, r) => s + r.flowKgPerS, 0);
    const inService = totalKgPerS > 0;
    readings.push({
      well: INJECTION_WELL, timeMs,
      productionTemperatureC: null,
      injectionTemperatureC: Number((REFERENCE_TEMPERATURE_C + 0.4 * normal()).toFixed(1)),
      flow: Number(((totalKgPerS * 3600) / INJECTION_DENSITY_GUESS_KG_PER_M3).toFixed(1)),
      flowUnit: 'm3/h',
      pressureBar: Number(((inService ? 38 : 12) + 0.4 * normal()).toFixed(1)),
      // The log's statuses are those of a producer; for an injection well 'producing' means in service.
      status: inService ? 'producing' : 'shut-in',
      flags: [], note: '',
    });
  }

  const decimalSlip = find('KR-2', 120, 'producing');
  const droppedDigit = find('KR-3', 333, 'producing');
  const wrongStatus = find('KR-1', 480, 'shut-in');
  const twice = find('KR-3', 400, 'producing');
  const corrections: DemoCorrection[] = [
    {
      kind: 'edit', well: decimalSlip.well, timeMs: decimalSlip.timeMs,
      entered: { productionTemperatureC: Number(((decimalSlip.productionTemperatureC as number) / 10).toFixed(2)) },
      reason: 'decimal point slipped on entry; value taken from the field sheet',
    },
    {
      kind: 'edit', well: droppedDigit.well, timeMs: droppedDigit.timeMs,
      entered: { flow: Number(((droppedDigit.flow as number) / 10).toFixed(1)) },
      reason: 'a digit was dropped on entry; flow taken from the plant log',
    },
    {
      kind: 'edit', well: wrongStatus.well, timeMs: wrongStatus.timeMs,
      entered: { status: 'producing' },
      reason: 'the well was shut in for pump maintenance that week; status corrected',
    },
    {
      kind: 'delete', well: twice.well, timeMs: twice.timeMs + 86_400_000,
      entered: { ...twice, timeMs: twice.timeMs + 86_400_000, note: 'entered on Tuesday' },
      reason: "entered twice (a day late); Monday's reading stands",
    },
  ];
  return { readings, corrections };
}
