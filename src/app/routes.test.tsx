import { screen } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { demoUser, renderAt, stubApi } from '../testing/render-app';

describe('routes', () => {
  it('loads a lazy page on the first visit without the router warning about a missing fallback', async () => {
    const warn = vi.spyOn(console, 'warn').mockImplementation(() => undefined);
    stubApi(demoUser('viewer'), (url) => (url.startsWith('/api/runs?') ? { status: 200, body: { runs: [], total: 0 } } : undefined));
    renderAt('/runs');
    expect(await screen.findByText('No runs match.')).toBeTruthy();
    expect(warn.mock.calls.flat().join(' ')).not.toMatch(/HydrateFallback/);
    warn.mockRestore();
  });
});
