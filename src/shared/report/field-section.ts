/**
 * The summary page of a field report: every well ranked by the years left to its economic limit
 * (P50, soonest first), the field's measured thermal output week by week, and its forecast.
 *
 * The forecast is the sum of the wells' central (best-fit) forecasts of ṁplan·cw·θ, each well
 * dropping out at its own central end of economic life. It is not called a P50: percentiles of
 * the wells do not add to a percentile of the field, so no field band is drawn.
 */
import type { Wire } from '../contract/channels.js';
import type { FieldOutput, FieldOverview } from '../contract/overview.js';
import type { FieldInfo, WellKind } from '../contract/wells.js';
import { JULIAN_YEAR_S } from '../units.js';
import { minMaxDecimate, type XYSeries } from './decimate.js';
import { PRINT_POINTS, type WellReport, type WellStatus } from './well-section.js';

/** Points of the summed forecast: the grid of each well's own forecast band (forecast.ts). */
const FORECAST_POINTS = 121;

export interface RankRow {
  well: string;
  kind: WellKind;
  status: WellStatus;
  statement: string | null;
  /** Years from the well's latest reading to the limit; null where not reached within the horizon. */
  yearsToLimit: { p90: number | null; p50: number | null; p10: number | null } | null;
  alreadyReached: boolean;
  endOfLifeP50: string | null;
  tauS: number | null;
  currentPowerW: number | null;
  rechargeFraction: number | null;
  latestProductionTemperatureC: number | null;
}

export interface FieldReport {
  name: string;
  timeZone: string;
  notes: string;
  /** A field with nothing to report says so here. */
  statement: string | null;
  ranking: RankRow[];
  /** Measured thermal output week by week (fieldOverview's FieldOutput), min–max thinned for print. */
  output: FieldOutput | null;
  outputStatement: string | null;
  /** Sum of the wells' central forecasts: x epoch ms, y W. */
  forecast: (XYSeries & { note: string; wells: string[]; leftOut: string[] }) | null;
}

export function buildFieldReport(field: Wire<FieldInfo>, overview: Wire<FieldOverview> | null, wells: readonly WellReport[]): FieldReport {
  const readings = wells.reduce((n, w) => n + w.quality.readings, 0);
  const statement = wells.length === 0
    ? `The field ${field.name} has no wells yet: there is nothing to report.`
    : readings === 0
      ? `No readings have been logged in the field ${field.name} yet: there is nothing to fit or forecast. Its wells are listed below.`
      : null;
  const out = overview?.output;
  let output: FieldOutput | null = null;
  if (out !== undefined && out.weekStart.length > 0) {
    const thinned = minMaxDecimate(out.weekStart.map((t) => Date.parse(t)), out.powerW, PRINT_POINTS.output);
    output = { weekStart: thinned.x.map((ms) => new Date(ms).toISOString()), powerW: thinned.y, note: out.note };
  }
  const outputStatement = output !== null ? null
    : overview === null ? 'The field\'s thermal output could not be read.'
      : 'No producing reading with a flow and a production temperature has been logged: there is no thermal output to show.';
  return {
    name: field.name,
    timeZone: field.timeZone,
    notes: field.notes,
    statement,
    ranking: rank(wells),
    output,
    outputStatement,
    forecast: summedForecast(wells),
  };
}

function rank(wells: readonly WellReport[]): RankRow[] {
  const rows: RankRow[] = wells.map((w) => {
    const h = w.headline;
    return {
      well: w.well.name,
      kind: w.well.kind,
      status: w.status,
      statement: w.statement,
      yearsToLimit: h === null ? null : h.endOfLife.yearsFromLatest,
      alreadyReached: h?.endOfLife.alreadyReached ?? false,
      endOfLifeP50: h?.endOfLife.p50 ?? null,
      tauS: h?.tau?.valueS ?? null,
      currentPowerW: h?.currentPowerW ?? null,
      rechargeFraction: h?.recharge?.fraction.value ?? null,
      latestProductionTemperatureC: w.latest?.productionTemperatureC ?? null,
    };
  });
  // Soonest first; then wells whose limit lies beyond the horizon; then wells without a forecast, by name.
  const key = (r: RankRow): [number, number] => {
    if (r.yearsToLimit === null) return [2, 0];
    if (r.alreadyReached) return [0, -Infinity];
    return r.yearsToLimit.p50 === null ? [1, 0] : [0, r.yearsToLimit.p50];
  };
  return rows.sort((a, b) => {
    const [ga, va] = key(a);
    const [gb, vb] = key(b);
    return ga - gb || va - vb || a.well.localeCompare(b.well);
  });
}

function summedForecast(wells: readonly WellReport[]): FieldReport['forecast'] {
  const parts = wells.flatMap((w) => {
    const h = w.headline;
    const f = w.forecast;
    const flow = h?.plannedFlow.valueKgPerS ?? null;
    const cw = h?.specificHeat.valueJPerKgK ?? null;
    if (h === null || f === null || f.forecast.status !== 'ok' || flow === null || cw === null) return [];
    const originMs = Date.parse(f.fit.timeOrigin);
    const band = f.forecast.band;
    const end = h.endOfLife.central === null ? Infinity : Date.parse(h.endOfLife.central);
    const x: number[] = [];
    const y: number[] = [];
    band.timeS.forEach((t, i) => {
      const theta = band.central[i];
      if (t === null || theta === null) return;
      x.push(originMs + 1000 * t);
      y.push(flow * cw * theta);
    });
    return x.length < 2 ? [] : [{ name: w.well.name, x, y, end }];
  });
  const production = wells.filter((w) => w.well.kind === 'production');
  if (parts.length === 0) return null;
  const start = Math.max(...parts.map((p) => p.x[0]));
  const stop = Math.min(...parts.map((p) => p.x[p.x.length - 1]));
  if (!(stop > start)) return null;
  const x: number[] = [];
  const y: number[] = [];
  for (let g = 0; g < FORECAST_POINTS; g++) {
    const t = start + ((stop - start) * g) / (FORECAST_POINTS - 1);
    let sum = 0;
    for (const p of parts) if (t <= p.end) sum += interpolate(p.x, p.y, t);
    x.push(t);
    y.push(sum);
  }
  const leftOut = production.filter((w) => !parts.some((p) => p.name === w.well.name)).map((w) => w.well.name);
  const years = (stop - start) / 1000 / JULIAN_YEAR_S;
  return {
    x, y,
    wells: parts.map((p) => p.name),
    leftOut,
    note: `Sum over ${parts.map((p) => p.name).join(', ')} of each well's best-fit forecast of ṁplan·cw·θ at its planned flow, ` +
      `for ${years.toFixed(1)} years from the latest reading; each well drops out when its best-fit curve reaches its economic limit. ` +
      'Percentiles of single wells do not add up to a percentile of the field, so this is a central estimate without a band.' +
      (leftOut.length > 0 ? ` Left out (no forecast): ${leftOut.join(', ')}.` : ''),
  };
}

function interpolate(xs: readonly number[], ys: readonly number[], t: number): number {
  if (t <= xs[0]) return ys[0];
  for (let i = 1; i < xs.length; i++) {
    if (t <= xs[i]) {
      const u = (t - xs[i - 1]) / (xs[i] - xs[i - 1]);
      return ys[i - 1] + u * (ys[i] - ys[i - 1]);
    }
  }
  return ys[ys.length - 1];
}
