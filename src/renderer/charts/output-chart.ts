/**
 * The field's thermal output chart as the field screen draws it (the measured power week by week,
 * filled to zero), optionally with the summed forecast of the wells beyond the latest reading, as a
 * chart.js configuration. Shared by the field screen (interactive: wheel or pinch zoom, drag pan) and
 * the report (static), so both draw the same chart. Pure (no DOM): the caller makes the Chart.
 */
import type { ChartConfiguration, ChartDataset } from 'chart.js';
import type { Display } from '../app/display.js';
import { COLOURS } from './setup.js';

type Point = { x: number; y: number };

export interface OutputChartInput {
  /** Measured thermal power per week: x epoch ms, y in the display's power unit (field-model.ts outputPoints). */
  measured: Point[];
  /** The wells' summed central forecast in the same coordinates; omitted on the screen. */
  forecast?: Point[];
  display: Display;
  /** Zoom and pan (the screen); a printed page has neither. */
  interactive: boolean;
}

export function outputChartConfig(input: OutputChartInput): ChartConfiguration<'line', Point[]> {
  const { display, forecast } = input;
  const unit = display.unit('power');
  const datasets: ChartDataset<'line', Point[]>[] = [{
    label: forecast === undefined ? `Thermal power (${unit})` : `Measured thermal power (${unit})`,
    data: input.measured,
    borderColor: COLOURS.fit,
    backgroundColor: COLOURS.band,
    fill: 'origin',
    borderWidth: 1.5,
    pointRadius: 0,
    pointHitRadius: 6,
  }];
  if (forecast !== undefined) {
    datasets.push({
      label: `Forecast: sum of the wells' best-fit curves (${unit})`, data: forecast, borderColor: COLOURS.limit,
      borderDash: [6, 4], borderWidth: 1.5, pointRadius: 0, fill: false,
    });
  }
  return {
    type: 'line',
    data: { datasets },
    options: {
      parsing: false,
      normalized: true,
      responsive: true,
      maintainAspectRatio: false,
      interaction: { mode: 'nearest', axis: 'x', intersect: false },
      scales: {
        x: {
          type: 'time', time: { tooltipFormat: 'week' }, ticks: { maxRotation: 0, autoSkipPadding: 16 },
          title: { display: true, text: `Week (${display.timeZone})` },
        },
        y: { beginAtZero: true, title: { display: true, text: `Thermal power (${unit})` } },
      },
      plugins: {
        // One line needs no legend; with the forecast, name both (an empty one is left out).
        legend: forecast === undefined ? { display: false } : {
          display: true, position: 'top',
          labels: { boxWidth: 24, boxHeight: 8, color: COLOURS.ink, filter: (item, data) => (data.datasets[item.datasetIndex ?? 0]?.data.length ?? 0) > 0 },
        },
        decimation: { enabled: true, algorithm: 'min-max' },
        tooltip: { callbacks: { label: (item) => `${item.parsed.y?.toFixed(2) ?? '—'} ${unit}` } },
        ...(input.interactive ? {
          zoom: {
            zoom: { wheel: { enabled: true }, pinch: { enabled: true }, mode: 'x' as const },
            pan: { enabled: true, mode: 'x' as const },
            limits: { x: { min: 'original' as const, max: 'original' as const } },
          },
        } : {}),
      },
    },
  };
}
