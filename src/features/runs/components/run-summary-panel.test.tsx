import { render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { createRunPipeline } from '../../../../shared/measure/run-pipeline';
import { summarizeRun } from '../../../../shared/measure/summarize-run';
import type { Frame } from '../../../../shared/schemas/frame';
import type { RunSummary } from '../../../../shared/schemas/run-summary';
import { RunSummaryPanel } from './run-summary-panel';

// Summaries made by the real measurement core from synthetic traces with analytic answers.
const PACK = { chemistry: 'lfp', cellsInSeries: 8, endVoltsPerCell: 2.5, ratedAh: 50, ratedWh: 1280 } as const; // 20 V end

function summaryOf(frames: Frame[], ended = true): RunSummary {
  const p = createRunPipeline(PACK);
  const { events } = p.pushMany(frames);
  return summarizeRun({ snapshot: p.snapshot(), events, ended });
}

/** 10 A at 1 Hz; volts linear in Ah, crossing 20 V at `crossAh`; the load runs on to `endAh`. */
function runOn(crossAh: number, endAh: number, tempCelsius = 23): Frame[] {
  const out: Frame[] = [];
  for (let t = 0; (10 * t) / 3600 <= endAh; t++) out.push({ t, volts: 25 - (5 * ((10 * t) / 3600)) / crossAh, amps: 10, temps: { cell: tempCelsius }, clock: 'device' });
  return out;
}

const tile = (label: string) => screen.getByText(label).closest('div')!;
const show = (s: RunSummary) => render(<RunSummaryPanel summary={s} temperatureUnit="C" energyUnit="Wh" currency="EUR" />);

describe('run summary panel: uncertainty', () => {
  it('shows the expanded uncertainty and a borderline verdict when the margin lies inside it', () => {
    // 10 A crossing 20 V at 50.1 Ah: 100.2 % of 50 Ah. Meter ±(0.2 % + 0.2 A): offset term alone
    // 0.2 A × 5.01 h / √3 = 0.578 Ah (JCGM 100 4.3.7), so U > 1.1 Ah > the 0.1 Ah margin.
    const p = createRunPipeline(PACK);
    const { events } = p.pushMany(runOn(50.1, 50.2));
    const meterAccuracy = { voltsGainPercent: 0.1, voltsOffsetVolts: 0.01, ampsGainPercent: 0.2, ampsOffsetAmps: 0.2 };
    show(summarizeRun({ snapshot: p.snapshot(), events, meterAccuracy }));
    expect(screen.getByText('Borderline')).toBeTruthy();
    expect(screen.getByLabelText('Uncertainty').textContent).toMatch(/JCGM 100/);
  });
});

describe('run summary panel: every number says what it is', () => {
  it('capacity to the end voltage and whole-run totals are separate tiles; the verdict line names its basis', () => {
    // The figures: 36.04 Ah at the end voltage (72.0 % of 50 Ah shown, rounded down), 41.94 Ah out in the whole run.
    show(summaryOf(runOn(36.04, 41.94)));
    expect(within(tile('Capacity to the end voltage')).getByText(/^36\.0/).textContent).toMatch(/Ah/);
    expect(within(tile('Out, whole run')).getByText(/^41\.9/)).toBeTruthy();
    expect(screen.getByText('Fail')).toBeTruthy();
    expect(screen.getByText('72.0 %').parentElement!.textContent).toMatch(/capacity to the end voltage/);
  });

  it('99.99 % of rated is shown as 99.9 % beside Fail, never 100.0 %', () => {
    show(summaryOf(runOn(49.995, 50.2)));
    expect(screen.getByText('Fail')).toBeTruthy();
    expect(screen.getByText('99.9 %')).toBeTruthy();
    expect(screen.queryByText('100.0 %')).toBeNull();
  });

  it('stopped before the end voltage: Incomplete with the reason, no capacity figure', () => {
    show(summaryOf(runOn(50, 20)));
    expect(screen.getByText('Incomplete')).toBeTruthy();
    expect(screen.getByText(/Stopped before the end voltage/)).toBeTruthy();
    expect(within(tile('Capacity')).getByText('—')).toBeTruthy();
  });

  it('states the test rate and temperature beside the verdict, and flags them outside IEC 61960-3', () => {
    show(summaryOf(runOn(36.04, 41.94, 31)));
    const conditions = screen.getByLabelText('Test conditions');
    expect(conditions.textContent).toMatch(/0\.20 C/); // 10 A ÷ 50 Ah
    expect(conditions.textContent).toMatch(/31\.0 °C under load, outside the 15\.0 °C to 25\.0 °C of IEC 61960-3/);
  });
});

describe('RunSummaryPanel currency', () => {
  it('shows the price per kWh with its currency', () => {
    // Demo figures: a 12 V pack on 25 A for an hour delivers 305 Wh (12.2 V × 25 A × 1 h, P = V·I);
    // no end voltage, so the ended run's capacity is its whole discharge.
    const pipeline = createRunPipeline({ ratedAh: 100 });
    const frames = Array.from({ length: 3601 }, (_, t) => ({ t, volts: 12.2, amps: 25, clock: 'device' as const }));
    const events = pipeline.pushMany(frames).events;
    const summary = summarizeRun({ snapshot: pipeline.snapshot(), events, price: 95 });
    render(<RunSummaryPanel summary={summary} temperatureUnit="C" energyUnit="Wh" currency="GBP" />);
    // 95 ÷ 0.305 kWh = 311.48 per kWh.
    const figure = screen.getByText('Price per kWh').parentElement!;
    expect(figure.textContent).toContain('311.48 GBP');
  });
});
