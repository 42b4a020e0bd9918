import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { ratedWhOf } from '../../lib/use-end-estimate';
import { EndEstimateLine } from './end-estimate';

describe('EndEstimateLine', () => {
  it('shows the time to the end voltage and % of rated when both are known', () => {
    render(<EndEstimateLine estimate={{ secondsToEnd: 5400, percentOfRated: 10 }} />);
    expect(screen.getByTestId('end-estimate').textContent).toBe('about 1 h 30 min to the end voltage · 10 % of rated so far');
  });

  it('shows only what can be estimated, and nothing when neither can', () => {
    const { container, rerender } = render(<EndEstimateLine estimate={{ secondsToEnd: null, percentOfRated: 42.4 }} />);
    expect(screen.getByTestId('end-estimate').textContent).toBe('42 % of rated so far');
    rerender(<EndEstimateLine estimate={{ secondsToEnd: null, percentOfRated: null }} />);
    expect(container.textContent).toBe('');
  });
});

describe('ratedWhOf', () => {
  it('takes the stated Wh, else rated Ah × nominal volts, else nothing', () => {
    expect(ratedWhOf({ ratedWh: 1300, ratedAh: 100, chemistry: 'lfp', cellsInSeries: 4 })).toBe(1300);
    // LFP 3.2 V per cell (common practice) × 4 cells × 100 Ah = 1280 Wh.
    expect(ratedWhOf({ ratedWh: null, ratedAh: 100, chemistry: 'lfp', cellsInSeries: 4 })).toBeCloseTo(1280, 9);
    expect(ratedWhOf({ ratedWh: null, ratedAh: 100, chemistry: 'lco', cellsInSeries: 4 })).toBeNull();
    expect(ratedWhOf(undefined)).toBeNull();
  });
});
