import { useSyncExternalStore } from 'react';

const PRINT_QUERY = 'print';

function printQuery(): MediaQueryList | null {
  return typeof window.matchMedia === 'function' ? window.matchMedia(PRINT_QUERY) : null;
}

function subscribe(onChange: () => void): () => void {
  const query = printQuery();
  query?.addEventListener('change', onChange);
  window.addEventListener('beforeprint', onChange);
  window.addEventListener('afterprint', onChange);
  return () => {
    query?.removeEventListener('change', onChange);
    window.removeEventListener('beforeprint', onChange);
    window.removeEventListener('afterprint', onChange);
  };
}

/**
 * True while the page is being printed. A chart is a canvas drawn in the screen's colours:
 * it must be drawn again in the report's when printing starts, and back afterwards.
 */
export function usePrinting(): boolean {
  return useSyncExternalStore(subscribe, () => printQuery()?.matches ?? false, () => false);
}
