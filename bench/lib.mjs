// Helpers shared by the benchmark sections: timing, memory, formatting.
import { resourceUsage } from 'node:process';

/** Median of a list of numbers. */
export function median(values) {
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 === 1 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Runs fn `warmUp` times untimed, then `reps` times timed; returns the median wall time in ms and fn's last result. */
export function timeMedian(fn, { reps, warmUp = 0 }) {
  let result;
  for (let i = 0; i < warmUp; i++) result = fn();
  const ms = [];
  for (let i = 0; i < reps; i++) {
    const t0 = performance.now();
    result = fn();
    ms.push(performance.now() - t0);
  }
  return { ms: median(ms), reps, result };
}

/** The process's peak resident set so far (the kernel's high-water mark, not a sample), MiB. */
export function peakRssMiB() {
  return resourceUsage().maxRSS / 1024;
}

/** A GitHub-flavoured Markdown table. */
export function markdownTable(headers, rows) {
  const line = (cells) => `| ${cells.join(' | ')} |`;
  return [line(headers), line(headers.map(() => '---')), ...rows.map(line)].join('\n');
}

/** Milliseconds for a table cell: three significant figures, thousands separated. */
export function formatMs(ms) {
  if (ms === null || ms === undefined || !Number.isFinite(ms)) return '—';
  if (ms >= 100) return Math.round(ms).toLocaleString('en-US');
  return ms.toPrecision(3);
}

/** Progress goes to stderr so that stdout stays the report. */
export function progress(message) {
  process.stderr.write(`${message}\n`);
}
