import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { createRunPipeline } from '../../../../shared/measure/run-pipeline';
import { summarizeRun } from '../../../../shared/measure/summarize-run';
import { RunSummaryPanel } from './run-summary-panel';

describe('RunSummaryPanel', () => {
  it('shows the price per kWh with its currency', () => {
    // Demo figures: a 12 V pack on 25 A for an hour delivers 305 Wh (12.2 V × 25 A × 1 h, P = V·I).
    const pipeline = createRunPipeline({ chemistry: 'lead-acid', cellsInSeries: 6, endVolts: 10.5, ratedAh: 100 });
    const frames = Array.from({ length: 3601 }, (_, t) => ({ t, volts: 12.2, amps: 25, clock: 'device' as const }));
    const events = pipeline.pushMany(frames).events;
    const summary = summarizeRun({ snapshot: pipeline.snapshot(), events, price: 95 });
    render(<RunSummaryPanel summary={summary} temperatureUnit="C" energyUnit="Wh" currency="GBP" />);
    // 95 ÷ 0.305 kWh = 311.48 per kWh.
    const figure = screen.getByText('Price per kWh').parentElement!;
    expect(figure.textContent).toContain('311.48 GBP');
  });
});
