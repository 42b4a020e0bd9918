import { screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { demoUser, renderAt, stubApi } from '../../testing/render-app';

const status = (state: string, restarts: number, lastProblem: string | null = null) => ({
  ok: state === 'up',
  database: { state, supervised: true, since: '2026-03-01T10:00:00.000Z', restarts, lastRestartAt: restarts ? '2026-03-01T10:00:01.000Z' : null, lastProblem },
});
const healthAnswers = (body: unknown, code = 200) => (url: string) => (url === '/api/health' ? { status: code, body } : undefined);

describe('database status banner', () => {
  it('tells everyone the database is away and what still works (from a 503 health answer)', async () => {
    stubApi(demoUser('viewer'), healthAnswers(status('restarting', 1, 'the MariaDB server process has exited'), 503));
    renderAt('/account');
    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toMatch(/The database is being restarted[\s\S]*Readings are still recorded and shown live/);
    expect(alert.textContent).not.toContain('Cause'); // the cause is for lab managers
  });

  it('shows lab managers the cause and, once back, how often it was restarted', async () => {
    stubApi(demoUser('admin'), healthAnswers(status('up', 2, 'the MariaDB server process has exited')));
    renderAt('/account');
    expect((await screen.findByText(/restarted 2 times since the server started/)).textContent).toContain('the MariaDB server process has exited');
  });

  it('shows nothing to a technician while all is well, nor when the server has no health endpoint', async () => {
    stubApi(demoUser('technician'), healthAnswers(status('up', 2)));
    renderAt('/account');
    await screen.findByRole('navigation', { name: 'Main' });
    await new Promise((r) => setTimeout(r, 50));
    expect(screen.queryByText(/restarted/)).toBeNull();
    expect(screen.queryByRole('alert')).toBeNull();
  });

  it('tells lab managers when the scheduled backup is failing', async () => {
    stubApi(demoUser('admin'), healthAnswers({ ...status('up', 0), backups: { everyHours: 24, lastAt: null, failing: true } }));
    renderAt('/account');
    expect(await screen.findByText(/The last scheduled backup did not complete/)).toBeTruthy();
  });
});
