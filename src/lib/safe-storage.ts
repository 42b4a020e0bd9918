/** sessionStorage that never throws (private windows, storage disabled). */
export const safeSession = {
  get(key: string): string | null {
    try {
      return sessionStorage.getItem(key);
    } catch {
      return null;
    }
  },
  set(key: string, value: string): void {
    try {
      sessionStorage.setItem(key, value);
    } catch {
      // Storage refused: the value lives only until the page reloads.
    }
  },
};
