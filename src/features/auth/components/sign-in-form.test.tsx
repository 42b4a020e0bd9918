import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

describe('sign-in form', () => {
  it('says what is missing when submitted empty, without calling the server', async () => {
    const { calls } = stubApi(null);
    renderAt('/sign-in');
    await userEvent.click(await screen.findByRole('button', { name: 'Sign in' }));
    expect(await screen.findByText('Enter your e-mail address.')).toBeTruthy();
    expect(screen.getByText('Enter your password.')).toBeTruthy();
    expect(calls.some((c) => c.url === '/api/auth/login')).toBe(false);
  });

  it('rejects a malformed e-mail address', async () => {
    stubApi(null);
    renderAt('/sign-in');
    await userEvent.type(await screen.findByLabelText('E-mail'), 'not-an-address');
    await userEvent.type(screen.getByLabelText('Password'), 'whatever');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByText('That does not look like an e-mail address.')).toBeTruthy();
  });

  it('shows a clear message for a wrong password (401)', async () => {
    stubApi(null, (url) => (url === '/api/auth/login' ? { status: 401, body: { error: { message: 'Wrong e-mail or password' } } } : undefined));
    renderAt('/sign-in');
    await userEvent.type(await screen.findByLabelText('E-mail'), 'tech@northgate.example');
    await userEvent.type(screen.getByLabelText('Password'), 'wrong-password');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByText('That e-mail and password do not match an account.')).toBeTruthy();
  });

  it('tells the user to wait after too many attempts (429)', async () => {
    stubApi(null, (url) => (url === '/api/auth/login' ? { status: 429, body: { error: { message: 'Too many requests' } } } : undefined));
    renderAt('/sign-in');
    await userEvent.type(await screen.findByLabelText('E-mail'), 'tech@northgate.example');
    await userEvent.type(screen.getByLabelText('Password'), 'wrong-password');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByText(/Too many sign-in attempts/)).toBeTruthy();
  });

  it('sends the CSRF header with the login and then goes where the user was heading', async () => {
    const tech = demoUser('technician');
    const { calls } = stubApi(null, (url) =>
      url === '/api/auth/login' ? { status: 200, body: { user: tech, csrfToken: 'fresh' } } : undefined,
    );
    const { router } = renderAt('/sign-in?next=%2Faccount');
    await userEvent.type(await screen.findByLabelText('E-mail'), tech.email);
    await userEvent.type(screen.getByLabelText('Password'), 'correct horse battery');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    await waitFor(() => expect(router.state.location.pathname).toBe('/account'));
    const login = calls.find((c) => c.url === '/api/auth/login');
    expect(new Headers(login?.init?.headers).get('X-CSRF-Token')).toBe('test-token');
    expect(JSON.parse(String(login?.init?.body))).toEqual({ email: tech.email, password: 'correct horse battery' });
  });
});
