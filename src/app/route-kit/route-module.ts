import type { QueryClient } from '@tanstack/react-query';
import type { ComponentType } from 'react';
import type { Params } from 'react-router-dom';

/** What every lazily loaded route file exports: its page and, when it has one, its prefetch. */
export interface RouteModule {
  Component: ComponentType;
  /** Starts the page's first queries while the router renders (never awaited: the page shows its own loading). */
  prefetch?: (queryClient: QueryClient, params: Params) => void;
}
