/**
 * demo/invented-export-with-faults.csv (INVENTED, not a real site): a plant export of the demo
 * field's last three stored weeks and one week beyond, with the faults real exports have, at the
 * lines EXPORT_FAULTS names (demo/README.md describes them).
 *
 * Exported API:
 *   EXPORT_FAULTS
 *   inventedExportWithFaults(): string
 */
import {
  INVENTED_FIELD, INVENTED_START_MS, INVENTED_WEEKS, MODEL_CW_J_PER_KG_K, REFERENCE_TEMPERATURE_C, WEEK_MS, WEEK_S,
  inventedSeries, mulberry32, normalOf,
} from './invented-field.js';
import { inventedDemoLog, type DemoReading } from './invented-log.js';
import { formatLocal } from './local-time.js';

const CW = MODEL_CW_J_PER_KG_K;

/** The planted faults of demo/invented-export-with-faults.csv, by physical line (header = line 1). */
export const EXPORT_FAULTS = {
  header: 1,
  duplicates: [2, 3, 4, 5, 9, 11],
  conflict: 6,
  unparseable: [7, 10],
  blank: 8,
  spike: 12,
  newReadings: [13, 14, 15],
  impossibleTemperature: 16,
  negativeFlow: 17,
  unknownWell: 18,
} as const;

const EXPORT_HEADER = 'Date/Time;Well;Temp. Prod. (°C);Temp. Inj. (°C);Flow [kg/s];WHP [bar];Status';

/** Decimal comma, as the plant's locale writes numbers. */
function comma(v: number | null, digits: number): string {
  return v === null ? '' : v.toFixed(digits).replace('.', ',');
}

/**
 * demo/invented-export-with-faults.csv: semicolon-delimited, decimal comma, naive local timestamps
 * (dd.mm.yyyy HH:MM in the field's zone), units in the header. Covers the last three stored weeks
 * of KR-1..KR-3 and one week beyond; the faults are at the lines EXPORT_FAULTS names.
 */
export function inventedExportWithFaults(): string {
  const { readings } = inventedDemoLog();
  const { end } = inventedSeries();
  const rand = mulberry32(20261203);
  const normal = normalOf(rand);
  const stored = (well: string, week: number): DemoReading =>
    readings.find((r) => r.well === well && r.timeMs === INVENTED_START_MS + week * WEEK_MS) as DemoReading;
  const zone = INVENTED_FIELD.timeZone;
  const row = (timeMs: number, well: string, cells: { prod: string; inj: string; flow: string; whp: string; status: string }): string =>
    [formatLocal(timeMs, zone), well, cells.prod, cells.inj, cells.flow, cells.whp, cells.status].join(';');
  const exact = (r: DemoReading) => ({
    prod: comma(r.productionTemperatureC, 2), inj: comma(r.injectionTemperatureC, 1),
    flow: comma(r.flow, 1), whp: comma(r.pressureBar, 1), status: r.status,
  });
  /** The model carried one week past the last stored reading, producing. */
  const beyond = (well: string) => {
    const e = end[well];
    const theta = e.thetaK * Math.exp((-e.flowKgPerS * CW * (1 - e.rechargeFraction) * WEEK_S) / e.heatCapacityJPerK);
    return {
      prod: comma(Number((REFERENCE_TEMPERATURE_C + theta + 0.35 * normal()).toFixed(2)), 2),
      inj: comma(Number((REFERENCE_TEMPERATURE_C + 0.5 * normal()).toFixed(1)), 1),
      flow: comma(Number((e.flowKgPerS * (1 + 0.01 * normal())).toFixed(1)), 1),
      whp: '',
      status: 'producing',
    };
  };
  const last = INVENTED_WEEKS - 1;
  const weekMs = (week: number): number => INVENTED_START_MS + week * WEEK_MS;
  const threeDaysMs = 3 * 86_400_000;
  const kr2 = stored('KR-2', last - 1);
  const kr1 = stored('KR-1', last);
  const [b1, b2, b3] = ['KR-1', 'KR-2', 'KR-3'].map(beyond);
  const lines = [
    EXPORT_HEADER,
    row(weekMs(last - 2), 'KR-1', exact(stored('KR-1', last - 2))),
    row(weekMs(last - 2), 'KR-2', exact(stored('KR-2', last - 2))),
    row(weekMs(last - 2), 'KR-3', exact(stored('KR-3', last - 2))),
    row(weekMs(last - 1), 'KR-1', exact(stored('KR-1', last - 1))),
    // conflict: same well and instant as a stored reading, production temperature 0.8 K higher
    row(weekMs(last - 1), 'KR-2', { ...exact(kr2), prod: comma((kr2.productionTemperatureC as number) + 0.8, 2) }),
    // unparseable production temperature: a spreadsheet error value
    row(weekMs(last - 1), 'KR-3', { ...exact(stored('KR-3', last - 1)), prod: '#VALUE!' }),
    '',
    row(weekMs(last), 'KR-1', exact(kr1)),
    // unparseable flow: a letter l typed for the digit 1
    row(weekMs(last), 'KR-2', { ...exact(stored('KR-2', last)), flow: 'l9,8' }),
    row(weekMs(last), 'KR-3', exact(stored('KR-3', last))),
    // spike: an extra mid-week reading of KR-1, 11 K above its neighbours
    row(weekMs(last) + threeDaysMs, 'KR-1', { ...exact(kr1), prod: comma((kr1.productionTemperatureC as number) + 11, 2), whp: '' }),
    row(weekMs(last + 1), 'KR-1', b1),
    row(weekMs(last + 1), 'KR-2', b2),
    row(weekMs(last + 1), 'KR-3', b3),
    // impossible temperature: a decimal slip to 1763,4 °C
    row(weekMs(last + 1) + threeDaysMs, 'KR-2', { prod: '1763,4', inj: '70,2', flow: '40,1', whp: '', status: 'producing' }),
    // negative flow
    row(weekMs(last + 1) + threeDaysMs, 'KR-3', { ...b3, inj: '69,8', flow: '-41,8' }),
    // a well this field does not have
    row(weekMs(last + 1) + threeDaysMs, 'KR-7', { prod: '151,20', inj: '70,1', flow: '39,5', whp: '', status: 'producing' }),
  ];
  return lines.join('\r\n') + '\r\n';
}
