/** The two looks: "bench" (dark, for the lab) and "report" (light, for reading and printing). */
export type Theme = 'dark' | 'light';

const STORAGE_KEY = 'kneepoint.theme';

/** The theme saved on this device, dark by default (benches run in dim rooms). */
export function loadTheme(): Theme {
  try {
    return localStorage.getItem(STORAGE_KEY) === 'light' ? 'light' : 'dark';
  } catch {
    return 'dark';
  }
}

/** Puts the theme on <html> and remembers it. */
export function applyTheme(theme: Theme): void {
  document.documentElement.classList.toggle('dark', theme === 'dark');
  try {
    localStorage.setItem(STORAGE_KEY, theme);
  } catch {
    // Private windows may refuse storage; the theme still applies for this visit.
  }
}
