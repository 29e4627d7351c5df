/**
 * chart.js as every screen uses it: the components registered once (tree-shaken build), the zoom
 * and pan plugin, the Intl time adapter in the display zone, decimation for long series, and the
 * project's palette. Import `Chart` from here, not from 'chart.js', so the setup has always run.
 */
import {
  CategoryScale, Chart, Decimation, Filler, Legend, LinearScale, LineController, LineElement, PointElement, ScatterController,
  TimeScale, Tooltip, BarController, BarElement,
} from 'chart.js';
import zoomPlugin from 'chartjs-plugin-zoom';
import { installTimeAdapter, setChartTimeZone } from './time-adapter.js';

Chart.register(
  LineController, ScatterController, BarController, LineElement, PointElement, BarElement,
  LinearScale, TimeScale, CategoryScale, Decimation, Filler, Legend, Tooltip, zoomPlugin,
);
installTimeAdapter();

/** The palette: readable on the paper background at WCAG AA for text and 3:1 for graphics. */
export const COLOURS = {
  ink: '#1d2326',
  muted: '#5b6469',
  grid: '#d9d4c7',
  readings: '#1f6f8b',
  excluded: '#9a8f7a',
  fit: '#b3441e',
  band: 'rgba(179, 68, 30, 0.16)',
  limit: '#6b3fa0',
  theory: '#2f7d4f',
  residual: '#1f6f8b',
} as const;

Chart.defaults.color = COLOURS.muted;
Chart.defaults.borderColor = COLOURS.grid;
Chart.defaults.font.family = 'system-ui, -apple-system, "Segoe UI", Roboto, "Noto Sans", sans-serif';
Chart.defaults.font.size = 12;
Chart.defaults.animation = false;

export { Chart, setChartTimeZone };
