import { screen } from '@testing-library/react';
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
});
