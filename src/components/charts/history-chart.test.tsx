import { render } from '@testing-library/react';
import uPlot from 'uplot';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { ReadingsResponse } from '../../../shared/schemas/api-runs';
import { HistoryChart } from './history-chart';

// uplot is replaced by the recording stand-in from tests/setup/client.ts.
type Axis = { scale?: string; size?: number; show?: boolean };
const instances = (uPlot as unknown as { instances: { data: unknown[][]; opts: { axes: Axis[] } }[] }).instances;
const col = (v: number[]) => ({ min: v, max: v });

afterEach(() => vi.restoreAllMocks());

describe('HistoryChart', () => {
  it('draws the cell temperature, as the live screens do, when the run also logged ambient', () => {
    // Ambient sorts before cell: the chart must not fall back to alphabetical order.
    const readings: ReadingsResponse = { axis: 'elapsedSeconds',
      runId: 1, from: 0, to: 2, reduced: false, bucketSeconds: null, readingsInWindow: 3,
      x: [0, 1, 2], volts: col([13.2, 13.1, 13]), amps: col([45, 45, 46]), watts: col([594, 590, 598]),
      temps: { ambient: col([23, 23, 23]), cell: col([23.4, 25.1, 28.6]) },
    };
    render(<HistoryChart readings={readings} onZoom={() => {}} />);
    const plot = instances[instances.length - 1];
    expect(plot.data[5]).toEqual([23.4, 25.1, 28.6]);
  });

  it('leaves a phone-wide chart room to draw: narrower axes, temperature axis hidden (its line stays)', () => {
    vi.spyOn(HTMLElement.prototype, 'clientWidth', 'get').mockReturnValue(358);
    const readings: ReadingsResponse = { axis: 'elapsedSeconds',
      runId: 1, from: 0, to: 1, reduced: false, bucketSeconds: null, readingsInWindow: 2,
      x: [0, 1], volts: col([13.2, 13.1]), amps: col([45, 45]), watts: col([594, 590]), temps: { cell: col([23.4, 23.5]) },
    };
    render(<HistoryChart readings={readings} onZoom={() => {}} />);
    const axes = instances[instances.length - 1].opts.axes;
    const temperature = axes.find((a) => a.scale === 'C')!;
    expect(temperature.show).toBe(false);
    expect(axes.find((a) => a.scale === 'V')!.size).toBeLessThan(70);
    expect(instances[instances.length - 1].data[5]).toEqual([23.4, 23.5]);
  });
});

describe('HistoryChart zoom', () => {
  it('keeps one uPlot instance and zooms with setData and setScale', () => {
    const whole: ReadingsResponse = { axis: 'elapsedSeconds',
      runId: 1, from: 0, to: 100, reduced: true, bucketSeconds: 50, readingsInWindow: 100,
      x: [0, 50], volts: col([13.2, 13.0]), amps: col([45, 45]), watts: col([594, 585]), temps: {},
    };
    const zoomed: ReadingsResponse = { ...whole, from: 10, to: 20, reduced: false, bucketSeconds: null, x: [10, 20] };
    const before = instances.length;
    const view = render(<HistoryChart readings={whole} onZoom={() => {}} />);
    view.rerender(<HistoryChart readings={zoomed} onZoom={() => {}} />);
    expect(instances.length).toBe(before + 1);
    const plot = instances[instances.length - 1] as unknown as { data: unknown[][]; setDataCalls: number; scaleCalls: { key: string; limits: unknown }[] };
    expect(plot.setDataCalls).toBe(1);
    expect(plot.data[0]).toEqual([10, 20]);
    expect(plot.scaleCalls).toEqual([{ key: 'x', limits: { min: 10, max: 20 } }]);
  });
});
