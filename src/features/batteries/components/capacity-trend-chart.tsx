import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import type { CapacityPoint } from '../../../../shared/measure/capacity-trend';
import { AXIS_FONT, chartTheme } from '../../../components/charts/chart-theme';
import { useChartWidth } from '../../../components/charts/use-chart-size';
import { usePrinting } from '../../../components/charts/use-printing';
import { resolveColor, SIGNAL_COLORS } from '../../../lib/palette';
import { formatPercent } from '../../../lib/units';
import { useTheme } from '../../../lib/use-theme';

const HEIGHT_PX = 280;
const PERCENT_AXIS_PX = 64;
/** The y axis always shows 0 to at least 110 %: a pack at 98 % must not look like a cliff. */
const MIN_TOP_PERCENT = 110;
const TOP_HEADROOM_PERCENT = 5;
const POINT_SIZE_PX = 8;

/**
 * State of health run by run: delivered Ah and Wh as a percentage of the pack's rating, one
 * point per finished capacity test, in the order they were run (x = test number).
 */
export function CapacityTrendChart({ points }: { points: readonly CapacityPoint[] }) {
  const containerRef = useRef<HTMLDivElement>(null);
  const plotRef = useRef<uPlot | null>(null);
  const width = useChartWidth(containerRef);
  const { theme } = useTheme();
  const printing = usePrinting();

  useEffect(() => {
    const el = containerRef.current;
    if (!el || points.length === 0) return;
    const { axis, grid } = chartTheme();
    const axisBase = { stroke: axis, font: AXIS_FONT, grid: { stroke: grid }, ticks: { stroke: grid } };
    const x = points.map((_p, i) => i + 1);
    const data: uPlot.AlignedData = [x, points.map((p) => p.percentRatedAh), points.map((p) => p.percentRatedWh)];
    const top = Math.max(MIN_TOP_PERCENT, ...points.flatMap((p) => [p.percentRatedAh ?? 0, p.percentRatedWh ?? 0]).map((v) => v + TOP_HEADROOM_PERCENT));
    // Canvas cannot read CSS variables: the palette's colours are resolved for the current look.
    const series = (label: string, color: string): uPlot.Series => {
      const stroke = resolveColor(color);
      return {
        label, scale: '%', stroke, width: 2, spanGaps: true, points: { show: true, size: POINT_SIZE_PX, fill: stroke },
        value: (_u, v) => formatPercent(v),
      };
    };
    const plot = new uPlot(
      {
        width: el.clientWidth || width,
        height: HEIGHT_PX,
        scales: { x: { time: false, range: [0.5, points.length + 0.5] }, '%': { range: [0, top] } },
        series: [
          { label: 'Test', value: (_u, v) => (v === null ? '—' : `#${v} ${points[v - 1]?.runName ?? ''}`) },
          series('Ah of rated', SIGNAL_COLORS.amps),
          series('Wh of rated', SIGNAL_COLORS.watts),
        ],
        axes: [
          { ...axisBase, incrs: [1, 2, 5, 10, 20, 50, 100], values: (_u, ticks) => ticks.map((t) => (Number.isInteger(t) ? `#${t}` : '')) },
          { ...axisBase, scale: '%', size: PERCENT_AXIS_PX, values: (_u, ticks) => ticks.map((t) => `${t} %`) },
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
  }, [points, theme, printing]);

  useEffect(() => {
    plotRef.current?.setSize({ width, height: HEIGHT_PX });
  }, [width]);

  return <div ref={containerRef} className="w-full min-w-0" data-testid="capacity-trend-chart" />;
}
