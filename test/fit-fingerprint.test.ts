// The data fingerprint of a stored fit: SHA-256 (Node's crypto, FIPS 180-4) over one text line per
// reading. It is computed in chunks for speed; this checks it against the line-by-line definition
// across chunk boundaries, so a fit stored before the change is still "current" after it.
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { dataFingerprint } from '../src/main/services/fit-store.js';
import type { SeriesReading } from '../src/shared/series/well-series.js';

function reading(i: number): SeriesReading {
  return {
    id: i + 1, timeMs: 1_500_000_000_000 + i * 604_800_000,
    productionTemperatureC: i % 97 === 0 ? null : 150 - i / 1000 + 0.1,
    normalisedMassFlowKgPerS: i % 89 === 0 ? null : 40 + (i % 7) / 3,
    status: i % 50 === 0 ? 'shut-in' : 'producing', flags: i % 31 === 0 ? ['bad', 'spike'] : [],
  };
}

/** The definition: the header line, then one update per reading. */
function lineByLine(readings: readonly SeriesReading[]): string {
  const hash = createHash('sha256');
  const text = (v: number | null): string => (v === null ? '-' : String(v));
  hash.update('tauwell-fit-data 1|well 7|tref 70|origin 1500000000000|basis time|window - 1600000000000\n');
  for (const r of readings) hash.update(`${r.id}|${r.timeMs}|${text(r.productionTemperatureC)}|${text(r.normalisedMassFlowKgPerS)}|${r.status}|${r.flags.join(',')}\n`);
  return hash.digest('hex');
}

describe('dataFingerprint', () => {
  it.each([0, 1, 4095, 4096, 4097, 10_000])('is the line-by-line SHA-256 for %i readings', (n) => {
    const readings = Array.from({ length: n }, (_, i) => reading(i));
    const got = dataFingerprint({ wellId: 7, referenceTemperatureC: 70, originMs: 1_500_000_000_000, basis: 'time', windowFromMs: null, windowToMs: 1_600_000_000_000, readings });
    expect(got).toBe(lineByLine(readings));
  });
});
