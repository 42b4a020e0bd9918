import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { AXIS_FONT, chartTheme } from '../../../components/charts/chart-theme';
import { useChartWidth } from '../../../components/charts/use-chart-size';
import { COMPARE_COLORS, resolveColor } from '../../../lib/palette';
import { formatVolts } from '../../../lib/units';
import { useTheme } from '../../../lib/use-theme';

/** Chart height, px: a secondary chart, lower than the run's own. */
const CHART_HEIGHT_PX = 260;
/** Digits of dQ/dV shown in the legend. */
const DQDV_DECIMALS = 1;

/** dQ/dV (Ah per volt) against terminal volts, with the volts axis falling left to right as the discharge does. */
export function IncrementalCapacityChart({ volts, dQdV }: { volts: readonly number[]; dQdV: readonly number[] }) {
  const containerRef = useRef<HTMLDivElement>(null);
  const width = useChartWidth(containerRef);
  const { theme } = useTheme();

  useEffect(() => {
    const el = containerRef.current;
    if (!el || volts.length === 0) return;
    const { axis, grid } = chartTheme();
    const axisBase = { stroke: axis, font: AXIS_FONT, grid: { stroke: grid }, ticks: { stroke: grid } };
    // uPlot wants x ascending: the bins come from the highest volts down.
    const order = volts.map((_, i) => i).sort((a, b) => volts[a]! - volts[b]!);
    const data: uPlot.AlignedData = [order.map((i) => volts[i]!), order.map((i) => dQdV[i]!)];
    const plot = new uPlot(
      {
        width: el.clientWidth || width,
        height: CHART_HEIGHT_PX,
        scales: { x: { time: false, dir: -1 } },
        series: [
          { label: 'Volts', value: (_u, v) => formatVolts(v, 3) },
          { label: 'dQ/dV', stroke: resolveColor(COMPARE_COLORS[0]!), width: 2, points: { show: false }, value: (_u, v) => (v === null ? '–' : `${v.toFixed(DQDV_DECIMALS)} Ah/V`) },
        ],
        axes: [
          { ...axisBase, values: (_u, ticks) => ticks.map((t) => `${t} V`) },
          { ...axisBase, values: (_u, ticks) => ticks.map((t) => `${t}`), label: 'Ah/V', size: 60 },
        ],
      },
      data,
      el,
    );
    return () => plot.destroy();
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [volts, dQdV, theme]);

  return <div ref={containerRef} className="w-full" data-testid="ic-chart" />;
}
