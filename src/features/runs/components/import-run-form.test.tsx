import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { render } from '@testing-library/react';
import { MemoryRouter } from 'react-router-dom';
import { act } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Battery } from '../../../../shared/schemas/battery';
import { LabSettingsSchema } from '../../../../shared/schemas/lab-settings';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';
import { ImportNoticesPanel } from './import-notices-panel';

const emptyRuns = { status: 200, body: { runs: [], total: 0 } };

/** A stand-in XMLHttpRequest that the test drives: upload progress events, then the server's answer. */
class FakeXhr {
  static last: FakeXhr | null = null;
  upload: { onprogress: ((e: { lengthComputable: boolean; loaded: number; total: number }) => void) | null } = { onprogress: null };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;
  status = 0;
  responseText = '';
  withCredentials = false;
  url = '';
  headers: Record<string, string> = {};
  body: FormData | null = null;
  open(_method: string, url: string) {
    this.url = url;
  }
  setRequestHeader(name: string, value: string) {
    this.headers[name] = value;
  }
  send(body: FormData) {
    this.body = body;
    FakeXhr.last = this;
  }
  answer(status: number, body: unknown) {
    this.status = status;
    this.responseText = JSON.stringify(body);
    this.onload?.();
  }
}
afterEach(() => {
  FakeXhr.last = null;
  vi.unstubAllGlobals();
});

describe('runs page', () => {
  it('offers no import to a viewer', async () => {
    stubApi(demoUser('viewer'), (url) => (url.startsWith('/api/runs?') ? emptyRuns : undefined));
    renderAt('/runs');
    expect(await screen.findByText('No runs match.')).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Import a CSV log' })).toBeNull();
  });

  it('uploads a CSV log as multipart with the CSRF header, then shows its error clearly', async () => {
    const { calls } = stubApi(demoUser('technician'), (url, init) => {
      if (url.startsWith('/api/runs?')) return emptyRuns;
      if (url === '/api/batteries') return { status: 200, body: { batteries: [] } };
      if (url === '/api/runs/import' && init?.method === 'POST') return { status: 400, body: { error: { message: 'Line 3: volts is not a number' } } };
      return undefined;
    });
    renderAt('/runs');
    await userEvent.click(await screen.findByRole('button', { name: 'Import a CSV log' }));
    const csv = new File(['time_s,volts,amps\n0,13.2,5\n1,abc,5\n'], 'hollis-log.csv', { type: 'text/csv' });
    await userEvent.upload(screen.getByLabelText(/CSV file/), csv);
    await userEvent.type(screen.getByLabelText('Run name'), 'Hollis standby log');
    await userEvent.click(screen.getByRole('button', { name: 'Import' }));
    expect((await screen.findByRole('alert')).textContent).toBe('Line 3: volts is not a number');
    const upload = calls.find((c) => c.url === '/api/runs/import');
    const body = upload?.init?.body;
    expect(body).toBeInstanceOf(FormData);
    expect((body as FormData).get('name')).toBe('Hollis standby log');
    expect(((body as FormData).get('file') as File).name).toBe('hollis-log.csv');
    const headers = new Headers(upload?.init?.headers);
    expect(headers.get('X-CSRF-Token')).toBe('test-token');
    expect(headers.get('Content-Type')).toBeNull();
  });

  it('sends a typed gap limit, and sends none when the field is left empty', async () => {
    const { calls } = stubApi(demoUser('technician'), (url, init) => {
      if (url.startsWith('/api/runs?')) return emptyRuns;
      if (url === '/api/batteries') return { status: 200, body: { batteries: [] } };
      if (url === '/api/runs/import' && init?.method === 'POST') return { status: 400, body: { error: { message: 'stop here' } } };
      return undefined;
    });
    renderAt('/runs');
    await userEvent.click(await screen.findByRole('button', { name: 'Import a CSV log' }));
    await userEvent.upload(screen.getByLabelText(/CSV file/), new File(['t_s,volts,amps\n0,12.8,10\n60,12.8,10\n'], 'minutes.csv', { type: 'text/csv' }));
    await userEvent.type(screen.getByLabelText('Run name'), 'Minute log');
    const posts = () => calls.filter((c) => c.url === '/api/runs/import').map((c) => c.init!.body as FormData);
    await userEvent.click(screen.getByRole('button', { name: 'Import' }));
    await screen.findByRole('alert');
    expect(posts()[0]!.get('maxGapSeconds')).toBeNull();
    await userEvent.type(screen.getByLabelText('Gap limit (s, optional)'), '180');
    await userEvent.click(screen.getByRole('button', { name: 'Import' }));
    await waitFor(() => expect(posts()).toHaveLength(2));
    expect(posts()[1]!.get('maxGapSeconds')).toBe('180');
  });

  it('asks for a file before sending anything', async () => {
    const { calls } = stubApi(demoUser('technician'), (url) => (url.startsWith('/api/runs?') ? emptyRuns : url === '/api/batteries' ? { status: 200, body: { batteries: [] } } : undefined));
    renderAt('/runs');
    await userEvent.click(await screen.findByRole('button', { name: 'Import a CSV log' }));
    await userEvent.click(screen.getByRole('button', { name: 'Import' }));
    await waitFor(() => expect(screen.getByRole('alert').textContent).toBe('Choose a CSV file.'));
    expect(calls.some((c) => c.url === '/api/runs/import')).toBe(false);
  });

  it('sends the header names typed for columns it does not recognise, after the server names the missing one', async () => {
    const { calls } = stubApi(demoUser('technician'), (url, init) => {
      if (url.startsWith('/api/runs?')) return emptyRuns;
      if (url === '/api/batteries') return { status: 200, body: { batteries: [] } };
      if (url === '/api/runs/import' && init?.method === 'POST') {
        return { status: 400, body: { error: { message: 'line 1: no time, volts, amps column recognised in header "Elapsed,U,I"' } } };
      }
      return undefined;
    });
    renderAt('/runs');
    await userEvent.click(await screen.findByRole('button', { name: 'Import a CSV log' }));
    await userEvent.upload(screen.getByLabelText(/CSV file/), new File(['Elapsed,U,I\n0,13.2,5\n'], 'logger.csv', { type: 'text/csv' }));
    await userEvent.type(screen.getByLabelText('Run name'), 'Kestrel logger export');
    await userEvent.click(screen.getByRole('button', { name: 'Import' }));
    await screen.findByRole('alert');
    // The mapping opens by itself once the server says a column is missing.
    expect(screen.getByText('Columns named differently?').closest('details')?.open).toBe(true);
    await userEvent.type(screen.getByLabelText('Time column'), 'Elapsed');
    await userEvent.type(screen.getByLabelText('Volts column'), 'U');
    await userEvent.type(screen.getByLabelText('Amps column'), 'I');
    await userEvent.click(screen.getByRole('button', { name: 'Import' }));
    await waitFor(() => expect(calls.filter((c) => c.url === '/api/runs/import')).toHaveLength(2));
    const body = calls.filter((c) => c.url === '/api/runs/import')[1].init?.body as FormData;
    expect(JSON.parse(String(body.get('columns')))).toEqual({ time: 'Elapsed', volts: 'U', amps: 'I' });
  });

  it("starts the acceptance at the lab's setting and sends every choice of the form", async () => {
    const now = '2026-03-01T10:00:00.000Z';
    // A fictional lead-acid pack of the demo lab.
    const pack: Battery = {
      id: 4, label: 'NG-0142', brand: 'Hollis Power', model: null, chemistry: 'lead-acid', cellsInSeries: 6, cellsInParallel: 1,
      ratedAh: 35, ratedWh: null, bmsRatedAmps: null, massKg: null, price: null, priceCurrency: null, serialNumber: null,
      sender: null, notes: null, receivedOn: null, owner: null, lengthMm: null, widthMm: null, heightMm: null, terminalType: null,
      statedCycleLife: null, warrantyMonths: null, protectionSpecs: [], createdAt: now, updatedAt: now,
    };
    const { calls } = stubApi(demoUser('technician'), (url, init) => {
      if (url.startsWith('/api/runs?')) return emptyRuns;
      if (url === '/api/settings') return { status: 200, body: { settings: LabSettingsSchema.parse({ acceptancePercent: 80, temperatureUnit: 'F' }) } };
      if (url === '/api/batteries') return { status: 200, body: { batteries: [pack] } };
      if (url === '/api/runs/import' && init?.method === 'POST') {
        return { status: 400, body: { error: { message: 'line 2: time "03.04.2026 10:00:00" is a date that can be day-first or month-first; choose the time format', fields: { timeFormat: ['choose the time format'] } } } };
      }
      return undefined;
    });
    renderAt('/runs');
    await userEvent.click(await screen.findByRole('button', { name: 'Import a CSV log' }));
    await waitFor(() => expect((screen.getByLabelText(/^Acceptance/) as HTMLInputElement).value).toBe('80'));
    expect(screen.getByRole('option', { name: "The lab's unit (°F)" })).toBeTruthy();
    // The electrolyte temperature is asked for a lead-acid pack only.
    expect(screen.queryByLabelText(/Electrolyte temperature/)).toBeNull();
    await userEvent.selectOptions(await screen.findByLabelText('Battery pack (optional)'), '4');
    await userEvent.type(screen.getByLabelText(/Electrolyte temperature/), '10');
    await userEvent.upload(screen.getByLabelText(/CSV file/), new File(['Datum;U;I\n'], 'logger.csv', { type: 'text/csv' }));
    await userEvent.type(screen.getByLabelText('Run name'), 'Cold lead-acid log');
    await userEvent.selectOptions(screen.getByLabelText('Time column format'), 'dmy');
    await userEvent.selectOptions(screen.getByLabelText('Current sign in the file'), 'discharge-negative');
    await userEvent.selectOptions(screen.getByLabelText(/^Temperature unit/), 'C');
    await userEvent.clear(screen.getByLabelText(/^Acceptance/));
    await userEvent.type(screen.getByLabelText(/^Acceptance/), '90');
    await userEvent.type(screen.getByLabelText(/^Gap limit/), '600');
    await userEvent.click(screen.getByRole('button', { name: 'Import' }));
    await waitFor(() => expect(screen.getAllByRole('alert').map((a) => a.textContent)).toContain('line 2: time "03.04.2026 10:00:00" is a date that can be day-first or month-first; choose the time format'));
    const body = calls.find((c) => c.url === '/api/runs/import')?.init?.body as FormData;
    expect(Object.fromEntries(['timeFormat', 'currentSign', 'tempUnit', 'acceptancePercent', 'electrolyteTempCelsius', 'maxGapSeconds', 'batteryId'].map((k) => [k, body.get(k)]))).toEqual({
      timeFormat: 'dmy', currentSign: 'discharge-negative', tempUnit: 'C', acceptancePercent: '90', electrolyteTempCelsius: '10', maxGapSeconds: '600', batteryId: '4',
    });
    // The server's per-field message lands on the field it names.
    expect(screen.getByLabelText('Time column format').getAttribute('aria-invalid')).toBe('true');
  });

  it('refuses an acceptance outside 1-100 % before sending', async () => {
    const { calls } = stubApi(demoUser('technician'), (url) => (url.startsWith('/api/runs?') ? emptyRuns : url === '/api/batteries' ? { status: 200, body: { batteries: [] } } : undefined));
    renderAt('/runs');
    await userEvent.click(await screen.findByRole('button', { name: 'Import a CSV log' }));
    await userEvent.upload(screen.getByLabelText(/CSV file/), new File(['time_s,volts,amps\n'], 'a.csv', { type: 'text/csv' }));
    await userEvent.type(screen.getByLabelText('Run name'), 'x');
    await userEvent.clear(screen.getByLabelText(/^Acceptance/));
    await userEvent.type(screen.getByLabelText(/^Acceptance/), '150');
    await userEvent.click(screen.getByRole('button', { name: 'Import' }));
    await waitFor(() => expect(screen.getByRole('alert').textContent).toBe('The acceptance must be a share of rated capacity from 1 to 100 %.'));
    expect(calls.some((c) => c.url === '/api/runs/import')).toBe(false);
  });
});

describe('import notices on the run page', () => {
  it('lists what the importer decided, once, when the import sent them along', () => {
    const notices = ['Time column "Time" read as seconds (recognised from its values).', '2 row(s) repeat the time of the row before (line 4, 7).'];
    render(
      <MemoryRouter initialEntries={[{ pathname: '/runs/5', state: { importNotices: notices } }]}>
        <ImportNoticesPanel />
      </MemoryRouter>,
    );
    const panel = screen.getByRole('region', { name: 'How the file was read' });
    expect(panel.textContent).toContain(notices[0]);
    expect(panel.textContent).toContain(notices[1]);
  });

  it('shows a large file\'s upload, then the rows the server has done, and clears the bars at the answer', async () => {
    const progressCalls: string[] = [];
    stubApi(demoUser('technician'), (url) => {
      if (url.startsWith('/api/runs?')) return emptyRuns;
      if (url === '/api/batteries') return { status: 200, body: { batteries: [] } };
      if (url.startsWith('/api/runs/import/progress/')) {
        progressCalls.push(url);
        return { status: 200, body: { phase: 'importing', rows: 250_000, totalRows: 1_000_000 } };
      }
      return undefined;
    });
    vi.stubGlobal('XMLHttpRequest', FakeXhr);
    renderAt('/runs');
    await userEvent.click(await screen.findByRole('button', { name: 'Import a CSV log' }));
    // 300 KiB: above the size from which the form follows an import's progress.
    const big = new File(['time_s,volts,amps\n', '0,13.2,5\n'.repeat(300 * 1024 / 9)], 'soak-log.csv', { type: 'text/csv' });
    await userEvent.upload(screen.getByLabelText(/CSV file/), big);
    await userEvent.type(screen.getByLabelText('Run name'), 'Soak log');
    await userEvent.click(screen.getByRole('button', { name: 'Import' }));
    await waitFor(() => expect(FakeXhr.last).not.toBeNull());
    const xhr = FakeXhr.last!;
    expect([xhr.url, xhr.headers['X-CSRF-Token']]).toEqual(['/api/runs/import', 'test-token']);
    const progressId = xhr.body!.get('progressId') as string;
    expect(progressId).toMatch(/^[A-Za-z0-9_-]{8,64}$/);
    expect((xhr.body!.get('file') as File).name).toBe('soak-log.csv');
    act(() => xhr.upload.onprogress!({ lengthComputable: true, loaded: 150, total: 600 }));
    expect((screen.getByRole('progressbar', { name: 'Uploading soak-log.csv' }) as HTMLProgressElement).value).toBe(25);
    expect(screen.queryByRole('progressbar', { name: 'Importing rows' })).toBeNull();
    act(() => xhr.upload.onprogress!({ lengthComputable: true, loaded: 600, total: 600 }));
    expect(screen.getByText('Uploaded; the server is starting on it…')).toBeTruthy();
    const rows = (await screen.findByRole('progressbar', { name: 'Importing rows' }, { timeout: 3000 })) as HTMLProgressElement;
    expect([rows.value, rows.max]).toEqual([250_000, 1_000_000]);
    expect(screen.getByText('Importing: 250,000 of 1,000,000 rows')).toBeTruthy();
    expect(progressCalls[0]).toBe(`/api/runs/import/progress/${progressId}`);
    act(() => xhr.answer(400, { error: { message: 'line 9: volts "x" is not a number' } }));
    expect((await screen.findByRole('alert')).textContent).toBe('line 9: volts "x" is not a number');
    expect(screen.queryByRole('progressbar')).toBeNull();
  });
});

