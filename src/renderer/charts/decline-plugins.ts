/**
 * The decline chart's own chart.js plugins: the fit window's shading, the economic limit's label,
 * the residuals panel's rules, fast drawing of many small marks, and no hover replay after an
 * update. Each is a plain object or a factory; the chart (decline-chart.ts) owns the state they read.
 */
import type { Plugin } from 'chart.js';
import { COLOURS } from './setup.js';

/** Shading of the fit window (teal, like the readings it selects, but light enough to read through). */
const WINDOW_FILL = 'rgba(31, 111, 139, 0.09)';
const WINDOW_EDGE = 'rgba(31, 111, 139, 0.55)';
const LABEL_FONT = '600 11px system-ui, sans-serif';

/** The fit window (or the span being dragged) in chart x, shaded over both panels; `range` null for none. */
export function windowShadePlugin(range: () => readonly [number, number] | null): Plugin<'line'> {
  return {
    id: 'declineWindow',
    beforeDatasetsDraw(chart) {
      const r = range();
      if (r === null) return;
      const { ctx, chartArea: area, scales } = chart;
      const a = scales.x.getPixelForValue(Math.min(r[0], r[1]));
      const b = scales.x.getPixelForValue(Math.max(r[0], r[1]));
      const left = Math.max(area.left, a);
      const right = Math.min(area.right, b);
      if (!(right > left)) return;
      ctx.save();
      ctx.fillStyle = WINDOW_FILL;
      ctx.fillRect(left, area.top, right - left, area.bottom - area.top);
      ctx.strokeStyle = WINDOW_EDGE;
      ctx.lineWidth = 1;
      ctx.beginPath();
      for (const px of [a, b]) {
        if (px < area.left || px > area.right) continue;
        ctx.moveTo(Math.round(px) + 0.5, area.top);
        ctx.lineTo(Math.round(px) + 0.5, area.bottom);
      }
      ctx.stroke();
      ctx.fillStyle = COLOURS.readings;
      ctx.font = LABEL_FONT;
      ctx.textBaseline = 'top';
      ctx.fillText('fit window', left + 4, area.top + 4);
      ctx.restore();
    },
  };
}

/** The economic limit's label at the right end of its line, while dataset `index` (the line) is shown. */
export function limitLabelPlugin(index: number, limit: () => { y: number; label: string } | null): Plugin<'line'> {
  return {
    id: 'declineLimitLabel',
    afterDatasetsDraw(chart) {
      const l = limit();
      const y = chart.scales.y;
      if (l === null || y === undefined || !chart.isDatasetVisible(index)) return;
      const py = y.getPixelForValue(l.y);
      if (py < y.top || py > y.bottom) return;
      const { ctx, chartArea: area } = chart;
      ctx.save();
      ctx.font = LABEL_FONT;
      ctx.fillStyle = COLOURS.limit;
      ctx.textAlign = 'right';
      ctx.textBaseline = 'bottom';
      ctx.fillText(l.label, area.right - 4, py - 3);
      ctx.restore();
    },
  };
}

/** Marks fastPointsPlugin draws for a dataset (drawn by chart.js with point radius 0). */
export interface FastMarks { index: number; scale: string; kind: 'cross' | 'square'; size: number }

/** The residuals panel: a rule between the panels and the zero line. */
export function residualPanelPlugin(scaleId: string): Plugin<'line'> {
  return {
    id: 'declineResidualPanel',
    beforeDatasetsDraw(chart) {
      const r = chart.scales[scaleId];
      if (r === undefined) return;
      const { ctx, chartArea: area } = chart;
      ctx.save();
      ctx.strokeStyle = COLOURS.muted;
      ctx.lineWidth = 1;
      ctx.beginPath();
      ctx.moveTo(area.left, Math.round(r.top) + 0.5);
      ctx.lineTo(area.right, Math.round(r.top) + 0.5);
      const py = r.getPixelForValue(0);
      if (py >= r.top && py <= r.bottom) {
        ctx.moveTo(area.left, Math.round(py) + 0.5);
        ctx.lineTo(area.right, Math.round(py) + 0.5);
      }
      ctx.stroke();
      ctx.restore();
    },
  };
}

/**
 * The excluded readings (small crosses) and the residuals (small squares), each drawn as one path
 * with one fill or stroke: chart.js would begin, fill and close a path for every point, which is
 * most of a redraw's time when thousands of decimated points are on screen.
 */
export function fastPointsPlugin(marks: readonly FastMarks[]): Plugin<'line'> {
  return {
    id: 'declineFastPoints',
    afterDatasetsDraw(chart) {
      const { ctx, chartArea: area } = chart;
      for (const m of marks) {
        const scale = chart.scales[m.scale];
        if (scale === undefined || !chart.isDatasetVisible(m.index)) continue;
        const points = chart.getDatasetMeta(m.index).data as unknown as { x: number; y: number }[];
        const colour = chart.data.datasets[m.index].borderColor as string;
        const h = m.size / 2;
        ctx.save();
        ctx.beginPath();
        ctx.rect(area.left, scale.top, area.right - area.left, scale.bottom - scale.top);
        ctx.clip();
        ctx.beginPath();
        for (const p of points) {
          if (!Number.isFinite(p.x) || !Number.isFinite(p.y)) continue;
          if (m.kind === 'square') ctx.rect(p.x - h, p.y - h, m.size, m.size);
          else {
            ctx.moveTo(p.x - h, p.y - h);
            ctx.lineTo(p.x + h, p.y + h);
            ctx.moveTo(p.x - h, p.y + h);
            ctx.lineTo(p.x + h, p.y - h);
          }
        }
        if (m.kind === 'square') {
          ctx.fillStyle = colour;
          ctx.fill();
        } else {
          ctx.strokeStyle = colour;
          ctx.lineWidth = 1.2;
          ctx.stroke();
        }
        ctx.restore();
      }
    },
  };
}

/**
 * chart.js replays the last pointer event after every update to refresh the hover, which costs a
 * second full draw after each zoom step; the hover follows the next real pointer move instead.
 */
export const noReplayPlugin: Plugin<'line'> = {
  id: 'declineNoReplay',
  beforeEvent(_chart, args) {
    if (args.replay) return false;
    return undefined;
  },
};
