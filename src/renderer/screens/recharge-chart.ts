/**
 * τfit against τtheory as horizontal interval bars: the fitted time constant's 95 % interval as a
 * bar with its central value marked, the theory's value (which has no interval: it follows from
 * the parameters) as a mark of its own. The axis starts at zero so the lengths compare honestly.
 */
import { COLOURS, Chart } from '../charts/setup.js';
import type { RechargeView } from './recharge-model.js';

const LABELS = ['τ fitted', 'τ theory'];

export function tauChart(canvas: HTMLCanvasElement, view: RechargeView): Chart {
  const fit = view.tauFitYears;
  const interval: ([number, number] | null)[] = [fit.low !== null && fit.high !== null ? [fit.low, fit.high] : null, null];
  return new Chart(canvas, {
    type: 'bar',
    data: {
      labels: LABELS,
      datasets: [
        {
          type: 'bar',
          label: '95 % interval',
          data: interval as unknown as number[],
          backgroundColor: [COLOURS.band, COLOURS.band],
          borderColor: [COLOURS.fit, COLOURS.theory],
          borderWidth: 1,
          barPercentage: 0.55,
        },
        {
          type: 'line',
          label: 'value',
          data: [fit.value, view.tauTheoryYears],
          showLine: false,
          pointStyle: 'rectRot',
          pointRadius: 7,
          pointHoverRadius: 8,
          pointBackgroundColor: [COLOURS.fit, COLOURS.theory],
          pointBorderColor: [COLOURS.fit, COLOURS.theory],
        },
      ],
    },
    options: {
      indexAxis: 'y',
      maintainAspectRatio: false,
      scales: {
        x: { beginAtZero: true, grace: '8%', title: { display: true, text: 'time constant τ (years)' } },
        y: { grid: { display: false } },
      },
      plugins: {
        legend: { display: false },
        tooltip: {
          callbacks: {
            label: (c) => {
              const raw = c.raw as number | [number, number] | null;
              if (Array.isArray(raw)) return `95 % interval ${raw[0].toFixed(1)}–${raw[1].toFixed(1)} yr`;
              return typeof raw === 'number' ? `${raw.toFixed(1)} yr` : '';
            },
          },
        },
      },
    },
  });
}
