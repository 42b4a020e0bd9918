import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

const savedBench = {
  id: 5, name: 'Bench C', source: { kind: 'simulator', scenario: 'lfp-12v-weak-cell', speed: 10, seed: 1, staleAfterSeconds: 10 },
  enabled: true, notes: '', createdAt: '2026-12-01T20:00:00Z', updatedAt: '2026-12-01T20:00:00Z',
  status: { state: 'idle', framesOk: 0, framesRejected: 0 },
};

describe('bench form (admin)', () => {
  it('refuses a serial source whose format is not valid, before calling the server', async () => {
    const { calls } = stubApi(demoUser('admin'), (url) => (url === '/api/benches/ports' ? { status: 200, body: { ports: [] } } : undefined));
    renderAt('/benches/new');
    await userEvent.type(await screen.findByLabelText('Name'), 'Bench C');
    await userEvent.selectOptions(screen.getByLabelText('Meter source'), 'serial');
    await userEvent.type(screen.getByLabelText('Device path'), '/tmp/kp-tty');
    const format = screen.getByLabelText('Format details (JSON)');
    await userEvent.clear(format);
    await userEvent.click(format);
    await userEvent.paste('{"kind":"csv","columns":["t"]}');
    await userEvent.click(screen.getByRole('button', { name: 'Add bench' }));
    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toMatch(/columns/);
    expect(calls.some((c) => c.url === '/api/benches' && c.init?.method === 'POST')).toBe(false);
  });

  it('posts a simulator bench checked against the shared schema', async () => {
    const { calls } = stubApi(demoUser('admin'), (url, init) =>
      url === '/api/benches' && init?.method === 'POST' ? { status: 201, body: { bench: savedBench } } : undefined,
    );
    const { router } = renderAt('/benches/new');
    await userEvent.type(await screen.findByLabelText('Name'), 'Bench C');
    const scenario = screen.getByLabelText('Scenario');
    await userEvent.clear(scenario);
    await userEvent.type(scenario, 'lfp-12v-weak-cell');
    const speed = screen.getByLabelText('Speed (× real time)');
    await userEvent.clear(speed);
    await userEvent.type(speed, '10');
    await userEvent.click(screen.getByRole('button', { name: 'Add bench' }));
    await waitFor(() => expect(router.state.location.pathname).toBe('/benches/5'));
    const post = calls.find((c) => c.url === '/api/benches' && c.init?.method === 'POST');
    expect(JSON.parse(String(post?.init?.body))).toEqual({
      name: 'Bench C',
      notes: '',
      enabled: true,
      loadOnAmps: null,
      meterAccuracy: null,
      source: {
        kind: 'simulator', scenario: 'lfp-12v-weak-cell', speed: 10, seed: 1, staleAfterSeconds: 10,
        limits: { maxAbsVolts: 2000, maxAbsAmps: 5000, minTempCelsius: -100, maxTempCelsius: 300 },
      },
    });
  });

  it('sends the bench\'s own physical bounds, and refuses a temperature range upside down', async () => {
    const { calls } = stubApi(demoUser('admin'), (url, init) =>
      url === '/api/benches' && init?.method === 'POST' ? { status: 201, body: { bench: savedBench } } : undefined,
    );
    const { router } = renderAt('/benches/new');
    await userEvent.type(await screen.findByLabelText('Name'), 'Bench D: 12 V packs');
    const volts = screen.getByLabelText('Largest |voltage| (V)');
    await userEvent.clear(volts);
    await userEvent.type(volts, '60');
    const hot = screen.getByLabelText('Highest temperature (°C)');
    await userEvent.clear(hot);
    await userEvent.type(hot, '-150');
    await userEvent.click(screen.getByRole('button', { name: 'Add bench' }));
    expect((await screen.findByRole('alert')).textContent).toMatch(/minTempCelsius must be below maxTempCelsius/);
    expect(calls.some((c) => c.url === '/api/benches' && c.init?.method === 'POST')).toBe(false);
    await userEvent.clear(hot);
    await userEvent.type(hot, '90');
    await userEvent.click(screen.getByRole('button', { name: 'Add bench' }));
    await waitFor(() => expect(router.state.location.pathname).toBe('/benches/5'));
    const post = calls.find((c) => c.url === '/api/benches' && c.init?.method === 'POST');
    expect(JSON.parse(String(post?.init?.body)).source.limits).toEqual({ maxAbsVolts: 60, maxAbsAmps: 5000, minTempCelsius: -100, maxTempCelsius: 90 });
  });

  it('sends the load threshold typed for the bench, and refuses one that is not a small positive current', async () => {
    const { calls } = stubApi(demoUser('admin'), (url, init) =>
      url === '/api/benches' && init?.method === 'POST' ? { status: 201, body: { bench: { ...savedBench, loadOnAmps: 0.1 } } } : undefined,
    );
    const { router } = renderAt('/benches/new');
    await userEvent.type(await screen.findByLabelText('Name'), 'Bench C');
    const threshold = screen.getByLabelText('Load threshold (A)');
    await userEvent.type(threshold, '-1');
    await userEvent.click(screen.getByRole('button', { name: 'Add bench' }));
    expect((await screen.findByRole('alert')).textContent).toMatch(/Load threshold/);
    await userEvent.clear(threshold);
    await userEvent.type(threshold, '0.1');
    await userEvent.click(screen.getByRole('button', { name: 'Add bench' }));
    await waitFor(() => expect(router.state.location.pathname).toBe('/benches/5'));
    const posts = calls.filter((c) => c.url === '/api/benches' && c.init?.method === 'POST');
    expect(posts).toHaveLength(1);
    expect(JSON.parse(String(posts[0]!.init!.body)).loadOnAmps).toBe(0.1);
  });

  it('sends the meter accuracy typed from a data sheet, and refuses a partial one', async () => {
    const { calls } = stubApi(demoUser('admin'), (url, init) =>
      url === '/api/benches' && init?.method === 'POST' ? { status: 201, body: { bench: savedBench } } : undefined,
    );
    const { router } = renderAt('/benches/new');
    await userEvent.type(await screen.findByLabelText('Name'), 'Bench C');
    await userEvent.type(screen.getByLabelText('Volts gain (% of reading)'), '0.1');
    await userEvent.click(screen.getByRole('button', { name: 'Add bench' }));
    expect((await screen.findByRole('alert')).textContent).toMatch(/Meter accuracy/);
    await userEvent.type(screen.getByLabelText('Volts offset (V)'), '0.01');
    await userEvent.type(screen.getByLabelText('Amps gain (% of reading)'), '0.2');
    await userEvent.type(screen.getByLabelText('Amps offset (A)'), '0.02');
    await userEvent.click(screen.getByRole('button', { name: 'Add bench' }));
    await waitFor(() => expect(router.state.location.pathname).toBe('/benches/5'));
    const posts = calls.filter((c) => c.url === '/api/benches' && c.init?.method === 'POST');
    expect(posts).toHaveLength(1);
    expect(JSON.parse(String(posts[0]!.init!.body)).meterAccuracy).toEqual({ voltsGainPercent: 0.1, voltsOffsetVolts: 0.01, ampsGainPercent: 0.2, ampsOffsetAmps: 0.02 });
  });

  it('says so when the admin reopens a bench\'s source', async () => {
    const { calls } = stubApi(demoUser('admin'), (url, init) => {
      if (url === '/api/benches/5/restart' && init?.method === 'POST') return { status: 200, body: { bench: savedBench } };
      if (url === '/api/benches/5') return { status: 200, body: { bench: savedBench } };
      return undefined;
    });
    renderAt('/benches/5/setup');
    await userEvent.click(await screen.findByRole('button', { name: 'Reopen source' }));
    expect((await screen.findByText('Source reopened.')).getAttribute('role')).toBe('status');
    expect(calls.some((c) => c.url === '/api/benches/5/restart')).toBe(true);
  });
});
