import { render } from '@testing-library/react';
import type { ContextType, ReactElement } from 'react';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { vi } from 'vitest';
import type { PublicUser } from '../../shared/schemas/user';
import type { ServerMessage, Topic } from '../../shared/schemas/ws';
import { LiveSocketContext } from '../lib/use-live';
import { createQueryClient } from '../lib/query-client';
import { AppProvider } from '../app/provider';
import { createRoutes } from '../app/routes';

/** A demo user of the fictional Northgate Cell Lab, in the role a test needs. */
export function demoUser(role: PublicUser['role']): PublicUser {
  return { id: 7, email: `${role}@northgate.example`, name: `Northgate ${role}`, role, disabled: false };
}

type Handler = (url: string, init?: RequestInit) => { status: number; body?: unknown } | undefined;

/** Stubs fetch: `me` answers with `user` (401 when null), other paths go to `handler` or 404. */
export function stubApi(user: PublicUser | null, handler: Handler = () => undefined) {
  const calls: { url: string; init?: RequestInit }[] = [];
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
    const url = String(input);
    calls.push({ url, init });
    const custom = handler(url, init);
    const answer =
      custom ??
      (url.startsWith('/api/auth/me')
        ? user
          ? { status: 200, body: { user } }
          : { status: 401, body: { error: { message: 'Sign in first' } } }
        : url.startsWith('/api/auth/csrf')
          ? { status: 200, body: { csrfToken: 'test-token' } }
          : { status: 404, body: { error: { message: 'Not found' } } });
    return new Response(answer.body === undefined ? null : JSON.stringify(answer.body), {
      status: answer.status,
      headers: { 'Content-Type': 'application/json' },
    });
  });
  vi.stubGlobal('fetch', fetchMock);
  return { fetchMock, calls };
}

type FakeSocket = NonNullable<ContextType<typeof LiveSocketContext>>;

/** A live socket that answers every subscribe with `snapshot(topic)` (or nothing). */
export function fakeLiveSocket(snapshot: (topic: Topic) => ServerMessage | null): FakeSocket {
  return {
    state: 'open',
    onState: () => () => undefined,
    subscribe: (topic, listener) => {
      const message = snapshot(topic);
      if (message) queueMicrotask(() => listener(message));
      return () => undefined;
    },
  };
}

/** Renders the real route tree at `path` with a fresh, non-retrying query client. */
export function renderAt(path: string, socket: FakeSocket = fakeLiveSocket(() => null)) {
  // The app's own client (with its 401 handling), minus retries so failures show at once.
  const queryClient = createQueryClient();
  queryClient.setDefaultOptions({ ...queryClient.getDefaultOptions(), queries: { ...queryClient.getDefaultOptions().queries, retry: false } });
  const router = createMemoryRouter(createRoutes(queryClient), { initialEntries: [path] });
  const view = render(
    (
      <LiveSocketContext.Provider value={socket}>
        <AppProvider queryClient={queryClient}>
          <RouterProvider router={router} />
        </AppProvider>
      </LiveSocketContext.Provider>
    ) as ReactElement,
  );
  return { ...view, router, queryClient };
}
