/** The two looks: "bench" (dark, for the lab) and "report" (light, for reading and printing). */
export type Theme = 'dark' | 'light';

const STORAGE_KEY = 'kneepoint.theme';
const DARK_QUERY = '(prefers-color-scheme: dark)';

/** The theme the person picked on this device, or null when they never picked one. */
export function loadSavedTheme(): Theme | null {
  try {
    const saved = localStorage.getItem(STORAGE_KEY);
    return saved === 'light' || saved === 'dark' ? saved : null;
  } catch {
    return null;
  }
}

/** The look the system asks for (light when it says nothing). */
export function systemTheme(): Theme {
  return typeof matchMedia === 'function' && matchMedia(DARK_QUERY).matches ? 'dark' : 'light';
}

/** The theme to show: the person's pick, else the system's preference. */
export function loadTheme(): Theme {
  return loadSavedTheme() ?? systemTheme();
}

/** Calls `listener` when the system's preference changes; returns the unsubscribe. */
export function onSystemThemeChange(listener: (theme: Theme) => void): () => void {
  if (typeof matchMedia !== 'function') return () => undefined;
  const query = matchMedia(DARK_QUERY);
  const handle = () => listener(query.matches ? 'dark' : 'light');
  query.addEventListener('change', handle);
  return () => query.removeEventListener('change', handle);
}

/** Puts the theme on <html>. */
export function applyTheme(theme: Theme): void {
  document.documentElement.classList.toggle('dark', theme === 'dark');
}

/** Remembers the person's pick; from then on the system preference no longer decides. */
export function saveTheme(theme: Theme): void {
  try {
    localStorage.setItem(STORAGE_KEY, theme);
  } catch {
    // Private windows may refuse storage; the theme still applies for this visit.
  }
}
