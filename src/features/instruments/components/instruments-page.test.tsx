import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

// Records of the fictional demo lab, as the API returns them.
const bench = {
  id: 4, name: 'Bench 4', source: { kind: 'none' }, enabled: true, notes: '', loadOnAmps: null,
  createdAt: '2026-12-01T10:00:00.000Z', updatedAt: '2026-12-01T10:00:00.000Z', status: { state: 'idle', framesOk: 0, framesRejected: 0 },
};
const overdueMeter = {
  id: 1, kind: 'meter', make: 'Ostwind Labs', model: 'DM-6', serialNumber: 'OW-20931', calibratedOn: '2025-01-10', calibrationDueOn: '2026-01-10',
  benchId: 4, channels: { volts: { gain: 1.002, offset: 0 } }, notes: '', calibration: 'overdue',
  certificate: { fileName: 'dm6-2025.pdf', contentType: 'application/pdf', sizeBytes: 1200, uploadedAt: '2025-01-11T09:00:00.000Z' },
  updatedAt: '2025-01-11T09:00:00.000Z',
};

function api(role: 'viewer' | 'admin') {
  return stubApi(demoUser(role), (url, init) => {
    if (init?.method === 'POST' && url === '/api/instruments') return { status: 201, body: { instrument: { ...overdueMeter, id: 2 } } };
    if (url === '/api/instruments' || url === '/api/instruments?benchId=4') return { status: 200, body: { instruments: [overdueMeter] } };
    if (url === '/api/benches') return { status: 200, body: { benches: [bench] } };
    return undefined;
  });
}

describe('instruments page', () => {
  it('shows a viewer the records and their calibration, with nothing to edit', async () => {
    api('viewer');
    renderAt('/instruments');
    expect(await screen.findByText('Ostwind Labs DM-6')).toBeTruthy();
    expect(screen.getByText(/Overdue/)).toBeTruthy();
    expect(screen.getByRole('link', { name: 'dm6-2025.pdf' }).getAttribute('href')).toBe('/api/instruments/1/certificate');
    expect(screen.queryByRole('button', { name: 'Add instrument' })).toBeNull();
    expect(screen.queryByRole('button', { name: 'Edit' })).toBeNull();
    expect(screen.queryByLabelText('Upload certificate')).toBeNull();
  });

  it('lets an admin add a meter with its corrections, and refuses a gain far from 1 before sending', async () => {
    const { calls } = api('admin');
    renderAt('/instruments');
    await userEvent.click(await screen.findByRole('button', { name: 'Add instrument' }));
    await userEvent.type(screen.getByLabelText('Make'), 'Ostwind Labs');
    await userEvent.type(screen.getByLabelText('Model'), 'DM-7');
    await userEvent.type(screen.getByLabelText('Serial number'), 'OW-30001');
    await userEvent.selectOptions(screen.getByLabelText('Bench'), '4');
    await userEvent.click(screen.getByRole('button', { name: 'Add channel' }));
    await userEvent.clear(screen.getByLabelText('Gain 1'));
    await userEvent.type(screen.getByLabelText('Gain 1'), '10');
    await userEvent.click(screen.getByRole('button', { name: 'Add instrument' }));
    expect(await screen.findByText(/Corrections: volts gain/)).toBeTruthy();
    expect(calls.some((c) => c.init?.method === 'POST')).toBe(false);
    await userEvent.clear(screen.getByLabelText('Gain 1'));
    await userEvent.type(screen.getByLabelText('Gain 1'), '1.002');
    await userEvent.click(screen.getByRole('button', { name: 'Add instrument' }));
    await waitFor(() => expect(calls.some((c) => c.init?.method === 'POST' && c.url === '/api/instruments')).toBe(true));
    const post = calls.find((c) => c.init?.method === 'POST' && c.url === '/api/instruments')!;
    expect(JSON.parse(String(post.init!.body))).toEqual({
      kind: 'meter', make: 'Ostwind Labs', model: 'DM-7', serialNumber: 'OW-30001', calibratedOn: null, calibrationDueOn: null,
      benchId: 4, channels: { volts: { gain: 1.002, offset: 0 } }, notes: '',
    });
  });

  it('flags the bench whose meter is past its calibration due date', async () => {
    api('viewer');
    renderAt('/benches/4');
    expect(await screen.findByText(/Calibration overdue:/)).toBeTruthy();
    expect(screen.getByText(/Ostwind Labs DM-6 \(serial OW-20931, due 2026-01-10\)/)).toBeTruthy();
  });

  it('flags overdue instruments on the benches overview, naming the bench', async () => {
    api('viewer');
    renderAt('/');
    expect(await screen.findByText(/Calibration overdue:.*Ostwind Labs DM-6 \(serial OW-20931, due 2026-01-10\) on Bench 4/)).toBeTruthy();
  });
});
