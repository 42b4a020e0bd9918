import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { demoUser, renderAt, stubApi } from '../../testing/render-app';

async function navLabels(): Promise<string[]> {
  const nav = await screen.findByRole('navigation', { name: 'Main' });
  return within(nav).getAllByRole('link').map((a) => a.textContent ?? '');
}

describe('navigation by role', () => {
  it('shows users and lab settings to an admin', async () => {
    stubApi(demoUser('admin'));
    renderAt('/account');
    expect(await navLabels()).toEqual(['Benches', 'Runs', 'Programmes', 'Batteries', 'Alarms', 'Instruments', 'Users', 'Lab settings', 'My account']);
  });

  it('hides users and lab settings from a technician', async () => {
    stubApi(demoUser('technician'));
    renderAt('/account');
    const labels = await navLabels();
    expect(labels).toContain('Batteries');
    expect(labels).not.toContain('Users');
    expect(labels).not.toContain('Lab settings');
  });

  it('hides them from a viewer too, and the viewer gets no register button', async () => {
    stubApi(demoUser('viewer'), (url) => (url === '/api/batteries' ? { status: 200, body: { batteries: [] } } : undefined));
    renderAt('/batteries');
    expect(await navLabels()).not.toContain('Users');
    expect(await screen.findByText('No packs registered yet.')).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Register a pack' })).toBeNull();
  });

  it('gives a technician the register button', async () => {
    stubApi(demoUser('technician'), (url) => (url === '/api/batteries' ? { status: 200, body: { batteries: [] } } : undefined));
    renderAt('/batteries');
    expect(await screen.findByRole('button', { name: 'Register a pack' })).toBeTruthy();
  });
});

describe('keyboard shortcut list', () => {
  it('opens with ? and closes with Escape', async () => {
    stubApi(demoUser('technician'));
    renderAt('/account');
    await screen.findByRole('navigation', { name: 'Main' });
    expect(screen.queryByRole('dialog', { name: 'Keyboard shortcuts' })).toBeNull();
    await userEvent.keyboard('?');
    expect(screen.getByRole('dialog', { name: 'Keyboard shortcuts' }).textContent).toContain('Write a note on the run');
    await userEvent.keyboard('{Escape}');
    expect(screen.queryByRole('dialog', { name: 'Keyboard shortcuts' })).toBeNull();
  });
});
