import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { resolveColor, SIGNAL_COLORS } from '../../lib/palette';
import { formatAmps, formatElapsedClock, formatTemperature, formatVolts, formatWatts } from '../../lib/units';
import type { LiveStore } from '../../lib/live-store';
import { useTheme } from '../../lib/use-theme';
import { signalAxes, signalScales } from './chart-theme';
import { useChartWidth } from './use-chart-size';

const LINE_WIDTH_PX = 2;

function buildOptions(width: number, heightPx: number, temperatureUnit: 'C' | 'F'): uPlot.Options {
  return {
    width,
    height: heightPx,
    cursor: { drag: { x: false, y: false } },
    scales: signalScales(),
    series: [
      { label: 'Run time', value: (_u, v) => formatElapsedClock(v) },
      { label: 'Volts', scale: 'V', stroke: resolveColor(SIGNAL_COLORS.volts), width: LINE_WIDTH_PX, points: { show: false }, value: (_u, v) => formatVolts(v) },
      { label: 'Amps', scale: 'A', stroke: resolveColor(SIGNAL_COLORS.amps), width: LINE_WIDTH_PX, points: { show: false }, value: (_u, v) => formatAmps(v) },
      { label: 'Watts', scale: 'W', stroke: resolveColor(SIGNAL_COLORS.watts), width: 1, points: { show: false }, value: (_u, v) => formatWatts(v) },
      { label: 'Temperature', scale: 'C', stroke: resolveColor(SIGNAL_COLORS.temp), width: 1, dash: [6, 4], points: { show: false }, value: (_u, v) => formatTemperature(v, temperatureUnit) },
    ],
    axes: signalAxes(width, temperatureUnit, { watts: true }),
  };
}

/**
 * The streaming chart. uPlot is created once and fed from the store's ring buffer, outside
 * React: setData runs from the store's notification, which fires at most once per frame.
 */
export function LiveChart({ store, heightPx = 320, temperatureUnit = 'C' }: { store: LiveStore; heightPx?: number; temperatureUnit?: 'C' | 'F' }) {
  const containerRef = useRef<HTMLDivElement>(null);
  const plotRef = useRef<uPlot | null>(null);
  const width = useChartWidth(containerRef);
  const { theme } = useTheme();

  useEffect(() => {
    const el = containerRef.current;
    if (!el) return;
    // Reusable column arrays: a steady stream allocates nothing per frame.
    const columns: (number | null)[][] = Array.from({ length: store.buffer.columnCount }, () => []);
    const toData = () => {
      store.buffer.copyOrdered(columns);
      return columns as uPlot.AlignedData;
    };
    const plot = new uPlot(buildOptions(el.clientWidth || width, heightPx, temperatureUnit), toData(), el);
    plotRef.current = plot;
    let drawnVersion = store.getSnapshot().dataVersion;
    const unsubscribe = store.subscribe(() => {
      const version = store.getSnapshot().dataVersion;
      if (version === drawnVersion) return;
      drawnVersion = version;
      plot.setData(toData());
    });
    return () => {
      unsubscribe();
      plot.destroy();
      plotRef.current = null;
    };
    // Width changes are handled by setSize below; rebuilding would drop the zoom state.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [store, heightPx, theme, temperatureUnit]);

  useEffect(() => {
    plotRef.current?.setSize({ width, height: heightPx });
  }, [width, heightPx]);

  return <div ref={containerRef} className="live-chart w-full" data-testid="live-chart" />;
}
