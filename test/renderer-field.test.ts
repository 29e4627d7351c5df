// The field screen's pure logic (src/renderer/screens/field-model.ts): a well's row of text, the facts
// strip, the weekly output chart's points, the economic limit in words.
import { describe, expect, it } from 'vitest';
import type { Wire } from '../src/shared/contract/channels.js';
import type { FieldOverview, WellOverview } from '../src/shared/contract/overview.js';
import { Display } from '../src/renderer/app/display.js';
import { fieldFacts, limitText, outputPoints, qualityLabel, wellRow } from '../src/renderer/screens/field-model.js';

const YEAR_S = 365.25 * 86400; // Julian year (DOMAIN.md §9, common practice)
const SI = new Display('si', 'Pacific/Auckland');
const US = new Display('us', 'UTC');

function well(name: string, over: Partial<Wire<WellOverview>> = {}, kind: 'production' | 'injection' = 'production'): Wire<WellOverview> {
  return {
    well: {
      id: 1, name, field: 'Kettle Ridge', fieldId: 1, kind, reservoir: null, referenceTemperatureC: 70, productionStart: null, createdAt: '2024-01-01T00:00:00.000Z',
      liveReadings: 10,
      latestReading: {
        id: 1, well: name, time: '2025-12-15T09:00:00.000Z', productionTemperatureC: kind === 'production' ? 122.69 : null, injectionTemperatureC: 69.8,
        massFlowKgPerS: 41.9, volumeFlowM3PerS: null, flowDensityKgPerM3: null, pressureMPa: 2.4, status: 'producing', flags: [], note: '',
        source: 'import', importId: 1, sourceLine: 3, entered: { temperatureUnit: 'degC', flowUnit: 'kg/s', pressureUnit: 'MPa' }, updatedAt: null, deletedAt: null,
      },
    },
    thetaK: 52.69,
    fit: { model: 'exponential', basis: 'time', window: { from: null, to: null }, status: 'converged', tau: { value: 12 * YEAR_S, ci95: [10 * YEAR_S, 14 * YEAR_S] }, stale: false, message: '' },
    theoryTauS: 15 * YEAR_S,
    rechargeFraction: { value: 0.123, ci95: [-0.05, 0.3] },
    rechargeVerdict: 'consistent-with-none',
    rechargeInterpretation: null,
    yearsToLimit: { p90: 8.14, p50: 10.26, p10: null, alreadyReached: false },
    endOfLife: { p90: '2034-02-01T00:00:00.000Z', p50: '2036-03-20T00:00:00.000Z', p10: null },
    currentPowerW: 5e6,
    limit: { kind: 'production-temperature', temperatureC: 100, text: 'production temperature 100 °C' },
    quality: { mark: 'fair', readings: 10, included: 9, excluded: 1, flagged: 1, longestGapDays: 21, daysSinceLatest: 3, notes: ['one reading flagged', 'a 21-day gap'] },
    problem: null,
    ...over,
  };
}

describe('a well’s row', () => {
  it('formats τ, its interval, recharge and years to the limit', () => {
    const r = wellRow(well('KR-3'), SI, 30);
    expect(r).toMatchObject({
      well: 'KR-3', kind: 'production',
      // 09:00Z + 13 h (NZDT, IANA tz database) is still 15 December in Auckland.
      latestDate: '2025-12-15', latestTemperature: '122.7 °C',
      theta: '52.7 K',
      tau: '12.0 yr', tauRange: '95 %: 10.0–14.0 yr', theoryTau: '15.0 yr',
      recharge: '12 %', rechargeRange: '95 %: −5 % to 30 %', rechargeWords: 'no recharge shown',
      // P10 null on the wire: not reached within the 30-year horizon (overview.ts).
      yearsP50: '10.3 yr', yearsRange: 'P90 8.1 yr, P10 beyond 30 yr', yearsP50Value: 10.26,
      stale: false, staleText: 'current',
      quality: { mark: 'fair', label: 'fair', notes: 'one reading flagged; a 21-day gap' },
      problem: null,
    });
  });

  it('says plainly what is missing', () => {
    const r = wellRow(well('KR-4I', { fit: null, thetaK: null, theoryTauS: null, rechargeFraction: null, yearsToLimit: null, endOfLife: null, problem: 'an injection well has no decline to fit' }, 'injection'), SI, 30);
    expect(r).toMatchObject({ latestTemperature: 'injection 69.8 °C', theta: '—', tau: '—', tauRange: '', recharge: '—', yearsP50: '—', yearsP50Value: null, stale: null, staleText: 'not fitted', problem: 'an injection well has no decline to fit' });
    const reached = wellRow(well('KR-9', { yearsToLimit: { p90: null, p50: null, p10: null, alreadyReached: true } }), SI, 30);
    expect(reached).toMatchObject({ yearsP50: 'reached', yearsP50Value: 0 });
    const beyond = wellRow(well('KR-8', { yearsToLimit: { p90: 25, p50: null, p10: null, alreadyReached: false } }), SI, 30);
    expect(beyond).toMatchObject({ yearsP50: '> 30 yr', yearsP50Value: Number.POSITIVE_INFINITY, yearsRange: 'P90 25.0 yr, P10 beyond 30 yr' });
    const both = wellRow(well('KR-7', { yearsToLimit: { p90: 8.14, p50: 9.01, p10: 9.96, alreadyReached: false } }), SI, 30);
    expect(both.yearsRange).toBe('P90–P10 8.1–10.0 yr');
  });

  it('a negative recharge fraction is said to be a smaller swept volume (DOMAIN.md §7)', () => {
    const r = wellRow(well('KR-3', { rechargeFraction: { value: -0.966, ci95: [-0.98, -0.95] }, rechargeVerdict: 'faster-than-theory', rechargeInterpretation: 'The reservoir cools faster…' }), SI, 30);
    expect(r).toMatchObject({ recharge: '−97 %', rechargeWords: 'cools faster than theory: smaller swept volume', rechargeInterpretation: 'The reservoir cools faster…' });
  });

  it('in US customary units: θ as a °F difference (the column names it θ)', () => {
    // 52.69 K · 9/5 = 94.842 °F (difference; NIST SP 811 B.8); 122.69 °C · 9/5 + 32 = 252.842 °F.
    expect(wellRow(well('KR-3'), US, 30)).toMatchObject({ theta: '94.8 °F', latestTemperature: '252.8 °F' });
  });

  it('names the quality marks', () => {
    expect(['good', 'fair', 'poor', 'no-data'].map((m) => qualityLabel(m as 'good'))).toEqual(['good', 'fair', 'poor', 'no data']);
  });
});

describe('the facts of a field', () => {
  const overview: Wire<FieldOverview> = {
    field: { id: 1, name: 'Kettle Ridge', timeZone: 'Pacific/Auckland', notes: '', createdAt: '2024-01-01T00:00:00.000Z' },
    wells: [
      well('KR-1', { currentPowerW: 7.5e6, endOfLife: { p90: null, p50: '2031-05-01T00:00:00.000Z', p10: null } }),
      well('KR-2'),
      well('KR-4I', { currentPowerW: null, endOfLife: null }, 'injection'),
    ],
    output: { weekStart: [], powerW: [], note: '' },
  };

  it('counts wells, sums the power, finds the earliest P50 end of life', () => {
    const facts = fieldFacts(overview, SI);
    expect(facts.map((f) => [f.label, f.value, f.note])).toEqual([
      ['Wells', '3', '2 production, 1 injection'],
      // The injection well's latest reading is 'producing' too, but only production wells produce heat.
      ['Producing wells', '2', 'latest reading producing'],
      // 7.5 MW + 5 MW = 12.5 MW (worked example).
      ['Thermal power now', '12.50 MWth', 'sum over 2 wells'],
      ['Earliest end of life (P50)', '2031-05-01', 'KR-1'],
    ]);
  });

  it('an empty field', () => {
    const facts = fieldFacts({ ...overview, wells: [] }, SI);
    expect(facts.map((f) => f.value)).toEqual(['0', '0', '—', '—']);
  });
});

describe('the weekly output chart', () => {
  it('epoch ms against power in the display unit, leaving out weeks without a value', () => {
    const output = { weekStart: ['2025-01-06T00:00:00.000Z', '2025-01-13T00:00:00.000Z', 'not a time'], powerW: [1e6, null, 3e6], note: '' };
    // 1 MW = 3600 / 1055.05585262 MMBtu/h = 3.4121416 MMBtu/h (International Table Btu, NIST SP 811 B.8).
    expect(outputPoints(output as never, US)).toEqual([{ x: Date.UTC(2025, 0, 6), y: expect.closeTo(3.4121416, 6) }]);
    expect(outputPoints(output as never, SI)).toEqual([{ x: Date.UTC(2025, 0, 6), y: 1 }]);
  });
});

describe('the economic limit in words', () => {
  it('each kind, in the display units', () => {
    expect(limitText({ kind: 'production-temperature', temperatureC: 100 }, SI)).toBe('production temperature down to 100.0 °C');
    // 100 °C = 212 °F (NIST SP 811 B.8).
    expect(limitText({ kind: 'production-temperature', temperatureC: 100 }, US)).toBe('production temperature down to 212.0 °F');
    expect(limitText({ kind: 'theta', thetaK: 20 }, SI)).toBe('θ (production temperature above Tref) down to 20.0 K');
    expect(limitText({ kind: 'power', powerW: 2.5e6 }, SI)).toBe('thermal power down to 2.50 MWth');
  });
});
