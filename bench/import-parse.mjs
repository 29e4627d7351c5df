// Benchmark section "import-parse": the parsing half of the field-data CSV import on an invented
// 1,000,000-row, 5-column export (bench/make-readings-csv.mjs), against papaparse 5.7.1 streaming the
// same file alone (Papa.parse on a Node file stream, a step callback that only counts), both measured in
// this run on this machine. Reported in ms per million rows; the memory check reads a 10,000,000-row
// file in a child process and requires its peak resident set to stay within MEMORY_SLACK_MIB of the
// 1,000,000-row file's (flat memory: one chunk, one partial row and one batch are held at a time).
//   node bench/import-parse.mjs [--quick]     (after `npm run build:cli`)
//   node bench/run.mjs import-parse            (once the section is listed in bench/run.mjs)
// --quick: three repetitions, no 10,000,000-row memory check.
import { execFileSync } from 'node:child_process';
import { createReadStream, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import Papa from 'papaparse';
import { openReadingsCsv } from '../dist/main/import/read-csv.js';
import { makeReadingsCsv } from './make-readings-csv.mjs';
import { formatMs, markdownTable, median, peakRssMiB, progress } from './lib.mjs';

export const title = 'CSV import: parse and validate';

const ROWS = 1_000_000;
const LARGE_ROWS = 10_000_000;
const MEMORY_SLACK_MIB = 32;

/** papaparse alone: the file streamed through Papa.parse, each row counted and dropped. */
function papaparseStream(file) {
  return new Promise((resolve, reject) => {
    let rows = 0;
    Papa.parse(createReadStream(file), { step: () => { rows++; }, complete: () => resolve(rows), error: reject });
  });
}

/** Ours: every row decoded, split, validated into a reading or a rejection, batches dropped once seen. */
async function parseAndValidate(file, options) {
  const csv = await openReadingsCsv(file, options);
  let readings = 0;
  let rejections = 0;
  for await (const batch of csv) {
    readings += batch.readings.length;
    rejections += batch.rejections.length;
  }
  return { readings, rejections };
}

async function timeAsync(fn, reps) {
  await fn(); // warm-up: JIT and page cache
  const ms = [];
  let result;
  for (let i = 0; i < reps; i++) {
    const t0 = performance.now();
    result = await fn();
    ms.push(performance.now() - t0);
  }
  return { ms: median(ms), min: Math.min(...ms), result };
}

/** Peak resident set of a child process that reads `file` with our reader. */
function childPeakRss(file) {
  const out = execFileSync(process.execPath, [fileURLToPath(import.meta.url), '--memory-child', file], { encoding: 'utf8' });
  return JSON.parse(out);
}

export async function run({ quick = false } = {}) {
  const dir = mkdtempSync(join(tmpdir(), 'tauwell-import-bench-'));
  const reps = quick ? 3 : 5;
  try {
    const utcFile = join(dir, 'utc.csv');
    const naiveFile = join(dir, 'naive.csv');
    const volumeFile = join(dir, 'volume.csv');
    progress('import-parse: writing the 1,000,000-row files');
    await makeReadingsCsv(utcFile, ROWS);
    await makeReadingsCsv(naiveFile, ROWS, { naive: true });
    await makeReadingsCsv(volumeFile, ROWS, { volume: true });

    const perMillion = (ms) => (ms * 1_000_000) / ROWS;
    const cases = [
      { name: 'papaparse 5.7.1 streaming alone (Papa.parse on a file stream, step callback)', fn: () => papaparseStream(utcFile) },
      { name: 'ours: parse + validate, ISO instants with Z, mass flow in kg/s', fn: () => parseAndValidate(utcFile, {}) },
      { name: 'ours: naive local times in Europe/Berlin', fn: () => parseAndValidate(naiveFile, { timeZone: 'Europe/Berlin' }) },
      { name: 'ours: volume flow in m3/h (IAPWS-IF97 density per reading)', fn: () => parseAndValidate(volumeFile, {}) },
    ];
    const rows = [];
    const json = { rows: ROWS, reps, cases: [] };
    let baselineMs = null;
    for (const c of cases) {
      progress(`import-parse: ${c.name}`);
      const t = await timeAsync(c.fn, reps);
      baselineMs ??= t.ms;
      const count = typeof t.result === 'number' ? t.result - 1 : t.result.readings + t.result.rejections;
      if (count !== ROWS) throw new Error(`import-parse: ${c.name} saw ${count} rows, expected ${ROWS}`);
      rows.push([c.name, formatMs(perMillion(t.ms)), formatMs(perMillion(t.min)), `${(t.ms / baselineMs).toFixed(2)}×`]);
      json.cases.push({ name: c.name, medianMsPerMillionRows: perMillion(t.ms), minMsPerMillionRows: perMillion(t.min), ratioToPapaparse: t.ms / baselineMs });
    }
    let markdown = markdownTable(['case (1,000,000 rows, 5 columns)', 'median ms / 10⁶ rows', 'best ms / 10⁶ rows', 'vs papaparse alone'], rows);

    let failed = false;
    if (!quick) {
      progress('import-parse: memory, 1,000,000 and 10,000,000 rows in child processes');
      const largeFile = join(dir, 'large.csv');
      await makeReadingsCsv(largeFile, LARGE_ROWS);
      const small = childPeakRss(utcFile);
      const large = childPeakRss(largeFile);
      rmSync(largeFile);
      const growth = large.peakRssMiB - small.peakRssMiB;
      failed = growth > MEMORY_SLACK_MIB;
      json.memory = { small, large, growthMiB: growth, slackMiB: MEMORY_SLACK_MIB };
      markdown += `\n\nPeak resident set reading the file: ${small.peakRssMiB.toFixed(0)} MiB at 1,000,000 rows, `
        + `${large.peakRssMiB.toFixed(0)} MiB at 10,000,000 rows (${large.rows.toLocaleString('en-US')} rows read); `
        + `growth ${growth.toFixed(0)} MiB, target ≤ ${MEMORY_SLACK_MIB} MiB: ${failed ? 'MISSED' : 'met'}.`;
    } else {
      markdown += '\n\nMemory check skipped (--quick).';
    }
    json.processPeakRssMiB = peakRssMiB();
    return { markdown, json, failed };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

async function memoryChild(file) {
  const { readings, rejections } = await parseAndValidate(file, {});
  process.stdout.write(JSON.stringify({ rows: readings + rejections, peakRssMiB: peakRssMiB() }));
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  if (process.argv[2] === '--memory-child') {
    await memoryChild(process.argv[3]);
  } else {
    const quick = process.argv.includes('--quick');
    const result = await run({ quick });
    console.log(`## ${title}\n\n${result.markdown}\n`);
    process.exitCode = result.failed ? 1 : 0;
  }
}
