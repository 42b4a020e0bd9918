import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import type { Battery } from '../../../../shared/schemas/battery';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

const now = '2026-12-01T20:00:00Z';
// Fictional packs of the demo lab: 25 of them, so the register needs two pages of 20.
const packs: Battery[] = Array.from({ length: 25 }, (_, i) => ({
  id: i + 1, label: `NG-${String(100 + i).padStart(4, '0')}`, brand: i % 2 ? 'Hollis Power' : 'Fenwick Cells', model: null,
  chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1, ratedAh: 10 + i, ratedWh: null, bmsRatedAmps: null, massKg: null,
  price: null, priceCurrency: null, serialNumber: `SN-${i}`, sender: null, notes: null, receivedOn: null,
  owner: i === 7 ? 'Brookside Installers' : null, lengthMm: null, widthMm: null, heightMm: null, terminalType: null,
  statedCycleLife: null, warrantyMonths: null, protectionSpecs: [], createdAt: now, updatedAt: now,
}));

const labels = () => screen.getAllByRole('link', { name: /^Open / }).map((a) => a.textContent);

describe('the pack register', () => {
  it('pages 20 at a time, sorts by a column and filters by any text', async () => {
    stubApi(demoUser('viewer'), (url) => (url === '/api/batteries' ? { status: 200, body: { batteries: packs } } : undefined));
    renderAt('/batteries');
    await screen.findByText('1–20 of 25');
    expect(labels()).toHaveLength(20);
    expect(labels()[0]).toBe('NG-0100');
    await userEvent.click(screen.getByRole('button', { name: 'Next' }));
    expect(labels()).toEqual(['NG-0120', 'NG-0121', 'NG-0122', 'NG-0123', 'NG-0124']);

    // Numbers sort largest first on the first click (react-table's default); sorting returns to page 1.
    await userEvent.click(screen.getByRole('button', { name: /^Rated/ }));
    expect(screen.getByRole('columnheader', { name: /^Rated/ }).getAttribute('aria-sort')).toBe('descending');
    expect(labels()[0]).toBe('NG-0124');
    await userEvent.click(screen.getByRole('button', { name: /^Rated/ }));
    expect(labels()[0]).toBe('NG-0100');

    await userEvent.type(screen.getByLabelText('Filter packs'), 'brookside');
    await waitFor(() => expect(labels()).toEqual(['NG-0107']));
    expect(screen.getByText('1–1 of 1')).toBeTruthy();
  });

  it('offers the whole register as CSV', async () => {
    stubApi(demoUser('viewer'), (url) => (url === '/api/batteries' ? { status: 200, body: { batteries: packs } } : undefined));
    renderAt('/batteries');
    const link = await screen.findByRole('link', { name: 'Export CSV' });
    expect(link.getAttribute('href')).toBe('/api/batteries/export.csv');
    expect(within(link.parentElement!).getByLabelText('Filter packs')).toBeTruthy();
  });
});
