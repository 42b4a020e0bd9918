import { useCallback, useSyncExternalStore } from 'react';
import { applyTheme, loadSavedTheme, loadTheme, onSystemThemeChange, saveTheme, type Theme } from './theme';

let current: Theme = typeof document === 'undefined' ? 'dark' : loadTheme();
const listeners = new Set<() => void>();

function show(theme: Theme): void {
  current = theme;
  applyTheme(theme);
  listeners.forEach((l) => l());
}

/** The person picks a look for the whole app; it is remembered on this device. */
export function setTheme(theme: Theme): void {
  saveTheme(theme);
  show(theme);
}

/** Until the person picks a look, the app follows the system's light/dark preference as it changes. */
export function followSystemTheme(): () => void {
  return onSystemThemeChange((theme) => {
    if (loadSavedTheme() === null) show(theme);
  });
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
