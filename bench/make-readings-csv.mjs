// Writes an invented plant export for the import benchmark: one header row and `rows` data rows of
// five columns (time, well, production temperature, flow, wellhead pressure), ten wells logged in turn
// every 6 minutes, values from a seeded generator so that every run writes the same bytes.
//   node bench/make-readings-csv.mjs <out.csv> [rows=1000000] [--naive] [--volume]
// --naive writes local timestamps without an offset (the time-zone path); the default writes UTC with Z.
// --volume logs the flow in m3/h (the water-density path); the default logs kg/s.
import { createWriteStream } from 'node:fs';
import { once } from 'node:events';

const HEADER = 'timestamp,well,T_prod (degC),flow [kg/s],WHP [bar]';
const HEADER_VOLUME = 'timestamp,well,T_prod (degC),flow [m3/h],WHP [bar]';
const WELLS = Array.from({ length: 10 }, (_, i) => `GT-${String(i + 1).padStart(2, '0')}`);
const START_MS = Date.UTC(2020, 0, 1);
const STEP_MS = 6 * 60_000;

/** mulberry32: a small seeded generator, enough for invented benchmark values. */
function rng(seed) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function pad(n, width = 2) {
  return String(n).padStart(width, '0');
}

function timestamp(ms, naive) {
  const d = new Date(ms);
  const text = `${d.getUTCFullYear()}-${pad(d.getUTCMonth() + 1)}-${pad(d.getUTCDate())}T${pad(d.getUTCHours())}:${pad(d.getUTCMinutes())}:${pad(d.getUTCSeconds())}`;
  return naive ? text : `${text}Z`;
}

/** Writes the file; resolves to the number of bytes written. */
export async function makeReadingsCsv(path, rows = 1_000_000, { naive = false, volume = false } = {}) {
  const random = rng(20240101);
  const out = createWriteStream(path);
  let bytes = 0;
  let buffer = `${volume ? HEADER_VOLUME : HEADER}\n`;
  for (let i = 0; i < rows; i++) {
    const well = WELLS[i % WELLS.length];
    const ms = START_MS + Math.floor(i / WELLS.length) * STEP_MS;
    const temperature = (150 + 40 * random()).toFixed(1);
    // 30–60 kg/s, or the same order in m3/h (about 110–220 m3/h at 170 °C).
    const flow = volume ? (110 + 110 * random()).toFixed(1) : (30 + 30 * random()).toFixed(2);
    const pressure = (15 + 10 * random()).toFixed(2);
    buffer += `${timestamp(ms, naive)},${well},${temperature},${flow},${pressure}\n`;
    if (buffer.length > 1 << 16) {
      bytes += buffer.length;
      if (!out.write(buffer)) await once(out, 'drain');
      buffer = '';
    }
  }
  bytes += buffer.length;
  out.end(buffer);
  await once(out, 'finish');
  return bytes;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const args = process.argv.slice(2);
  const naive = args.includes('--naive');
  const volume = args.includes('--volume');
  const [path, rows] = args.filter((a) => !a.startsWith('--'));
  if (path === undefined) {
    console.error('usage: node bench/make-readings-csv.mjs <out.csv> [rows=1000000] [--naive] [--volume]');
    process.exitCode = 2;
  } else {
    const bytes = await makeReadingsCsv(path, rows === undefined ? 1_000_000 : Number(rows), { naive, volume });
    console.log(`${path}: ${bytes} bytes`);
  }
}
