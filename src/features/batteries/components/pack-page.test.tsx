import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import uPlot from 'uplot';
import { describe, expect, it } from 'vitest';
import type { Battery } from '../../../../shared/schemas/battery';
import type { InspectionResponse } from '../../../../shared/schemas/inspection';
import { finishedRun, summaryDelivering } from '../../../../tests/fixtures/run-fixtures';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

const now = '2026-12-01T20:00:00Z';
// A fictional pack of the demo lab (invented figures).
const pack: Battery = {
  id: 4, label: 'NG-0142', brand: 'Harlow Storage', model: 'Wall 5', chemistry: 'lfp', cellsInSeries: 16, cellsInParallel: 1,
  ratedAh: 100, ratedWh: 5120, bmsRatedAmps: 100, massKg: 44, price: 1480, priceCurrency: 'EUR', serialNumber: 'HS-W5-0142',
  sender: 'Brookside Installers', notes: 'Arrived with a dented corner', receivedOn: '2026-11-28', owner: 'Canal Street Solar',
  lengthMm: 480, widthMm: 410, heightMm: 190, terminalType: 'M8 studs', statedCycleLife: 6000, warrantyMonths: 120,
  protectionSpecs: [], createdAt: now, updatedAt: now,
};
const runs = [
  finishedRun(12, '2026-11-30T08:00:00Z', { ...summaryDelivering(96, 4915), verdict: 'fail', percentRatedAh: 96 }, { batteryId: 4, name: 'Second capacity test' }),
  finishedRun(11, '2026-11-29T08:00:00Z', { ...summaryDelivering(101, 5170), verdict: 'pass', percentRatedAh: 101 }, { batteryId: 4, name: 'First capacity test' }),
];
const inspection: InspectionResponse = {
  entries: [
    { item: { id: 1, title: 'Cell format and count', position: 1, archived: false }, rating: 'good', note: '16 prismatic cells', updatedAt: now, photos: [
      { id: 9, batteryId: 4, itemId: 1, fileName: 'cells.jpg', widthPx: 2400, heightPx: 1800, bytes: 900_000, createdBy: 7, createdAt: now,
        urls: { thumb: '/api/photos/9/thumb', web: '/api/photos/9/web', full: '/api/photos/9/full' } },
    ] },
    { item: { id: 2, title: 'Interconnects and welds', position: 2, archived: false }, rating: null, note: null, updatedAt: null, photos: [] },
  ],
  otherPhotos: [],
};

const unfiled = finishedRun(20, '2026-11-20T08:00:00Z', summaryDelivering(90, 4600), { batteryId: null, name: 'Imported log' });

// One invented cold-charge check of the fictional pack (figures for the demo only).
const protections = {
  batteryId: 4,
  specs: [{ protection: 'cold-charge', thresholdValue: 0, delaySeconds: 5, releaseValue: 3, thresholdTolerance: null, delayToleranceSeconds: null }],
  rows: [{
    protection: 'cold-charge', unit: '°C', channel: 'cell', expectedValue: 0, expectedDelaySeconds: 5, expectedReleaseValue: 3,
    thresholdTolerance: 2, delayToleranceSeconds: 1.5, measuredValue: -0.6, measuredDelaySeconds: 6, releaseValue: 3.2, resumeSeconds: 600,
    beyondAtStart: false, meanHeaterAmps: null, peakHeaterAmps: null, trips: 1, outcome: 'pass', notes: [], window: null,
    runId: 13, runName: 'Cold-charge check', runState: 'finished', startedAt: now, endedAt: now,
  }],
};

function stubPack(role: 'viewer' | 'technician') {
  return stubApi(demoUser(role), (url, init) => {
    if (url === '/api/batteries/4') return { status: 200, body: { battery: pack } };
    if (url.startsWith('/api/runs?batteryId=4')) return { status: 200, body: { runs, total: 2 } };
    if (url === '/api/batteries/4/inspection') return { status: 200, body: inspection };
    if (url === '/api/batteries/4/protections') return { status: 200, body: protections };
    if (url === '/api/batteries/4/inspection/2' && init?.method === 'PUT') return { status: 200, body: { entry: {} } };
    if (url === '/api/runs?limit=500') return { status: 200, body: { runs: [...runs, unfiled], total: 3 } };
    if (url === '/api/batteries/4/runs/20' && init?.method === 'PUT') return { status: 200, body: { run: { ...unfiled, batteryId: 4 } } };
    return undefined;
  });
}

describe('the pack page', () => {
  it('tells the pack story to a viewer: specs, runs with verdicts, trend, protections, teardown, notes', async () => {
    stubPack('viewer');
    renderAt('/batteries/4');
    expect(await screen.findByRole('heading', { name: 'NG-0142' })).toBeTruthy();
    expect(screen.getByRole('link', { name: 'Report PDF' }).getAttribute('href')).toBe('/api/batteries/4/report.pdf');
    const specs = screen.getByRole('region', { name: 'Specifications' });
    expect(within(specs).getByText('480 × 410 × 190 mm')).toBeTruthy();
    expect(within(specs).getByText('10 years')).toBeTruthy();
    expect(within(specs).getByText('6000 cycles')).toBeTruthy();

    const runsRegion = screen.getByRole('region', { name: 'Runs' });
    expect(await within(runsRegion).findByText('Pass')).toBeTruthy();
    expect(within(runsRegion).getByText('Fail')).toBeTruthy();

    // The trend runs oldest first: 101/100 = 101 %, 96/100 = 96 % of rated Ah; 5170/5120, 4915/5120 of rated Wh.
    const trend = screen.getByRole('list', { name: 'Capacity by test' });
    expect(within(trend).getAllByRole('listitem')[0]!.textContent).toContain('First capacity test');
    const plot = (uPlot as unknown as { instances: { data: number[][] }[] }).instances.at(-1)!;
    expect(plot.data[0]).toEqual([1, 2]);
    expect(plot.data[1]).toEqual([101, 96]);
    expect(plot.data[2]![1]).toBeCloseTo((4915 / 5120) * 100, 9);

    const record = screen.getByRole('region', { name: 'Protection record' });
    const checked = await within(record).findByRole('table', { name: 'Protections checked on this pack' });
    expect(within(checked).getByRole('link', { name: 'Cold-charge check' }).getAttribute('href')).toBe('/runs/13');
    expect(within(checked).getByText('Pass')).toBeTruthy();
    // The one record table: the pack page shows the release too, as the register's card does.
    expect(within(checked).getAllByRole('columnheader').map((h) => h.textContent)).toEqual(['Run', 'Protection', 'Expected', 'Measured', 'Released at, after', 'Result']);
    expect(within(record).getByText(/Cold-charge inhibit: 0\.0 °C after/)).toBeTruthy();
    const teardown = screen.getByRole('region', { name: 'Teardown inspection' });
    expect(await within(teardown).findByText('16 prismatic cells')).toBeTruthy();
    expect(within(teardown).getByRole('img', { name: 'cells.jpg' }).getAttribute('src')).toBe('/api/photos/9/thumb');
    expect(within(teardown).queryByRole('button', { name: 'Good' })).toBeNull();
    expect(screen.queryByText(/drop JPEG, PNG or WebP/)).toBeNull();
    expect(screen.getByText('Arrived with a dented corner')).toBeTruthy();
  });

  it('lets a technician rate an item and offers photo uploads', async () => {
    const { calls } = stubPack('technician');
    renderAt('/batteries/4');
    const welds = await screen.findByRole('group', { name: 'Rating of Interconnects and welds' });
    await userEvent.click(within(welds).getByRole('button', { name: 'Concern' }));
    await waitFor(() => expect(calls.some((c) => c.url === '/api/batteries/4/inspection/2' && c.init?.method === 'PUT')).toBe(true));
    const body = JSON.parse(String(calls.find((c) => c.init?.method === 'PUT')!.init!.body));
    expect(body).toEqual({ rating: 'concern', note: null });
    expect(screen.getAllByText(/drop JPEG, PNG or WebP/).length).toBe(3); // two items and the attachments

    // File an imported run under the pack: only runs not already on it are offered.
    const pick = screen.getByLabelText('Run recorded without this pack');
    await waitFor(() => expect(within(pick).getAllByRole('option').map((o) => o.textContent)).toEqual(['Choose a run…', '#20 Imported log (no pack)']));
    await userEvent.selectOptions(pick, '20');
    await userEvent.click(screen.getByRole('button', { name: 'Link run to this pack' }));
    await waitFor(() => expect(calls.some((c) => c.url === '/api/batteries/4/runs/20' && c.init?.method === 'PUT')).toBe(true));
  });
});
