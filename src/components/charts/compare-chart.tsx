import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { COMPARE_COLORS, NOTE_COLOR, resolveColor } from '../../lib/palette';
import { formatCharge, formatElapsedClock, formatEnergy, formatPercent, formatVolts } from '../../lib/units';
import { useTheme } from '../../lib/use-theme';
import { usePrinting } from './use-printing';
import { AXIS_FONT, chartTheme, MIN_SPAN, paddedRange, RUN_TIME_INCREMENTS_S, RUN_TIME_LABEL_SPACE_PX } from './chart-theme';
import { useChartWidth } from './use-chart-size';

/** One run's voltage curve: x on the chart's axis (run seconds, Ah, Wh or %) and volts (null = gap). */
export interface CompareSeries {
  label: string;
  x: number[];
  volts: (number | null)[];
}

/** What the x axis shows: run time, delivered Ah, delivered Wh or % of rated Ah. */
export type CompareAxis = 'time' | 'ah' | 'wh' | 'percent';

/** The x axis's name and how one value on it reads. */
export const COMPARE_AXES: Record<CompareAxis, { label: string; format: (x: number | null) => string }> = {
  time: { label: 'Run time', format: (x) => formatElapsedClock(x) },
  ah: { label: 'Delivered', format: (x) => formatCharge(x) },
  wh: { label: 'Delivered', format: (x) => formatEnergy(x) },
  percent: { label: 'Of rated', format: (x) => formatPercent(x, 0) },
};

/** Marker line width, px. */
const MARKER_WIDTH_PX = 2;

/** Draws a dashed vertical line at each rating on the x axis (rated Ah, rated Wh or 100 %). */
function ratingMarkers(xs: readonly number[], color: string): uPlot.Plugin {
  return {
    hooks: {
      draw: (u) => {
        const ctx = u.ctx;
        ctx.save();
        ctx.strokeStyle = color;
        ctx.lineWidth = MARKER_WIDTH_PX * devicePixelRatio;
        ctx.setLineDash([6 * devicePixelRatio, 4 * devicePixelRatio]);
        for (const x of xs) {
          const px = u.valToPos(x, 'x', true);
          if (!Number.isFinite(px)) continue;
          ctx.beginPath();
          ctx.moveTo(px, u.bbox.top);
          ctx.lineTo(px, u.bbox.top + u.bbox.height);
          ctx.stroke();
        }
        ctx.restore();
      },
    },
  };
}

/**
 * Several runs' voltage on one chart, aligned with uPlot.join, against run time or the
 * delivered Ah, Wh or % of rated; `markers` are x positions of ratings drawn as dashed lines.
 */
export function CompareChart({ series, axis = 'time', markers = [], heightPx = 380 }: { series: readonly CompareSeries[]; axis?: CompareAxis; markers?: readonly number[]; heightPx?: number }) {
  const containerRef = useRef<HTMLDivElement>(null);
  const plotRef = useRef<uPlot | null>(null);
  const width = useChartWidth(containerRef);
  const { theme } = useTheme();
  const printing = usePrinting();

  useEffect(() => {
    const el = containerRef.current;
    if (!el || series.length === 0) return;
    const { axis: axisInk, grid } = chartTheme();
    const axisBase = { stroke: axisInk, font: AXIS_FONT, grid: { stroke: grid }, ticks: { stroke: grid } };
    const data = uPlot.join(series.map((s) => [s.x, s.volts] as uPlot.AlignedData));
    const plot = new uPlot(
      {
        width: el.clientWidth || width,
        height: heightPx,
        scales: {
          // The x range reaches every rating marker, so a pack that fell short shows how short.
          x: { time: false, range: (_u, lo, hi) => [Math.min(lo, ...markers), Math.max(hi, ...markers)] },
          V: { range: paddedRange(MIN_SPAN.V) },
        },
        plugins: markers.length ? [ratingMarkers(markers, resolveColor(NOTE_COLOR))] : [],
        series: [
          { label: COMPARE_AXES[axis].label, value: (_u, v) => COMPARE_AXES[axis].format(v) },
          ...series.map((s, i) => ({
            label: s.label,
            scale: 'V',
            stroke: resolveColor(COMPARE_COLORS[i % COMPARE_COLORS.length]),
            width: 2,
            spanGaps: false,
            points: { show: false },
            value: (_u: uPlot, v: number | null) => formatVolts(v),
          })),
        ],
        axes: [
          axis === 'time'
            ? { ...axisBase, incrs: RUN_TIME_INCREMENTS_S, space: RUN_TIME_LABEL_SPACE_PX, values: (_u, ticks) => ticks.map((t) => formatElapsedClock(t)) }
            : { ...axisBase, values: (_u, ticks) => ticks.map((t) => COMPARE_AXES[axis].format(t)) },
          { ...axisBase, scale: 'V', values: (_u, ticks) => ticks.map((t) => `${t} V`), size: 70 },
        ],
      },
      data,
      el,
    );
    plotRef.current = plot;
    return () => {
      plot.destroy();
      plotRef.current = null;
    };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [series, axis, markers, heightPx, theme, printing]);

  useEffect(() => {
    plotRef.current?.setSize({ width, height: heightPx });
  }, [width, heightPx]);

  return <div ref={containerRef} className="w-full" data-testid="compare-chart" />;
}
