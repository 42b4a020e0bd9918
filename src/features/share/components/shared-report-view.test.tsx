import { screen, waitFor } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { renderAt, stubApi } from '../../../testing/render-app';

const TOKEN = 'A'.repeat(43);

afterEach(() => vi.unstubAllGlobals());

describe('the shared report page /s/:token', () => {
  it('opens with no session (no redirect to sign-in) and says plainly when the link no longer works', async () => {
    const { calls } = stubApi(null, (url) =>
      url.startsWith(`/api/shared/${TOKEN}`) ? { status: 404, body: { error: { message: 'This shared report does not exist or is no longer shared' } } } : undefined,
    );
    const { router } = renderAt(`/s/${TOKEN}`);
    expect(await screen.findByRole('heading', { name: 'Report not available' })).toBeTruthy();
    expect(router.state.location.pathname).toBe(`/s/${TOKEN}`);
    expect(screen.queryByRole('link', { name: 'Download PDF' })).toBeNull();
    await waitFor(() => expect(calls.some((c) => c.url === `/api/shared/${TOKEN}`)).toBe(true));
    // Only the shared namespace is asked: no session, no other API.
    expect(calls.map((c) => c.url).filter((u) => !u.startsWith('/api/shared/'))).toEqual([]);
  });
});
