import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { COMPARE_COLORS, resolveColor } from '../../lib/palette';
import { formatElapsedClock, formatVolts } from '../../lib/units';
import { useTheme } from '../../lib/use-theme';
import { usePrinting } from './use-printing';
import { AXIS_FONT, chartTheme, MIN_SPAN, paddedRange, RUN_TIME_INCREMENTS_S, RUN_TIME_LABEL_SPACE_PX } from './chart-theme';
import { useChartWidth } from './use-chart-size';

/** One run's voltage curve: run time in seconds and volts (null = gap). */
export interface CompareSeries {
  label: string;
  t: number[];
  volts: (number | null)[];
}

/** Several runs' voltage against run time on one chart, aligned with uPlot.join. */
export function CompareChart({ series, heightPx = 380 }: { series: readonly CompareSeries[]; heightPx?: number }) {
  const containerRef = useRef<HTMLDivElement>(null);
  const plotRef = useRef<uPlot | null>(null);
  const width = useChartWidth(containerRef);
  const { theme } = useTheme();
  const printing = usePrinting();

  useEffect(() => {
    const el = containerRef.current;
    if (!el || series.length === 0) return;
    const { axis, grid } = chartTheme();
    const axisBase = { stroke: axis, font: AXIS_FONT, grid: { stroke: grid }, ticks: { stroke: grid } };
    const data = uPlot.join(series.map((s) => [s.t, s.volts] as uPlot.AlignedData));
    const plot = new uPlot(
      {
        width: el.clientWidth || width,
        height: heightPx,
        scales: { x: { time: false }, V: { range: paddedRange(MIN_SPAN.V) } },
        series: [
          { label: 'Run time', value: (_u, v) => formatElapsedClock(v) },
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
          { ...axisBase, incrs: RUN_TIME_INCREMENTS_S, space: RUN_TIME_LABEL_SPACE_PX, values: (_u, ticks) => ticks.map((t) => formatElapsedClock(t)) },
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
  }, [series, heightPx, theme, printing]);

  useEffect(() => {
    plotRef.current?.setSize({ width, height: heightPx });
  }, [width, heightPx]);

  return <div ref={containerRef} className="w-full" data-testid="compare-chart" />;
}
