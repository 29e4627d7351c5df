// Benchmark section "fit": the decline fitter against plain ml-levenberg-marquardt 5.1.0 on the same data,
// both measured in this run on this machine. Targets: < 5 ms per fit at 1,500 points, < 1 s per fit at
// 1,000,000 points, and at least 100 times faster than the baseline at 1,000,000 points.
import { cpus } from 'node:os';
import { fitAuto, fitDecline } from '../dist/shared/fit/fit.js';
import { fitWithMlLevenbergMarquardt } from '../dist/shared/fit/reference-lm.js';
import { DECLINE_MODELS } from '../dist/shared/fit/types.js';
import { createRng } from '../dist/shared/stats/random.js';
import { formatMs, markdownTable, peakRssMiB, progress, timeMedian } from './lib.mjs';

export const title = 'Decline fitting';

const YEAR_S = 365.25 * 86400;
const WEEK_S = 7 * 86400;

// The invented decline: exponential to a floor, θ = 20 K + 50 K·e^(−t/12 yr), with 0.3 K Gaussian noise,
// over 1,500 weeks (28.8 years). The small case is a weekly log; the large one the same span as a
// data-system export every ~15 minutes. No model is exact for the exponential and hyperbolic fits, as in
// the field.
const DATA = { thetaInfK: 20, amplitudeK: 50, tauYears: 12, noiseK: 0.3, spanWeeks: 1500, seed: 20260101 };

const SMALL_N = 1500;
const LARGE_N = 1_000_000;
const SMALL = { warmUp: 50, reps: 300 };
const SMALL_BASELINE = { warmUp: 2, reps: 15 };
const LARGE = { warmUp: 1, reps: 3 };
const TARGET_SMALL_MS = 5;
const TARGET_LARGE_MS = 1000;
const TARGET_RATIO = 100;

function syntheticSeries(n, seed) {
  const rng = createRng(seed);
  const x = new Float64Array(n);
  const theta = new Float64Array(n);
  const step = (DATA.spanWeeks * WEEK_S) / (n - 1);
  const tau = DATA.tauYears * YEAR_S;
  for (let i = 0; i < n; i++) {
    x[i] = i * step;
    theta[i] = DATA.thetaInfK + DATA.amplitudeK * Math.exp(-x[i] / tau) + DATA.noiseK * rng.normal();
  }
  return { basis: 'time', x, theta };
}

/** Largest relative difference between two parameter records, over the parameters both have. */
function maxRelativeDifference(a, b) {
  return Math.max(...Object.keys(a).map((k) => Math.abs(a[k] - b[k]) / Math.abs(b[k])));
}

/** A fit that did not converge fails its row whatever its time: its time is not that of a fit. */
function statusNote(fit) {
  return fit.status === 'converged' ? null : `status ${fit.status}`;
}

/** How close the baseline came to our optimum: its point is a fit too, or the ratio would mean nothing. */
function agreementNote(rows) {
  const checked = rows.filter((r) => r.agreement !== undefined);
  const worst = Math.max(...checked.map((r) => r.agreement.maxRelativeParameterDifference));
  const ourLower = checked.every((r) => r.agreement.sseOurs <= r.agreement.sseBaseline * (1 + 1e-9));
  return `ml-levenberg-marquardt's end points: parameters within ${worst.toExponential(1)} (relative) of ours; `
    + `ours has the ${ourLower ? 'lower SSE in every case' : 'HIGHER SSE in some case (see fit.json)'}`
    + ' (its default 0.1 finite-difference step biases fits the model does not match exactly).';
}

export async function run({ quick }) {
  const rows = [];
  const small = syntheticSeries(SMALL_N, DATA.seed);
  const large = syntheticSeries(LARGE_N, DATA.seed + 1);
  const rssWithData = peakRssMiB();

  // 1,500 points.
  const baselineSmall = {};
  for (const model of DECLINE_MODELS) {
    progress(`fit: ${model}, ${SMALL_N.toLocaleString('en-US')} points`);
    const ours = timeMedian(() => fitDecline(small, model), SMALL);
    const ref = timeMedian(() => fitWithMlLevenbergMarquardt(small, model), SMALL_BASELINE);
    baselineSmall[model] = ref.ms;
    rows.push({
      case: `fitDecline ${model}`, n: SMALL_N, oursMs: ours.ms, oursReps: ours.reps, iterations: ours.result.iterations,
      status: ours.result.status, problem: statusNote(ours.result),
      baselineMs: ref.ms, baselineReps: ref.reps, ratio: ref.ms / ours.ms,
      target: `< ${TARGET_SMALL_MS} ms`, pass: ours.ms < TARGET_SMALL_MS && statusNote(ours.result) === null,
      agreement: { maxRelativeParameterDifference: maxRelativeDifference(ours.result.estimates, ref.result.estimates), sseOurs: ours.result.sse, sseBaseline: ref.result.sse },
    });
  }
  progress(`fit: fitAuto, ${SMALL_N.toLocaleString('en-US')} points`);
  const auto = timeMedian(() => fitAuto(small), SMALL);
  const autoBaseline = DECLINE_MODELS.reduce((sum, m) => sum + baselineSmall[m], 0);
  rows.push({
    case: `fitAuto (3 models; picks ${auto.result.model})`, n: SMALL_N, oursMs: auto.ms, oursReps: auto.reps,
    status: auto.result.status, problem: statusNote(auto.result),
    baselineMs: autoBaseline, baselineNote: 'sum of the three ml-levenberg-marquardt fits', ratio: autoBaseline / auto.ms,
    target: `< ${TARGET_SMALL_MS} ms`, pass: auto.ms < TARGET_SMALL_MS && statusNote(auto.result) === null,
  });

  // 1,000,000 points.
  const oursLarge = {};
  for (const model of DECLINE_MODELS) {
    progress(`fit: ${model}, ${LARGE_N.toLocaleString('en-US')} points`);
    oursLarge[model] = timeMedian(() => fitDecline(large, model), LARGE);
  }
  const rssAfterOurs = peakRssMiB();

  let baselineLarge = null;
  if (!quick) {
    progress(`fit: plain ml-levenberg-marquardt, exponential, ${LARGE_N.toLocaleString('en-US')} points, 200 iterations — `
      + 'this takes minutes (skip it with --quick); progress every 10 iterations');
    const t0 = performance.now();
    const ref = fitWithMlLevenbergMarquardt(large, 'exponential', {
      onIteration: (i) => {
        if (i % 10 !== 0) return;
        const s = (performance.now() - t0) / 1000;
        progress(`  iteration ${i}/200, ${s.toFixed(0)} s elapsed, about ${((s / i) * (200 - i) / 60).toFixed(1)} min to go`);
      },
    });
    baselineLarge = { ms: performance.now() - t0, iterations: ref.iterations, estimates: ref.estimates, sse: ref.sse };
  }
  const rssEnd = peakRssMiB();

  for (const model of DECLINE_MODELS) {
    const ours = oursLarge[model];
    const row = {
      case: `fitDecline ${model}`, n: LARGE_N, oursMs: ours.ms, oursReps: ours.reps, iterations: ours.result.iterations,
      status: ours.result.status, problem: statusNote(ours.result),
      baselineMs: null, ratio: null, target: `< ${TARGET_LARGE_MS / 1000} s`, pass: ours.ms < TARGET_LARGE_MS && statusNote(ours.result) === null,
    };
    if (model === 'exponential') {
      if (baselineLarge === null) {
        row.baselineNote = 'skipped (--quick)';
        row.target += ' (≥ 100× not measured)';
      } else {
        row.baselineMs = baselineLarge.ms;
        row.baselineReps = 1;
        row.ratio = baselineLarge.ms / ours.ms;
        row.target += `, ≥ ${TARGET_RATIO}×`;
        row.pass = row.pass && row.ratio >= TARGET_RATIO;
        row.agreement = { maxRelativeParameterDifference: maxRelativeDifference(ours.result.estimates, baselineLarge.estimates), sseOurs: ours.result.sse, sseBaseline: baselineLarge.sse };
      }
    }
    rows.push(row);
  }

  const table = markdownTable(
    ['case', 'n', 'ours ms', 'ml-levenberg-marquardt ms', 'ratio', 'target', 'result'],
    rows.map((r) => [
      r.case, r.n.toLocaleString('en-US'), formatMs(r.oursMs),
      r.baselineMs === null ? (r.baselineNote ?? '—') : formatMs(r.baselineMs),
      r.ratio === null ? '—' : `${r.ratio >= 100 ? Math.round(r.ratio).toLocaleString('en-US') : r.ratio.toPrecision(3)}×`,
      r.target, r.pass ? 'pass' : `**FAIL**${r.problem ? ` (${r.problem})` : ''}`,
    ]),
  );
  const notes = [
    `Data: invented decline θ = ${DATA.thetaInfK} K + ${DATA.amplitudeK} K·e^(−t/${DATA.tauYears} yr) + N(0, ${DATA.noiseK} K) over ${DATA.spanWeeks} weeks, seed ${DATA.seed}.`,
    `Timing: median wall time; ours ${SMALL.reps} runs after ${SMALL.warmUp} warm-up at ${SMALL_N.toLocaleString('en-US')} points and ${LARGE.reps} after ${LARGE.warmUp} at ${LARGE_N.toLocaleString('en-US')}; `
      + `ml-levenberg-marquardt 5.1.0 (its defaults, 200 iterations, scaled basis, same computed start) ${SMALL_BASELINE.reps} runs after ${SMALL_BASELINE.warmUp} warm-up, once at ${LARGE_N.toLocaleString('en-US')}. fitAuto's baseline is the sum of the three.`,
    agreementNote(rows),
    `Peak RSS: ${rssWithData.toFixed(0)} MiB with the data generated, ${rssAfterOurs.toFixed(0)} MiB after our ${LARGE_N.toLocaleString('en-US')}-point fits`
      + (quick ? '; the ml-levenberg-marquardt run at that size was skipped (--quick).' : `, ${rssEnd.toFixed(0)} MiB after the ml-levenberg-marquardt run.`),
    `Machine: ${cpus().length} × ${cpus()[0]?.model ?? 'unknown CPU'}, Node ${process.version}.`,
  ];

  return {
    markdown: `${table}\n\n${notes.join('\n')}`,
    failed: rows.some((r) => !r.pass),
    json: {
      quick, data: DATA, smallN: SMALL_N, largeN: LARGE_N,
      timing: { small: SMALL, smallBaseline: SMALL_BASELINE, large: LARGE, largeBaselineReps: quick ? 0 : 1 },
      baseline: 'ml-levenberg-marquardt 5.1.0, defaults except maxIterations 200, scaled basis, computed start',
      peakRssMiB: { withData: rssWithData, afterOursLarge: rssAfterOurs, end: rssEnd },
      rows,
    },
  };
}
