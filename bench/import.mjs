// Benchmark section "import": the whole field-data CSV import (hash, parse, validate, store in one
// transaction, duplicates and conflicts, spikes) on an invented 1,000,000-row, 5-column export
// (bench/make-readings-csv.mjs: time, well, production temperature, flow, pressure; about 45 MB),
// against a minimal pipeline measured in the same run: papaparse 5.7.1 streaming the file (a step
// callback) into a better-sqlite3 prepared insert into the same readings table, 10,000 rows per
// transaction, no validation. Every run is a child process (a fresh heap, its own peak resident set
// from process.resourceUsage().maxRSS) with a fresh field log. The two pipelines take turns, and the
// time ratio is the median over the turns of (import ÷ minimal run just before it), so that a busy
// machine — this one is shared — slows both sides of each ratio alike. Targets: that ratio at most
// 1.25; the import's peak resident set at most 250 MiB at 1,000,000 rows and at 10,000,000 rows.
//   node bench/import.mjs [--quick]      (after `npm run build:cli`)
//   node bench/run.mjs import
// --quick: three turns instead of five, and no 10,000,000-row run.
import { execFileSync } from 'node:child_process';
import { createReadStream, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { makeReadingsCsv } from './make-readings-csv.mjs';
import { formatMs, markdownTable, median, peakRssMiB, progress } from './lib.mjs';

export const title = 'CSV import: parse, validate and store';

const ROWS = 1_000_000;
const LARGE_ROWS = 10_000_000;
const TIME_RATIO_TARGET = 1.25;
const PEAK_RSS_TARGET_MIB = 250;
const MINIMAL_BATCH_ROWS = 10_000;
const WELLS = Array.from({ length: 10 }, (_, i) => `GT-${String(i + 1).padStart(2, '0')}`);

// ---- the children ----

async function openLog(dbFile) {
  const { openDatabase } = await import('../dist/main/db/database.js');
  const { FieldRepository } = await import('../dist/main/db/fields.js');
  const { WellRepository } = await import('../dist/main/db/wells.js');
  for (const suffix of ['', '-wal', '-shm']) rmSync(dbFile + suffix, { force: true });
  const fdb = openDatabase(dbFile);
  const field = new FieldRepository(fdb).create({ name: 'Bench field (invented)', timeZone: 'UTC' });
  const wells = new WellRepository(fdb);
  for (const name of WELLS) wells.create({ fieldId: field.id, name, kind: 'production' });
  return fdb;
}

/** papaparse into prepared inserts, batched transactions, no validation. */
async function minimalChild(csv, dbFile) {
  const { default: Papa } = await import('papaparse');
  const fdb = await openLog(dbFile);
  const db = fdb.db;
  const wellId = new Map(db.prepare('SELECT id, name FROM wells').all().map((w) => [w.name, w.id]));
  const insert = db.prepare(
    `INSERT INTO readings (well_id, time_ms, production_temperature_c, mass_flow_kg_s, pressure_pa, source, created_ms)
     VALUES (?, ?, ?, ?, ?, 'import', ?)`,
  );
  const created = Date.now();
  const t0 = performance.now();
  let rows = 0;
  let header = true;
  db.exec('BEGIN');
  await new Promise((resolve, reject) => {
    Papa.parse(createReadStream(csv), {
      step: ({ data }) => {
        if (header) {
          header = false;
          return;
        }
        insert.run(wellId.get(data[1]), Date.parse(data[0]), Number(data[2]), Number(data[3]), Number(data[4]) * 1e5, created);
        if (++rows % MINIMAL_BATCH_ROWS === 0) {
          db.exec('COMMIT');
          db.exec('BEGIN');
        }
      },
      complete: resolve,
      error: reject,
    });
  });
  db.exec('COMMIT');
  const ms = performance.now() - t0;
  fdb.close();
  return { rows, ms, peakRssMiB: peakRssMiB() };
}

/** The import as `tauwell import` runs it, with the time of each phase; then the refused re-import. */
async function oursChild(csv, dbFile, { forced }) {
  const { createImportService } = await import('../dist/main/services/imports.js');
  const fdb = await openLog(dbFile);
  const service = createImportService(fdb, { who: 'bench' });
  const phases = {};
  let phase = 'opening';
  let mark = performance.now();
  const t0 = mark;
  const r = await service.importCsv({ file: csv }, {
    onProgress: (p) => {
      if (p.phase === phase) return;
      const now = performance.now();
      phases[phase] = (phases[phase] ?? 0) + now - mark;
      mark = now;
      phase = p.phase;
    },
  });
  const end = performance.now();
  phases[phase] = (phases[phase] ?? 0) + end - mark;
  const ms = end - t0;
  const t1 = performance.now();
  const refused = await service.importCsv({ file: csv });
  const refusedMs = performance.now() - t1;
  if (refused.import !== null) throw new Error('bench: the re-import was not refused');
  let forcedResult = null;
  if (forced) {
    const t2 = performance.now();
    const again = await service.importCsv({ file: csv, force: true });
    forcedResult = { ms: performance.now() - t2, duplicates: again.import.duplicates };
  }
  fdb.close();
  return { rows: r.import.rowsRead, imported: r.import.imported, flagged: r.import.flagged, status: r.import.status, ms, phases, refusedMs, forced: forcedResult, peakRssMiB: peakRssMiB() };
}

/** SHA-256 of the file alone (what hashing before the import costs). */
async function hashChild(csv) {
  const { sha256OfFile } = await import('../dist/main/import/file-hash.js');
  const t0 = performance.now();
  const { bytes } = await sha256OfFile(csv);
  return { ms: performance.now() - t0, bytes, peakRssMiB: peakRssMiB() };
}

function child(kind, csv, dbFile, extra = []) {
  const out = execFileSync(process.execPath, [fileURLToPath(import.meta.url), '--child', kind, csv, dbFile, ...extra], {
    encoding: 'utf8', maxBuffer: 1 << 20, stdio: ['ignore', 'pipe', 'inherit'],
  });
  return JSON.parse(out);
}

// ---- the section ----

export async function run({ quick = false } = {}) {
  const dir = mkdtempSync(join(tmpdir(), 'tauwell-import-store-bench-'));
  const turns = quick ? 3 : 5;
  try {
    const csv = join(dir, 'export.csv');
    const dbFile = join(dir, 'field.sqlite');
    progress('import: writing the 1,000,000-row file');
    const bytes = await makeReadingsCsv(csv, ROWS);
    child('hash', csv, dbFile); // warm the page cache, so no pipeline pays the first read from disk

    const minimal = [];
    const ours = [];
    const hashes = [];
    for (let turn = 1; turn <= turns; turn++) {
      progress(`import: turn ${turn} of ${turns}: minimal pipeline`);
      minimal.push(child('minimal', csv, dbFile));
      progress(`import: turn ${turn} of ${turns}: tauwell import${turn === turns && !quick ? ' (then again with --force)' : ''}`);
      ours.push(child('ours', csv, dbFile, turn === turns && !quick ? ['--forced'] : []));
      hashes.push(child('hash', csv, dbFile));
    }
    for (const r of ours) if (r.status !== 'complete' || r.imported !== ROWS) throw new Error(`bench: the import stored ${r.imported} of ${ROWS} rows (${r.status})`);
    for (const r of minimal) if (r.rows !== ROWS) throw new Error(`bench: the minimal pipeline stored ${r.rows} of ${ROWS} rows`);

    const m = (list, key = 'ms') => median(list.map((x) => x[key]));
    const minimalMs = m(minimal);
    const oursMs = m(ours);
    const ratio = median(ours.map((r, i) => r.ms / minimal[i].ms));
    const bestRatio = Math.min(...ours.map((r) => r.ms)) / Math.min(...minimal.map((r) => r.ms));
    const oursPeak = Math.max(...ours.map((r) => r.peakRssMiB));
    const minimalPeak = Math.max(...minimal.map((r) => r.peakRssMiB));
    const hashMs = m(hashes);
    const phaseNames = Object.keys(ours[0].phases);
    const phaseMs = Object.fromEntries(phaseNames.map((p) => [p, median(ours.map((r) => r.phases[p] ?? 0))]));

    let large = null;
    if (!quick) {
      progress('import: writing the 10,000,000-row file');
      const largeCsv = join(dir, 'large.csv');
      await makeReadingsCsv(largeCsv, LARGE_ROWS);
      rmSync(csv);
      progress('import: 10,000,000 rows, minimal pipeline');
      const lm = child('minimal', largeCsv, dbFile);
      progress('import: 10,000,000 rows, tauwell import');
      const lo = child('ours', largeCsv, dbFile);
      rmSync(largeCsv);
      if (lo.imported !== LARGE_ROWS) throw new Error(`bench: the 10,000,000-row import stored ${lo.imported} rows`);
      large = { minimal: lm, ours: lo, ratio: lo.ms / lm.ms };
    }

    const timeMet = ratio <= TIME_RATIO_TARGET;
    const memoryMet = oursPeak <= PEAK_RSS_TARGET_MIB && (large === null || large.ours.peakRssMiB <= PEAK_RSS_TARGET_MIB);
    const s = (ms) => (ms / 1000).toFixed(2);
    const rows = [
      ['minimal: papaparse → prepared insert, 10,000 rows per transaction', '1,000,000', s(minimalMs), s(Math.min(...minimal.map((r) => r.ms))), minimalPeak.toFixed(0), '1.00×', 'baseline'],
      ['tauwell import (one transaction)', '1,000,000', s(oursMs), s(Math.min(...ours.map((r) => r.ms))), oursPeak.toFixed(0), `${ratio.toFixed(2)}×`,
        `≤ ${TIME_RATIO_TARGET}×, ≤ ${PEAK_RSS_TARGET_MIB} MiB: ${timeMet && oursPeak <= PEAK_RSS_TARGET_MIB ? 'met' : 'MISSED'}`],
    ];
    if (large !== null) {
      rows.push(['minimal', '10,000,000', s(large.minimal.ms), '—', large.minimal.peakRssMiB.toFixed(0), '1.00×', 'baseline']);
      rows.push(['tauwell import', '10,000,000', s(large.ours.ms), '—', large.ours.peakRssMiB.toFixed(0), `${large.ratio.toFixed(2)}×`,
        `≤ ${PEAK_RSS_TARGET_MIB} MiB: ${large.ours.peakRssMiB <= PEAK_RSS_TARGET_MIB ? 'met' : 'MISSED'}`]);
    }
    const last = ours[ours.length - 1];
    let markdown = markdownTable(['pipeline', 'rows', 'median s', 'best s', 'peak RSS MiB', 'time vs minimal', 'target'], rows);
    markdown += `\n\nFile: ${bytes.toLocaleString('en-US')} bytes, ${turns} turns (minimal and import alternating, each a fresh child process and field log). `
      + `Time vs minimal: the median of the ${turns} per-turn ratios (${ours.map((r, i) => (r.ms / minimal[i].ms).toFixed(2)).join(', ')}); best against best ${bestRatio.toFixed(2)}×. `
      + `Import phases (median ms): ${phaseNames.map((p) => `${p} ${formatMs(phaseMs[p])}`).join(', ')}.`;
    markdown += `\n\nHashing: the SHA-256 of the file alone takes ${formatMs(hashMs)} ms, ${((100 * hashMs) / oursMs).toFixed(1)} % of the import. `
      + 'No complete import had this size, so the import hashed it on a second thread while it read (no "hashing" phase above); '
      + `a re-import of the same bytes is hashed first and refused in ${formatMs(m(ours, 'refusedMs'))} ms without parsing a row`
      + (last.forced === null ? '.' : `, and forced it takes ${s(last.forced.ms)} s (${last.forced.duplicates.toLocaleString('en-US')} duplicates).`);
    if (large === null) markdown += '\n\n10,000,000-row run skipped (--quick).';
    const json = {
      rows: ROWS, bytes, turns, targets: { timeRatio: TIME_RATIO_TARGET, peakRssMiB: PEAK_RSS_TARGET_MIB },
      minimal, ours, hashes, medianMs: { minimal: minimalMs, ours: oursMs, hash: hashMs }, ratio, bestRatio, phaseMs, large,
      processPeakRssMiB: peakRssMiB(),
    };
    return { markdown, json, failed: !(timeMet && memoryMet) };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  if (process.argv[2] === '--child') {
    const [kind, csv, dbFile, flag] = process.argv.slice(3);
    const result = kind === 'minimal' ? await minimalChild(csv, dbFile)
      : kind === 'ours' ? await oursChild(csv, dbFile, { forced: flag === '--forced' })
        : await hashChild(csv);
    process.stdout.write(JSON.stringify(result));
  } else {
    const result = await run({ quick: process.argv.includes('--quick') });
    console.log(`## ${title}\n\n${result.markdown}\n`);
    process.exitCode = result.failed ? 1 : 0;
  }
}
