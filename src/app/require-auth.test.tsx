import { screen, waitFor } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { demoUser, renderAt, stubApi } from '../testing/render-app';

describe('route guard', () => {
  it('sends a signed-out visitor to sign-in and remembers the page', async () => {
    stubApi(null);
    const { router } = renderAt('/runs?q=voltara');
    await waitFor(() => expect(router.state.location.pathname).toBe('/sign-in'));
    expect(router.state.location.search).toBe(`?next=${encodeURIComponent('/runs?q=voltara')}`);
    expect(await screen.findByRole('button', { name: 'Sign in' })).toBeTruthy();
  });

  it('lets a signed-in user through', async () => {
    stubApi(demoUser('viewer'));
    const { router } = renderAt('/account');
    expect(await screen.findByRole('heading', { name: 'My account' })).toBeTruthy();
    expect(router.state.location.pathname).toBe('/account');
  });

  it('shows "not for your role" when a technician opens the users page by address', async () => {
    stubApi(demoUser('technician'));
    renderAt('/users');
    expect(await screen.findByText('Not available for your role')).toBeTruthy();
  });

  it('sends the user to sign-in when the session ends while a page is open (a 401 from any call)', async () => {
    stubApi(demoUser('technician'), (url) =>
      url === '/api/batteries' ? { status: 401, body: { error: { message: 'Sign in first' } } } : undefined,
    );
    const { router } = renderAt('/batteries');
    await waitFor(() => expect(router.state.location.pathname).toBe('/sign-in'));
    expect(router.state.location.search).toBe(`?next=${encodeURIComponent('/batteries')}`);
  });
});
