/**
 * The field's thermal output chart of a field report: the measured output week by week (as the field
 * screen draws it) and the summed central forecast of the wells beyond the latest reading.
 *
 * TO BE REPLACED: the measured line repeats the chart configuration the field screen builds inline
 * in outputChart() (src/renderer/screens/field.ts); when that configuration is exported as a
 * builder (e.g. `outputChartConfig(points, display)`), use it here and add the forecast dataset.
 */
import type { FieldReport } from '../../shared/report/field-section.js';
import type { Display } from '../app/display.js';
import { outputPoints } from '../screens/field-model.js';
import { Chart, COLOURS } from '../charts/setup.js';

export function drawOutputChart(canvas: HTMLCanvasElement, field: FieldReport, display: Display): Chart<'line'> {
  const unit = display.unit('power');
  const measured = field.output === null ? [] : outputPoints(field.output, display);
  const forecast = field.forecast === null ? [] : field.forecast.x.map((x, i) => ({ x, y: display.value('power', field.forecast?.y[i] ?? NaN) }));
  return new Chart<'line', { x: number; y: number }[]>(canvas, {
    type: 'line',
    data: {
      datasets: [
        {
          label: `measured thermal power (${unit})`, data: measured, borderColor: COLOURS.fit, backgroundColor: COLOURS.band,
          fill: 'origin', borderWidth: 1.5, pointRadius: 0,
        },
        {
          label: `forecast: sum of the wells' best-fit curves (${unit})`, data: forecast, borderColor: COLOURS.limit,
          borderDash: [6, 4], borderWidth: 1.5, pointRadius: 0, fill: false,
        },
      ],
    },
    options: {
      parsing: false,
      normalized: true,
      responsive: true,
      maintainAspectRatio: false,
      animation: false,
      scales: {
        x: { type: 'time', ticks: { maxRotation: 0, autoSkipPadding: 16 }, title: { display: true, text: `week (${display.timeZone})` } },
        y: { beginAtZero: true, title: { display: true, text: `thermal power (${unit})` } },
      },
      plugins: {
        legend: { display: true, position: 'top', labels: { boxWidth: 24, boxHeight: 8, color: COLOURS.ink, filter: (item, data) => (data.datasets[item.datasetIndex ?? 0]?.data.length ?? 0) > 0 } },
        decimation: { enabled: true, algorithm: 'min-max' },
      },
    },
  });
}
