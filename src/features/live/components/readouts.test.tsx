import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { LiveStore } from '../../../lib/live-store';
import { Readouts } from './readouts';

function viewAfter(columns: Parameters<LiveStore['handle']>[0]) {
  const store = new LiveStore((fn) => fn());
  store.handle(columns);
  return store.getSnapshot();
}

const topic = { kind: 'run', id: 4 } as const;

describe('readouts', () => {
  it('shows every number with its unit, in the lab units', () => {
    // Demo reading of a fictional 8S LFP pack at 0.2 C.
    const view = viewAfter({
      type: 'batch', seq: 2, topic, dropped: 0,
      readings: {
        t: [3599, 3600], volts: [25.61, 25.6], amps: [20, 20.004], watts: [512.2, 512.1],
        temps: { cell: [24.9, 25] }, dischargeWh: [511.9, 512.05], dischargeAh: [19.99, 20.0],
      },
    });
    render(<Readouts view={view} temperatureUnit="F" energyUnit="Wh" />);
    const pair = (label: string) => {
      const value = screen.getByTestId(`big-${label}`);
      return `${value.textContent} ${value.nextElementSibling?.textContent}`;
    };
    expect(pair('volts')).toBe('25.60 V');
    expect(pair('amps')).toBe('20.00 A');
    expect(pair('watts')).toBe('512.1 W');
    // 25 °C = 77 °F (the Fahrenheit definition: °F = °C × 9/5 + 32).
    expect(pair('temp-cell')).toBe('77.0 °F');
    expect(pair('energy-out')).toBe('512.1 Wh');
    expect(pair('charge-out')).toBe('20.00 Ah');
    expect(pair('run-time')).toBe('01:00:00 h:m:s');
  });

  it('keeps the unit beside a dash when nothing has arrived', () => {
    render(<Readouts view={new LiveStore().getSnapshot()} temperatureUnit="C" energyUnit="kWh" />);
    const volts = screen.getByTestId('big-volts');
    expect(volts.textContent).toBe('—');
    expect(volts.nextElementSibling?.textContent).toBe('V');
    expect(screen.getByTestId('big-energy-out').nextElementSibling?.textContent).toBe('kWh');
  });
});
