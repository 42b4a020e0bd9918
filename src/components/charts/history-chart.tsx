import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import type { ReadingsResponse } from '../../../shared/schemas/api-runs';
import { pickTempChannel } from '../../lib/live-view';
import { resolveColor, SIGNAL_COLORS } from '../../lib/palette';
import { formatAmps, formatElapsedClock, formatTemperature, formatVolts } from '../../lib/units';
import { useTheme } from '../../lib/use-theme';
import { signalAxes, signalScales } from './chart-theme';
import { useChartWidth } from './use-chart-size';
import { usePrinting } from './use-printing';

/** A vertical line on the chart at a run time (cutoff, recovery, a note). */
export interface ChartMarker {
  /** Run time, s. */
  elapsedSeconds: number;
  color: string;
}

const BAND_ALPHA_HEX = '33';
const MARKER_WIDTH_PX = 2;
const NO_MARKERS: readonly ChartMarker[] = [];

/** The chart's columns; the temperature is the same channel the live screens show (the cell when there is one). */
function toData(s: ReadingsResponse): uPlot.AlignedData {
  const tempName = pickTempChannel(s.temps);
  const temp = tempName ? s.temps[tempName].max : s.x.map(() => null);
  return [s.x, s.volts.max, s.volts.min, s.amps.max, s.amps.min, temp];
}

function buildOptions(width: number, heightPx: number, temperatureUnit: 'C' | 'F', markers: () => readonly ChartMarker[], onZoom: (from: number, to: number) => void): uPlot.Options {
  return {
    width,
    height: heightPx,
    scales: signalScales(),
    // Dragging selects a window; we fetch that window again at finer resolution.
    cursor: { drag: { x: true, y: false, setScale: false } },
    series: [
      { label: 'Run time', value: (_u, v) => formatElapsedClock(v) },
      { label: 'Volts max', scale: 'V', stroke: resolveColor(SIGNAL_COLORS.volts), width: 2, value: (_u, v) => formatVolts(v) },
      { label: 'Volts min', scale: 'V', stroke: resolveColor(SIGNAL_COLORS.volts), width: 1, value: (_u, v) => formatVolts(v) },
      { label: 'Amps max', scale: 'A', stroke: resolveColor(SIGNAL_COLORS.amps), width: 2, value: (_u, v) => formatAmps(v) },
      { label: 'Amps min', scale: 'A', stroke: resolveColor(SIGNAL_COLORS.amps), width: 1, value: (_u, v) => formatAmps(v) },
      { label: 'Temperature', scale: 'C', stroke: resolveColor(SIGNAL_COLORS.temp), width: 1, dash: [6, 4], points: { show: false }, value: (_u, v) => formatTemperature(v, temperatureUnit) },
    ],
    // Min/max bands: a spike or a cutoff inside a bucket is never averaged away.
    bands: [
      { series: [1, 2], fill: resolveColor(SIGNAL_COLORS.volts) + BAND_ALPHA_HEX },
      { series: [3, 4], fill: resolveColor(SIGNAL_COLORS.amps) + BAND_ALPHA_HEX },
    ],
    axes: signalAxes(width, temperatureUnit),
    hooks: {
      setSelect: [
        (u) => {
          if (u.select.width < 2) return;
          const from = u.posToVal(u.select.left, 'x');
          const to = u.posToVal(u.select.left + u.select.width, 'x');
          u.setSelect({ left: 0, top: 0, width: 0, height: 0 }, false);
          onZoom(from, to);
        },
      ],
      draw: [
        (u) => {
          const { ctx, bbox } = u;
          ctx.save();
          ctx.lineWidth = MARKER_WIDTH_PX * devicePixelRatio;
          for (const m of markers()) {
            const x = Math.round(u.valToPos(m.elapsedSeconds, 'x', true));
            if (x < bbox.left || x > bbox.left + bbox.width) continue;
            ctx.strokeStyle = resolveColor(m.color);
            ctx.beginPath();
            ctx.moveTo(x, bbox.top);
            ctx.lineTo(x, bbox.top + bbox.height);
            ctx.stroke();
          }
          ctx.restore();
        },
      ],
    },
  };
}

interface Props {
  readings: ReadingsResponse;
  markers?: readonly ChartMarker[];
  onZoom: (from: number, to: number) => void;
  heightPx?: number;
  temperatureUnit?: 'C' | 'F';
}

/** A run's history from min/max buckets; drag across it to zoom (the page fetches again). */
export function HistoryChart({ readings, markers = NO_MARKERS, onZoom, heightPx = 360, temperatureUnit = 'C' }: Props) {
  const containerRef = useRef<HTMLDivElement>(null);
  const plotRef = useRef<uPlot | null>(null);
  const zoomRef = useRef(onZoom);
  const width = useChartWidth(containerRef);
  const { theme } = useTheme();
  // Printing redraws the chart in the report's colours (the canvas does not follow CSS).
  const printing = usePrinting();

  const markersRef = useRef(markers);
  const readingsRef = useRef(readings);

  useEffect(() => {
    zoomRef.current = onZoom;
  });

  // One uPlot for the chart's life; only what its options hold (height, colours, unit, print)
  // builds it again. A zoom or new markers reuse it (below).
  useEffect(() => {
    const el = containerRef.current;
    if (!el) return;
    const plot = new uPlot(
      buildOptions(el.clientWidth || width, heightPx, temperatureUnit, () => markersRef.current, (from, to) => zoomRef.current(from, to)),
      toData(readingsRef.current),
      el,
    );
    plotRef.current = plot;
    return () => {
      plot.destroy();
      plotRef.current = null;
    };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [heightPx, theme, temperatureUnit, printing]);

  // A zoomed window arrives as new readings: swap the data in and set the x scale to the window.
  useEffect(() => {
    if (readingsRef.current === readings) return;
    readingsRef.current = readings;
    const plot = plotRef.current;
    if (!plot) return;
    plot.setData(toData(readings), false);
    plot.setScale('x', { min: readings.from, max: readings.to });
  }, [readings]);

  useEffect(() => {
    if (markersRef.current === markers) return;
    markersRef.current = markers;
    plotRef.current?.redraw(false);
  }, [markers]);

  useEffect(() => {
    plotRef.current?.setSize({ width, height: heightPx });
  }, [width, heightPx]);

  return <div ref={containerRef} className="w-full" data-testid="history-chart" />;
}
