import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

describe('lab settings page', () => {
  it('names each chemistry the way the pack forms do, not by its code', async () => {
    stubApi(demoUser('admin'), (url) => (url === '/api/settings' ? { status: 200, body: { settings: {} } } : undefined));
    renderAt('/settings');
    // Default end voltages per cell, common practice: LFP 2.5 V, lead-acid 1.75 V.
    expect(((await screen.findByLabelText('LiFePO₄ (LFP)')) as HTMLInputElement).value).toBe('2.5');
    expect((screen.getByLabelText('Lead-acid') as HTMLInputElement).value).toBe('1.75');
    expect(screen.getByLabelText('NiMH')).toBeTruthy();
    expect(screen.queryByText('LEAD-ACID')).toBeNull();
  });

  it('puts the server\'s refusal of a time zone beside the time zone field', async () => {
    stubApi(demoUser('admin'), (url, init) => {
      if (url === '/api/settings' && init?.method === 'PUT') {
        return { status: 400, body: { error: { message: 'Invalid request: check the listed fields', fields: { timeZone: ['Unknown IANA time zone'] } } } };
      }
      if (url === '/api/settings') return { status: 200, body: { settings: {} } };
      return undefined;
    });
    renderAt('/settings');
    const zone = await screen.findByLabelText('Time zone');
    await userEvent.clear(zone);
    await userEvent.type(zone, 'Berlin');
    await userEvent.click(screen.getByRole('button', { name: 'Save settings' }));
    expect(await screen.findByText(/Not a time zone Kneepoint knows \(Unknown IANA time zone\)/)).toBeTruthy();
  });
});
