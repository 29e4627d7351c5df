/**
 * chartSeries's packed columns (contract/overview.ts PackedSeriesColumns) decoded into the columns
 * the decline chart reads (SeriesColumns in decline-data.ts): base64 → bytes → typed arrays over
 * the decoded bytes (no copy), NaN standing for a missing value as in the packed form.
 * Pure (no DOM): `atob` and `Uint8Array.fromBase64` are globals of browsers and of Node alike.
 *
 * Exported API:
 *   decodeChartSeries(response): DecodedSeries   SeriesColumns with count, timeOrigin and Tref, every column a typed array
 *   bytesOfBase64(text): Uint8Array
 */
import type { Wire } from '../../shared/contract/channels.js';
import type { ChartSeriesResponse } from '../../shared/contract/overview.js';
import type { SeriesColumns } from './decline-data.js';

type FromBase64 = (text: string) => Uint8Array;

/** Bytes of base64 text: the platform's decoder where it has one (Chromium 140 on), else atob. */
export function bytesOfBase64(text: string): Uint8Array {
  const native = (Uint8Array as unknown as { fromBase64?: FromBase64 }).fromBase64;
  if (typeof native === 'function') return native(text);
  const binary = atob(text);
  const bytes = new Uint8Array(binary.length);
  for (let i = 0; i < binary.length; i++) bytes[i] = binary.charCodeAt(i);
  return bytes;
}

function float64s(text: string, count: number, what: string): Float64Array {
  const bytes = bytesOfBase64(text);
  if (bytes.length !== 8 * count) throw new Error(`chartSeries: ${what} holds ${bytes.length} bytes, not 8 × ${count}`);
  // A fresh decode starts at offset 0 of its own buffer, so it is aligned for a Float64Array.
  return new Float64Array(bytes.buffer, bytes.byteOffset, count);
}

export interface DecodedSeries extends SeriesColumns {
  count: number;
  timeOrigin: string | null;
  referenceTemperatureC: number | null;
  timeS: Float64Array;
  x: Float64Array;
  productionTemperatureC: Float64Array;
  exclusion: Uint8Array;
}

export function decodeChartSeries(r: Wire<ChartSeriesResponse>): DecodedSeries {
  const n = r.count;
  const timeMs = float64s(r.columns.timeMs, n, 'timeMs');
  const temperatures = float64s(r.columns.productionTemperatureC, n, 'productionTemperatureC');
  const exclusion = bytesOfBase64(r.columns.exclusion);
  if (exclusion.length !== n) throw new Error(`chartSeries: exclusion holds ${exclusion.length} bytes, not ${n}`);
  const timeS = new Float64Array(n);
  for (let i = 0; i < n; i++) timeS[i] = (timeMs[i] - r.epochMs) / 1000;
  let x: Float64Array;
  if (r.columns.x !== null) x = float64s(r.columns.x, n, 'x');
  else {
    // The time basis: s after time zero, none before it (as wellSeries's x).
    const origin = r.timeOrigin === null ? Infinity : Date.parse(r.timeOrigin);
    x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = timeMs[i] < origin ? NaN : (timeMs[i] - origin) / 1000;
  }
  return {
    basis: r.basis, epochMs: r.epochMs, count: n, timeOrigin: r.timeOrigin, referenceTemperatureC: r.referenceTemperatureC, timeS, x, productionTemperatureC: temperatures, exclusion,
  };
}
