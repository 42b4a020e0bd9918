import { render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import type { PushBrowser } from '../api/push-browser';
import { PushBrowserToggle } from './push-browser-toggle';

function browser(patch: Partial<PushBrowser>): PushBrowser {
  return {
    isSecureContext: true,
    serviceWorker: { getRegistration: () => Promise.resolve(undefined) } as unknown as ServiceWorkerContainer,
    hasPushManager: true,
    notificationPermission: 'default',
    requestPermission: () => Promise.resolve('granted'),
    ...patch,
  };
}

describe('PushBrowserToggle', () => {
  it('on a page not served over https, explains the secure context and offers nothing to press', async () => {
    render(<PushBrowserToggle browser={browser({ isSecureContext: false })} />);
    expect(await screen.findByText(/not served over https/)).toBeTruthy();
    expect((screen.getByRole('button', { name: 'Notify this browser' }) as HTMLButtonElement).disabled).toBe(true);
  });

  it('without the Push API, says so', async () => {
    render(<PushBrowserToggle browser={browser({ hasPushManager: false })} />);
    expect(await screen.findByText(/cannot receive push notifications/)).toBeTruthy();
  });

  it('when the person refuses permission, says how to allow it and subscribes nothing', async () => {
    const register = vi.fn();
    const b = browser({ requestPermission: () => Promise.resolve('denied'), serviceWorker: { getRegistration: () => Promise.resolve(undefined), register } as unknown as ServiceWorkerContainer });
    render(<PushBrowserToggle browser={b} />);
    await userEvent.click(await screen.findByRole('button', { name: 'Notify this browser' }));
    await waitFor(() => expect(screen.getByText(/blocked for this site/)).toBeTruthy());
    expect(register).not.toHaveBeenCalled();
  });

  it('when notifications were blocked before, says so at once', async () => {
    render(<PushBrowserToggle browser={browser({ notificationPermission: 'denied' })} />);
    expect(await screen.findByText(/blocked for this site/)).toBeTruthy();
  });
});

describe('subscribeThisBrowser', () => {
  it('gives up with a plain message when the browser\'s push service never answers', async () => {
    const { subscribeThisBrowser } = await import('../api/push-browser');
    const { stubApi, demoUser } = await import('../../../testing/render-app');
    // The VAPID key as the server hands it: a 65-byte P-256 point, base64url.
    stubApi(demoUser('technician'), (url) => (url === '/api/push/key' ? { status: 200, body: { publicKey: Buffer.alloc(65, 4).toString('base64url') } } : undefined));
    const reg = { pushManager: { subscribe: () => new Promise(() => {}) } };
    const b = browser({ serviceWorker: { getRegistration: () => Promise.resolve(undefined), register: () => Promise.resolve(reg), ready: Promise.resolve(reg) } as unknown as ServiceWorkerContainer });
    await expect(subscribeThisBrowser(b, 50)).rejects.toThrow(/push service did not answer/);
  });
});
