// Spikes: the Hampel test on its own (worked by hand in the comments), the sliding window, and the
// import flagging a spike while storing it — sorted or not, alone or continuing a stored log.
import { describe, expect, it } from 'vitest';
import { ReadingRepository } from '../src/main/db/readings.js';
import { isSpike, SpikeWindow } from '../src/main/import/spikes.js';
import { csvFile, importFixture, readingsOf, utc, week } from './import-pipeline-helpers.js';

describe('isSpike: far from the median of each side, by more than max(5 K, 6 × 1.4826 × MAD)', () => {
  it('flags a reading 11 K above a smooth series', () => {
    // Before 148.5, 148.6, 148.6: median 148.6, deviations 0.1, 0, 0. After 148.1: median 148.1, deviation 0.
    // Pooled deviations 0, 0, 0, 0.1 → MAD 0; threshold max(5, 0) = 5 K.
    expect(isSpike(159.6, [148.5, 148.6, 148.6], [148.1])).toBe(true); // 11.0 and 11.5 K > 5
    expect(isSpike(152.0, [148.5, 148.6, 148.6], [148.1])).toBe(false); // 3.4 K from the side before
  });

  it('scales with the noise of the neighbours', () => {
    // Before 150, 152, 148: median 150, deviations 0, 2, 2. After 151, 149, 150: median 150, deviations 1, 1, 0.
    // Pooled deviations 0, 0, 1, 1, 2, 2 → MAD 1; threshold max(5, 6·1.4826·1) = 8.8956 K.
    expect(isSpike(158.8, [150, 152, 148], [151, 149, 150])).toBe(false); // 8.8 < 8.8956
    expect(isSpike(159.0, [150, 152, 148], [151, 149, 150])).toBe(true); // 9.0 > 8.8956
  });

  it('does not flag either side of a step change, even with more neighbours on one side', () => {
    // Before 150, 150 (median 150), after 138, 138, 138 (median 138): MAD 0, threshold 5 K; 150 is 0 K from the side before.
    expect(isSpike(150, [150, 150], [138, 138, 138])).toBe(false);
    expect(isSpike(138, [150, 150, 150], [138, 138, 138])).toBe(false);
    // Above both levels it is a spike: 10 K and 22 K > 5 K.
    expect(isSpike(160, [150, 150, 150], [138, 138, 138])).toBe(true);
  });

  it('flags two spikes in a row: each side\'s median shrugs off one outlier of three', () => {
    // Before 150, 150, 150 (median 150), after 171, 150, 150 (median 150); deviations 0, 0, 0, 21, 0, 0 → MAD 0.
    expect(isSpike(170, [150, 150, 150], [171, 150, 150])).toBe(true);
  });

  it('does not judge a reading with fewer than 3 neighbours', () => {
    expect(isSpike(500, [150], [150])).toBe(false);
  });
});

describe('SpikeWindow', () => {
  it('judges each candidate against the 3 readings either side, in order, with flat memory', () => {
    const spikes: number[] = [];
    const w = new SpikeWindow((id) => spikes.push(id));
    // A flat 150 with spikes at ids 10 and 5000, and the last reading (id 9999) a spike with only 3 neighbours before it.
    for (let id = 0; id < 10_000; id++) w.push(id, id === 10 || id === 5000 || id === 9999 ? 170 : 150, true);
    w.end();
    expect(spikes).toEqual([10, 5000, 9999]);
  });

  it('uses non-candidates as neighbours only', () => {
    const spikes: number[] = [];
    const w = new SpikeWindow((id) => spikes.push(id));
    [150, 150, 170, 150, 150].forEach((v, i) => w.push(i, v, i !== 2));
    w.end();
    expect(spikes).toEqual([]);
  });
});

/** Weekly rows of W-1 at 150 °C falling 0.1 K a week, with `spikeAt` 11 K high. */
function series(weeks: number[], spikeAt: number, well = 'W-1', status = ''): string[] {
  return weeks.map((k) => `${week(k)},${well},${(150 - 0.1 * k + (k === spikeAt ? 11 : 0)).toFixed(2)},40${status === '' ? '' : `,${status}`}`);
}

describe('the import flags spikes', () => {
  it('imports a spike, flags it and counts it as flagged', async () => {
    const { fdb, service } = importFixture();
    const r = await service.importCsv({ file: csvFile(['time,well,temp,flow', ...series([0, 1, 2, 3, 4, 5, 6, 7, 8, 9], 5)].join('\n')) });
    expect(r.import).toMatchObject({ rowsRead: 10, imported: 10, flagged: 1 });
    const flagged = readingsOf(fdb, r.import!.id).filter((s) => s.flags !== '');
    expect(flagged.map((s) => [s.time_ms, s.flags])).toEqual([[utc(week(5)), 'spike']]);
    expect(r.message).toMatch(/1 of the imported flagged as a spike/);
  });

  it('finds the same spike in a file out of time order (judged from the log)', async () => {
    const { fdb, service } = importFixture();
    const rows = series([0, 1, 2, 3, 4, 5, 6, 7, 8, 9], 5);
    const r = await service.importCsv({ file: csvFile(['time,well,temp,flow', ...rows.reverse()].join('\n')) });
    expect(r.import).toMatchObject({ imported: 10, flagged: 1 });
    expect(readingsOf(fdb, r.import!.id).filter((s) => s.flags === 'spike').map((s) => s.time_ms)).toEqual([utc(week(5))]);
  });

  it('judges a file that continues the log against the stored readings, and one that interleaves with them', async () => {
    const { fdb, service, wellId } = importFixture();
    const repo = new ReadingRepository(fdb);
    // Stored: weeks 0–4 and 8 (150 − 0.1·k °C). The file: weeks 5, 6, 7 and 9, week 6 a spike.
    for (const k of [0, 1, 2, 3, 4, 8]) repo.insert({ wellId: wellId('W-1'), timeMs: utc(week(k)), source: 'manual', productionTemperatureC: 150 - 0.1 * k });
    const r = await service.importCsv({ file: csvFile(['time,well,temp,flow', ...series([5, 6, 7, 9], 6)].join('\n')) });
    expect(r.import).toMatchObject({ imported: 4, flagged: 1 });
    expect(readingsOf(fdb, r.import!.id).filter((s) => s.flags === 'spike').map((s) => s.time_ms)).toEqual([utc(week(6))]);
  });

  it('flags nothing in a step change, in shut-in readings, or in an injection well', async () => {
    const { service } = importFixture({ wells: ['W-1', ['INJ-1', 'injection']] });
    const step = [0, 1, 2, 3, 4, 5].map((k) => `${week(k)},W-1,${k < 3 ? 150 : 138},40,producing`);
    // A shut-in week 10 K cooler than its producing neighbours (the demo log's pattern): neither judged nor a neighbour.
    const shutIn = [6, 7, 8, 9, 10].map((k) => `${week(k)},W-1,${k === 8 ? 128 : 138},${k === 8 ? 0 : 40},${k === 8 ? 'shut-in' : 'producing'}`);
    const injection = series([0, 1, 2, 3, 4, 5, 6], 3, 'INJ-1', 'producing');
    const r = await service.importCsv({ file: csvFile(['time,well,temp,flow,status', ...step, ...shutIn, ...injection].join('\n')) });
    expect(r.import).toMatchObject({ rejected: 0, imported: 18, flagged: 0 });
  });
});
