import type uPlot from 'uplot';
import { resolveColor, SIGNAL_COLORS } from '../../lib/palette';
import { formatElapsedClock, formatTemperature } from '../../lib/units';

/** Chart colours that follow the theme, read from the CSS variables in styles.css. */
export function chartTheme(): { axis: string; grid: string } {
  const css = getComputedStyle(document.documentElement);
  return {
    axis: css.getPropertyValue('--kp-chart-axis').trim() || '#888',
    grid: css.getPropertyValue('--kp-chart-grid').trim() || 'rgba(128,128,128,0.15)',
  };
}

/** Axis font: numbers in JetBrains Mono like everywhere else. */
export const AXIS_FONT = '12px "JetBrains Mono", ui-monospace, monospace';

/** Run-time tick steps in seconds: whole seconds, minutes and hours a person counts in. */
export const RUN_TIME_INCREMENTS_S = [1, 2, 5, 10, 15, 30, 60, 120, 300, 600, 900, 1800, 3600, 7200, 10_800, 21_600, 43_200, 86_400];
/** Below this chart width (a phone) the y axes narrow and the temperature axis steps aside. */
export const NARROW_CHART_PX = 600;
const AXIS_SIZE_PX = 70;
const NARROW_AXIS_SIZE_PX = 62;

/**
 * Width and visibility of the y axes for a chart `widthPx` wide: three 70 px axes leave a
 * phone's chart a sliver. On a narrow chart the temperature keeps its line and legend value.
 */
export function yAxisLayout(widthPx: number): { sizePx: number; showTemperature: boolean } {
  const narrow = widthPx < NARROW_CHART_PX;
  return { sizePx: narrow ? NARROW_AXIS_SIZE_PX : AXIS_SIZE_PX, showTemperature: !narrow };
}

/** Minimum gap between run-time labels ("01:23:20" is wide). */
export const RUN_TIME_LABEL_SPACE_PX = 90;

/**
 * A y range that never zooms into meter noise: at least `minSpan` wide, centred on the data,
 * with a little headroom. (A 5 mV wobble drawn full height reads like a fault.)
 */
export function paddedRange(minSpan: number) {
  return (_u: unknown, min: number | null, max: number | null): [number, number] => {
    if (min === null || max === null || !Number.isFinite(min) || !Number.isFinite(max)) return [0, minSpan];
    const span = max - min;
    if (span < minSpan) {
      const mid = (min + max) / 2;
      return [mid - minSpan / 2, mid + minSpan / 2];
    }
    const pad = span * RANGE_PAD_FRACTION;
    return [min - pad, max + pad];
  };
}

const RANGE_PAD_FRACTION = 0.05;
/** Smallest axis spans: 1 V, 2 A, 20 W, 5 °C. */
export const MIN_SPAN = { V: 1, A: 2, W: 20, C: 5 } as const;

/** The scales every run chart shares: run time on x, then V, A, W and °C, none zoomed into noise. */
export function signalScales(): uPlot.Scales {
  return {
    x: { time: false },
    V: { range: paddedRange(MIN_SPAN.V) },
    A: { range: paddedRange(MIN_SPAN.A) },
    W: { range: paddedRange(MIN_SPAN.W) },
    C: { range: paddedRange(MIN_SPAN.C) },
  };
}

/**
 * The axes the live and history charts share: run time, volts on the left, amps and the
 * temperature on the right, each in its signal's colour and unit. A chart that draws watts
 * asks for their axis too (left, beside volts); on a phone it steps aside like the temperature.
 */
export function signalAxes(widthPx: number, temperatureUnit: 'C' | 'F', { watts = false }: { watts?: boolean } = {}): uPlot.Axis[] {
  const { axis, grid } = chartTheme();
  const axisBase = { stroke: axis, font: AXIS_FONT, grid: { stroke: grid }, ticks: { stroke: grid } };
  const { sizePx, showTemperature } = yAxisLayout(widthPx);
  return [
    { ...axisBase, incrs: RUN_TIME_INCREMENTS_S, space: RUN_TIME_LABEL_SPACE_PX, values: (_u, ticks) => ticks.map((t) => formatElapsedClock(t)) },
    { ...axisBase, scale: 'V', stroke: resolveColor(SIGNAL_COLORS.volts), values: (_u, ticks) => ticks.map((t) => `${t} V`), size: sizePx },
    { ...axisBase, scale: 'A', side: 1, grid: { show: false }, stroke: resolveColor(SIGNAL_COLORS.amps), values: (_u, ticks) => ticks.map((t) => `${t} A`), size: sizePx },
    {
      ...axisBase,
      scale: 'C',
      show: showTemperature,
      side: 1,
      grid: { show: false },
      stroke: resolveColor(SIGNAL_COLORS.temp),
      values: (_u, ticks) => ticks.map((t) => formatTemperature(t, temperatureUnit, 0)),
      size: sizePx,
    },
    ...(watts
      ? [{ ...axisBase, scale: 'W', show: showTemperature, grid: { show: false }, stroke: resolveColor(SIGNAL_COLORS.watts), values: (_u: uPlot, ticks: number[]) => ticks.map((t) => `${t} W`), size: sizePx }]
      : []),
  ];
}
