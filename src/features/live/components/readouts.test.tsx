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
        elapsedSeconds: [3599, 3600], volts: [25.61, 25.6], amps: [20, 20.004], watts: [512.2, 512.1],
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

describe('readouts on a charge run', () => {
  it('counts what goes in as the main totals', () => {
    const store = new LiveStore((fn) => fn());
    const topic = { kind: 'run', id: 5 } as const;
    const now = '2026-12-01T20:00:00Z';
    store.handle({
      type: 'snapshot', stream: 's1', seq: 1, resume: 'fresh', topic, status: null, events: [],
      run: {
        id: 5, name: 'Kestrel cold charge', tags: [], origin: 'live', benchId: 2, batteryId: 3, kind: 'charge', state: 'recording',
        endVolts: null, acceptancePercent: 95, alarms: { onCutoff: true }, stopWhen: 'manual', targetAh: null, targetWh: null,
        afterRecoverySeconds: 0, readingsCount: 2, summary: null, startedAt: now, endedAt: now, createdBy: 1, createdAt: now, updatedAt: now,
      },
      // Demo charge at -10 A into a 25.6 V pack.
      recent: { elapsedSeconds: [0, 360], volts: [26.1, 26.4], amps: [-10, -10], watts: [-261, -264], temps: {}, dischargeWh: [0, 0], dischargeAh: [0, 0], chargeWh: [0, 26.3], chargeAh: [0, 1] },
    });
    render(<Readouts view={store.getSnapshot()} temperatureUnit="C" energyUnit="Wh" />);
    expect(screen.getByText('Energy in')).toBeTruthy();
    expect(screen.getByTestId('big-energy-in').textContent).toBe('26.3');
    expect(screen.getByTestId('big-charge-in').textContent).toBe('1.00');
    expect(screen.getByText('Amps (charging)')).toBeTruthy();
    // The running totals say they are the whole run's, not the capacity the verdict uses.
    expect(screen.getByText(/Totals of the whole run/)).toBeTruthy();
  });

  it('shows no totals and no run time on a bench with no run', () => {
    const view = viewAfter({
      type: 'batch', seq: 3, topic: { kind: 'bench', id: 1 }, dropped: 0,
      readings: { t: [26040], volts: [13.19], amps: [45.5], watts: [600], temps: {} },
    });
    render(<Readouts view={view} temperatureUnit="C" energyUnit="Wh" totals={false} />);
    expect(screen.getByTestId('big-volts').textContent).toBe('13.19');
    expect(screen.queryByTestId('big-run-time')).toBeNull();
    expect(screen.queryByTestId('big-energy-out')).toBeNull();
  });
});
