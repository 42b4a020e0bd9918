import { act, screen } from '@testing-library/react';
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

describe('route prefetch', () => {
  it('starts a page query once the person is signed in, and the page reuses it (one request)', async () => {
    const { calls } = stubApi(demoUser('viewer'), (url) => {
      if (url === '/api/batteries') return { status: 200, body: { batteries: [] } };
      if (url.startsWith('/api/runs?')) return { status: 200, body: { runs: [], total: 0 } };
      return undefined;
    });
    const { router } = renderAt('/runs');
    expect(await screen.findByText('No runs match.')).toBeTruthy();
    await act(() => router.navigate('/batteries'));
    await screen.findByRole('heading', { name: /batter/i });
    expect(calls.filter((c) => c.url === '/api/batteries')).toHaveLength(1);
  });
});
