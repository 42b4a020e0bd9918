import { act, render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { Run } from '../../../shared/schemas/run';
import type { ServerMessage } from '../../../shared/schemas/ws';
import { LiveStore } from '../../lib/live-store';
import { CutoffAlarm } from './cutoff-alarm';

const topic = { kind: 'run', id: 12 } as const;
const emptyColumns = { elapsedSeconds: [], volts: [], amps: [], watts: [], temps: {} };

function run(state: Run['state']): Run {
  return {
    id: 12, name: 'Voltara 24 V 100 Ah capacity', tags: [], origin: 'live', benchId: 2, batteryId: 3,
    kind: 'capacity-discharge', state, endVolts: { mode: 'per-cell', voltsPerCell: 2.5 }, acceptancePercent: 95,
    alarms: { onCutoff: true }, stopWhen: 'after-recovery', targetAh: null, targetWh: null, afterRecoverySeconds: 0,
    readingsCount: 0, summary: null, startedAt: '2026-12-01T20:00:00Z', endedAt: null, createdBy: 1,
    createdAt: '2026-12-01T20:00:00Z', updatedAt: '2026-12-01T20:00:00Z',
  };
}

// Demo numbers for a fictional 8S LFP pack; only their presence on screen is checked.
const cutoff: ServerMessage = {
  type: 'event', topic, eventId: 40,
  event: { type: 'cutoff', elapsedSeconds: 18_000, cause: 'protection', signal: 'current-zero', volts: 20.01, amps: 19.8, dischargeWh: 2480.5, dischargeAh: 98.4 },
};

function setup() {
  const store = new LiveStore((fn) => fn()); // synchronous frames for the test
  const sound = { start: vi.fn(), stop: vi.fn() };
  render(<CutoffAlarm store={store} label="Bench 2" sound={sound} />);
  act(() => store.handle({ type: 'snapshot', stream: 's1', seq: 1, resume: 'fresh', topic, status: null, run: run('recording'), recent: emptyColumns, events: [] }));
  return { store, sound };
}

describe('cutoff alarm', () => {
  beforeEach(() => {
    sessionStorage.clear();
    document.title = 'Kneepoint';
  });

  it('stays quiet while the run records normally', () => {
    const { sound } = setup();
    expect(screen.queryByRole('alert')).toBeNull();
    expect(sound.start).not.toHaveBeenCalled();
    expect(document.title).toBe('Kneepoint');
  });

  it('shows a banner, sounds and retitles the tab when a cutoff arrives', () => {
    const { store, sound } = setup();
    act(() => store.handle(cutoff));
    const banner = screen.getByRole('alert');
    expect(banner.textContent).toContain('CUTOFF · Bench 2');
    expect(banner.textContent).toContain('pack protection opened');
    expect(banner.textContent).toContain('20.01 V');
    expect(banner.textContent).toContain('2,480.5 Wh');
    expect(sound.start).toHaveBeenCalledTimes(1);
    expect(document.title).toBe('⚠ CUTOFF · Bench 2');
  });

  it('goes quiet once silenced with the S key and restores the title, without telling the server', async () => {
    const fetchMock = vi.fn();
    vi.stubGlobal('fetch', fetchMock);
    const { store, sound } = setup();
    act(() => store.handle(cutoff));
    await userEvent.keyboard('s');
    expect(screen.queryByRole('alert')).toBeNull();
    expect(sound.stop).toHaveBeenCalled();
    expect(document.title).toBe('Kneepoint');
    // Silencing is not acknowledging: nothing went to the server.
    expect(fetchMock).not.toHaveBeenCalled();
    vi.unstubAllGlobals();
  });

  it('acknowledges the run\'s open alarms on the server with the A key, then goes quiet', async () => {
    const posted: string[] = [];
    const alarm = (state: string) => ({
      id: 7, runId: 12, benchId: 2, kind: 'protection-trip', priority: 'critical', state, message: 'Pack protection opened', elapsedSeconds: 18_000,
      values: { volts: 20.01, amps: 19.8, dischargeWh: 2480.5, dischargeAh: 98.4, tempCelsius: null, runSeconds: 18_000 }, shelved: false,
      raisedAt: '2026-12-01T20:00:00.000Z', acknowledgedAt: null, acknowledgedBy: null, clearedAt: null, escalationStep: 0,
    });
    vi.stubGlobal('fetch', vi.fn(async (url: string, init?: { method?: string }) => {
      const json = (body: unknown) => new Response(JSON.stringify(body), { status: 200, headers: { 'content-type': 'application/json' } });
      if (url === '/api/auth/csrf') return json({ csrfToken: 'token' });
      if (url === '/api/alarms?runId=12') return json({ alarms: [alarm('unacknowledged')] });
      if (init?.method === 'POST') {
        posted.push(url);
        return json({ alarm: { ...alarm('cleared'), acknowledgedAt: '2026-12-01T20:01:00.000Z', acknowledgedBy: { id: 1, name: 'Rhea Okafor' }, clearedAt: '2026-12-01T20:01:00.000Z' } });
      }
      return new Response('{}', { status: 404 });
    }));
    const { store, sound } = setup();
    act(() => store.handle(cutoff));
    await userEvent.keyboard('a');
    await waitFor(() => expect(screen.queryByRole('alert')).toBeNull());
    expect(posted).toEqual(['/api/alarms/7/acknowledge']);
    expect(sound.stop).toHaveBeenCalled();
    vi.unstubAllGlobals();
  });

  it('keeps sounding and says why when the server refuses the acknowledgement', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => new Response(JSON.stringify({ error: { message: 'This needs the technician role or higher' } }), { status: 403, headers: { 'content-type': 'application/json' } })));
    const { store } = setup();
    act(() => store.handle(cutoff));
    await userEvent.click(screen.getByRole('button', { name: 'Acknowledge (A)' }));
    await waitFor(() => expect(screen.getByRole('alert').textContent).toContain('Not acknowledged'));
    vi.unstubAllGlobals();
  });

  it('goes quiet on every screen when someone acknowledges on the server (the alarm-ack event arrives live)', () => {
    const { store, sound } = setup();
    act(() => store.handle(cutoff));
    expect(screen.getByRole('alert')).toBeTruthy();
    act(() => store.handle({ type: 'event', topic, eventId: 42, event: { type: 'alarm-ack', elapsedSeconds: 18_030, alarmId: 7, code: 'protection-trip', by: 'Rhea Okafor', at: '2026-12-01T20:01:00.000Z' } }));
    expect(screen.queryByRole('alert')).toBeNull();
    expect(sound.stop).toHaveBeenCalled();
  });

  it('sounds when a test programme fails safe, and says why', () => {
    const { store, sound } = setup();
    const reason = 'the server stopped while the programme ran; at restart load: could not be reached, output not confirmed off';
    act(() => store.handle({ type: 'event', topic, eventId: 43, event: { type: 'programme-step', elapsedSeconds: 900, phase: 'fail', index: 1, label: 'Discharge', reason, outputsConfirmedOff: false } }));
    const banner = screen.getByRole('alert');
    expect(banner.textContent).toContain('ALARM · Bench 2');
    expect(banner.textContent).toContain('output not confirmed off');
    expect(sound.start).toHaveBeenCalledTimes(1);
    // A step that simply ends is not an alarm.
    act(() => store.handle({ type: 'event', topic, eventId: 44, event: { type: 'programme-step', elapsedSeconds: 950, phase: 'end', index: 2, label: 'Rest' } }));
    expect(sound.start).toHaveBeenCalledTimes(1);
  });

  it('keeps saying CUTOFF when the server follows the cutoff with a critical alarm', () => {
    const { store } = setup();
    act(() => store.handle(cutoff));
    act(() =>
      store.handle({ type: 'event', topic, eventId: 41, event: { type: 'alarm', elapsedSeconds: 18_000, level: 'critical', code: 'cutoff', message: 'Pack cut off' } }),
    );
    expect(screen.getByRole('alert').textContent).toContain('CUTOFF · Bench 2');
    expect(document.title).toBe('⚠ CUTOFF · Bench 2');
  });

  it('sends one system notification when this device allowed them', () => {
    const shown: { title: string; body?: string }[] = [];
    class FakeNotification {
      static permission = 'granted';
      constructor(title: string, options?: { body?: string }) {
        shown.push({ title, body: options?.body });
      }
    }
    vi.stubGlobal('Notification', FakeNotification);
    const { store } = setup();
    act(() => store.handle(cutoff));
    expect(shown).toHaveLength(1);
    expect(shown[0].title).toBe('⚠ CUTOFF · Bench 2');
    expect(shown[0].body).toContain('20.01 V');
  });
});
