import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';

/** A matchMedia stand-in whose "prefers dark" answer the test flips. */
function fakeSystem(prefersDark: boolean) {
  const listeners = new Set<() => void>();
  const query = {
    get matches() {
      return prefersDark;
    },
    addEventListener: (_: string, l: () => void) => listeners.add(l),
    removeEventListener: (_: string, l: () => void) => listeners.delete(l),
  };
  vi.stubGlobal('matchMedia', () => query);
  return {
    set(dark: boolean) {
      prefersDark = dark;
      listeners.forEach((l) => l());
    },
  };
}

beforeEach(() => {
  localStorage.clear();
  document.documentElement.classList.remove('dark');
  vi.resetModules();
});
afterEach(() => vi.unstubAllGlobals());

describe('theme', () => {
  it('follows the system preference until the person picks a look, then keeps their pick', async () => {
    const system = fakeSystem(false);
    const { loadTheme, applyTheme } = await import('./theme');
    const { followSystemTheme, setTheme } = await import('./use-theme');
    applyTheme(loadTheme());
    const stop = followSystemTheme();
    expect(document.documentElement.classList.contains('dark')).toBe(false);
    system.set(true);
    expect(document.documentElement.classList.contains('dark')).toBe(true);
    system.set(false);
    expect(document.documentElement.classList.contains('dark')).toBe(false);
    setTheme('dark');
    system.set(false);
    expect(document.documentElement.classList.contains('dark')).toBe(true);
    expect(loadTheme()).toBe('dark');
    stop();
  });

  it('starts dark when the system prefers dark and nothing was picked', async () => {
    fakeSystem(true);
    const { loadTheme } = await import('./theme');
    expect(loadTheme()).toBe('dark');
  });

  it('starts light when the system prefers light (no dark default any more)', async () => {
    fakeSystem(false);
    const { loadTheme } = await import('./theme');
    expect(loadTheme()).toBe('light');
  });
});
