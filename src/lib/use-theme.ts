import { useCallback, useSyncExternalStore } from 'react';
import { applyTheme, loadTheme, type Theme } from './theme';

let current: Theme = typeof document === 'undefined' ? 'dark' : loadTheme();
const listeners = new Set<() => void>();

/** Switches between the bench (dark) and report (light) looks for the whole app. */
export function setTheme(theme: Theme): void {
  current = theme;
  applyTheme(theme);
  listeners.forEach((l) => l());
}

/** The current theme and a toggle; every component sees the same value. */
export function useTheme(): { theme: Theme; toggle: () => void } {
  const theme = useSyncExternalStore(
    (l) => {
      listeners.add(l);
      return () => listeners.delete(l);
    },
    () => current,
  );
  const toggle = useCallback(() => setTheme(current === 'dark' ? 'light' : 'dark'), []);
  return { theme, toggle };
}
