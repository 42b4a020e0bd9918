import { act, render } from '@testing-library/react';
import uPlot from 'uplot';
import { describe, expect, it } from 'vitest';
import type { ServerMessage } from '../../../shared/schemas/ws';
import { LiveStore } from '../../lib/live-store';
import { LiveChart } from './live-chart';

// uplot is replaced by the recording stand-in from tests/setup/client.ts.
type FakePlot = { data: unknown[][]; setDataCalls: number };
const instances = (uPlot as unknown as { instances: FakePlot[] }).instances;

const topic = { kind: 'run', id: 9 } as const;
const batch = (t: number[]): ServerMessage => ({
  type: 'batch', seq: 0, topic, dropped: 0,
  readings: { t, volts: t.map(() => 12.9), amps: t.map(() => 10), watts: t.map(() => 129), temps: {} },
});

describe('LiveChart', () => {
  it('calls setData once per animation frame however many batches arrived, with the ring buffer in order', () => {
    const frames: (() => void)[] = [];
    const store = new LiveStore((fn) => void frames.push(fn));
    render(<LiveChart store={store} />);
    const plot = instances[instances.length - 1];
    expect(plot.setDataCalls).toBe(0);
    store.handle(batch([0, 0.1]));
    store.handle(batch([0.2]));
    store.handle(batch([0.3, 0.4]));
    act(() => frames.splice(0).forEach((fn) => fn()));
    expect(plot.setDataCalls).toBe(1);
    expect(plot.data[0]).toEqual([0, 0.1, 0.2, 0.3, 0.4]);
    expect(plot.data[1]).toEqual([12.9, 12.9, 12.9, 12.9, 12.9]);
    // A frame with nothing new draws nothing.
    store.handle({ type: 'status', topic, status: { state: 'receiving', framesOk: 5, framesRejected: 0 } });
    act(() => frames.splice(0).forEach((fn) => fn()));
    expect(plot.setDataCalls).toBe(1);
  });
});

describe('LiveChart axes', () => {
  it('gives the watts line an axis of its own, in watts', () => {
    const store = new LiveStore(() => undefined);
    render(<LiveChart store={store} />);
    const opts = (instances[instances.length - 1] as unknown as { opts: { series: { scale?: string }[]; axes: { scale?: string; values?: (u: unknown, t: number[]) => string[] }[] } }).opts;
    expect(opts.series.some((s) => s.scale === 'W')).toBe(true);
    const watts = opts.axes.find((a) => a.scale === 'W');
    expect(watts?.values?.(null, [100, 200])).toEqual(['100 W', '200 W']);
  });
});
