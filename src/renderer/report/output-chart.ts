/**
 * The field's thermal output chart of a field report: the field screen's own chart
 * (charts/output-chart.ts) with the summed central forecast of the wells beyond the latest reading.
 */
import type { FieldReport } from '../../shared/report/field-section.js';
import type { Display } from '../app/display.js';
import { outputPoints } from '../screens/field-model.js';
import { outputChartConfig } from '../charts/output-chart.js';
import { Chart } from '../charts/setup.js';

export function drawOutputChart(canvas: HTMLCanvasElement, field: FieldReport, display: Display): Chart<'line', { x: number; y: number }[]> {
  const measured = field.output === null ? [] : outputPoints(field.output, display);
  const forecast = field.forecast === null ? [] : field.forecast.x.map((x, i) => ({ x, y: display.value('power', field.forecast?.y[i] ?? NaN) }));
  return new Chart(canvas, outputChartConfig({ measured, forecast, display, interactive: false }));
}
