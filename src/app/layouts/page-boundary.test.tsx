import { act, render, screen } from '@testing-library/react';
import { createMemoryRouter, RouterProvider, type RouteObject } from 'react-router-dom';
import { describe, expect, it, vi } from 'vitest';
import { createQueryClient } from '../../lib/query-client';
import { createRoutes } from '../routes';
import { PageBoundary } from './page-boundary';

function Broken(): never {
  throw new Error('The chart could not draw');
}

describe('PageBoundary', () => {
  it('shows a page error where it happened and drops it once the person navigates away', async () => {
    vi.spyOn(console, 'error').mockImplementation(() => undefined);
    const router = createMemoryRouter(
      [{ element: <PageBoundary />, children: [{ path: '/broken', element: <Broken /> }, { path: '/fine', element: <p>A working page</p> }] }],
      { initialEntries: ['/broken'] },
    );
    render(<RouterProvider router={router} />);
    expect((await screen.findByRole('alert')).textContent).toContain('The chart could not draw');
    await act(() => router.navigate('/fine'));
    expect(screen.getByText('A working page')).toBeTruthy();
    expect(screen.queryByRole('alert')).toBeNull();
    vi.restoreAllMocks();
  });

  it('covers the room view, which has no app frame around it', () => {
    const find = (routes: RouteObject[], parent: RouteObject | null): RouteObject | null => {
      for (const route of routes) {
        if (route.path === '/benches/:benchId/room') return parent;
        const found = find(route.children ?? [], route);
        if (found) return found;
      }
      return null;
    };
    const parent = find(createRoutes(createQueryClient()), null);
    expect((parent?.element as { type?: unknown } | undefined)?.type).toBe(PageBoundary);
  });

  it('gives every route an error element for a page that fails to load', () => {
    const missing: string[] = [];
    const walk = (routes: RouteObject[]) => {
      for (const route of routes) {
        if (route.path && !route.errorElement) missing.push(route.path);
        walk(route.children ?? []);
      }
    };
    walk(createRoutes(createQueryClient()));
    expect(missing).toEqual([]);
  });
});
